import { seededRandom, shuffled } from "./random";

// Letters and digits that cannot be misread for one another on a handwritten sheet
// (no 0/O, 1/I/L, 2/Z, 5/S, 8/B, U/V).
export const BLIND_CODE_ALPHABET = "ACDEFGHJKMNPQRTWXY34679";

/**
 * Distinct three-character blind codes, one per entry, reproducible from `seed`. Codes in `exclude`
 * (already given to other entries of the trial) are never reused, so a late entry cannot collide.
 */
export function blindCodes(count: number, seed: number, exclude: Iterable<string> = []): string[] {
  const taken = new Set(exclude);
  const capacity = BLIND_CODE_ALPHABET.length ** 3 - taken.size;
  if (count > capacity) throw new RangeError("Too many entries for three-character codes.");
  const random = seededRandom(seed);
  const codes = new Set<string>();
  while (codes.size < count) {
    let code = "";
    for (let i = 0; i < 3; i += 1) code += BLIND_CODE_ALPHABET[Math.floor(random() * BLIND_CODE_ALPHABET.length)];
    if (!taken.has(code)) codes.add(code);
  }
  return shuffled([...codes], random);
}

/** True when a code uses only the unambiguous alphabet. */
export const isBlindCode = (code: string) => /^[A-Z0-9]{3}$/.test(code) && [...code].every((c) => BLIND_CODE_ALPHABET.includes(c));
