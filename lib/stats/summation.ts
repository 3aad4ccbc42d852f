/**
 * Compensated summation (Neumaier 1974, improved Kahan-Babuska): the running rounding error is
 * carried in a second term, so a sum of n doubles is accurate to about one rounding regardless of n.
 */
export class CompensatedSum {
  private sum = 0;
  private compensation = 0;

  add(value: number): void {
    const t = this.sum + value;
    if (Math.abs(this.sum) >= Math.abs(value)) this.compensation += this.sum - t + value;
    else this.compensation += value - t + this.sum;
    this.sum = t;
  }

  get value(): number {
    return this.sum + this.compensation;
  }
}

/** Compensated sum of an array of numbers. */
export function accurateSum(values: ArrayLike<number>): number {
  let sum = 0;
  let compensation = 0;
  for (let i = 0; i < values.length; i++) {
    const value = values[i];
    const t = sum + value;
    if (Math.abs(sum) >= Math.abs(value)) compensation += sum - t + value;
    else compensation += value - t + sum;
    sum = t;
  }
  return sum + compensation;
}

/** Compensated sum of squares of an array of numbers. */
export function accurateSumOfSquares(values: ArrayLike<number>): number {
  let sum = 0;
  let compensation = 0;
  for (let i = 0; i < values.length; i++) {
    const value = values[i] * values[i];
    const t = sum + value;
    if (sum >= value) compensation += sum - t + value;
    else compensation += value - t + sum;
    sum = t;
  }
  return sum + compensation;
}
