import "server-only";
import { createHash, randomBytes } from "node:crypto";

/** A URL-safe one-time token with 256 bits of randomness. */
export function newToken(): string {
  return randomBytes(32).toString("base64url");
}

/** Only this digest is stored, so a database leak does not expose working links. */
export function hashToken(token: string): string {
  return createHash("sha256").update(token).digest("hex");
}
