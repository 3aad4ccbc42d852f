import { seededRandom, shuffled } from "./random";

// Letters and digits that cannot be misread for one another on a handwritten sheet
// (no 0/O, 1/I/L, 2/Z, 5/S, 8/B, U/V).
const ALPHABET = "ACDEFGHJKMNPQRTWXY34679";

/** Distinct three-character blind codes, one per entry, reproducible from `seed`. */
export function blindCodes(count: number, seed: number): string[] {
  const random = seededRandom(seed);
  const codes = new Set<string>();
  while (codes.size < count) {
    let code = "";
    for (let i = 0; i < 3; i += 1) code += ALPHABET[Math.floor(random() * ALPHABET.length)];
    codes.add(code);
  }
  return shuffled([...codes], random);
}
