import "server-only";
import { hash, verify } from "@node-rs/argon2";

// argon2id with the OWASP-recommended minimum (19 MiB, 2 passes, 1 lane).
const OPTIONS = { memoryCost: 19456, timeCost: 2, parallelism: 1 } as const;

/** Hashes a password for storage. */
export function hashPassword(password: string): Promise<string> {
  return hash(password, OPTIONS);
}

// A real hash of a random string, so an unknown e-mail costs the same time as a wrong password.
const DUMMY_HASH = "$argon2id$v=19$m=19456,t=2,p=1$UucxjqmxRNS4GuVoDidocA$B7724AJ5kbkaizHDfZsIXjQ4bY+FteZJdkEZV2w1Sig";

/** Checks a password; with no stored hash it still spends the time of one check, then fails. */
export async function verifyPassword(storedHash: string | null, password: string): Promise<boolean> {
  try {
    const ok = await verify(storedHash ?? DUMMY_HASH, password);
    return storedHash !== null && ok;
  } catch {
    return false;
  }
}
