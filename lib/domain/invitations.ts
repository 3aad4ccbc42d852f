import type { InvitationState } from "./vocabulary/statuses";

/** A person's newest invitation link, as stored. */
export interface InvitationLink {
  usedAt: Date | null;
  expiresAt: Date;
}

/**
 * Where a person's invitation stands, from their newest link: used once they have set a password; with no
 * password yet, pending while the link works, expired once it ran out, cancelled when it was voided (an
 * admin cancelled it). Null for an account that was never invited (set up another way).
 */
export function invitationState(p: { hasPassword: boolean; newest: InvitationLink | null; now: Date }): InvitationState | null {
  if (!p.newest) return null;
  if (p.hasPassword) return "used";
  if (p.newest.usedAt !== null) return "cancelled";
  return p.newest.expiresAt.getTime() > p.now.getTime() ? "pending" : "expired";
}

/** What the invitation page tells someone who opens a link, from that link (not the newest one). */
export type InvitationLinkAnswer = "valid" | "unknown" | "used" | "expired" | "withdrawn";

export function invitationLinkAnswer(p: { link: InvitationLink | null; hasPassword: boolean; active: boolean; now: Date }): InvitationLinkAnswer {
  if (!p.link) return "unknown";
  // Whoever set a password through any of their links has joined; an older link is spent too.
  if (p.hasPassword) return "used";
  if (!p.active || p.link.usedAt !== null) return "withdrawn";
  return p.link.expiresAt.getTime() > p.now.getTime() ? "valid" : "expired";
}
