import "server-only";
import { db, type Tx } from "@/db/index";
import {
  insertInvitationLink,
  insertStaffInvitation,
  listCoordinatorProgramNames,
  listProgramsById,
  lockAccountByEmail,
  lockAccountForAdmin,
  replaceCoordinatorPrograms,
  voidInvitation,
} from "@/db/mutations/users";
import { inviteMail, staffInviteMail } from "@/lib/domain/mail/templates";
import { withLanguage } from "@/lib/domain/i18n/language-choice";
import { ROLE_LABELS } from "@/lib/domain/vocabulary/labels";
import type { Viewer } from "@/lib/domain/viewer";
import { AppError } from "@/lib/errors";
import { env } from "@/lib/env";
import { hashToken, newToken } from "@/server/auth/tokens";
import { INVITE_DAYS } from "./invitations";

// Staff accounts are the administrators' business: only an admin invites coordinators and admins, assigns
// coordinators to programs, resends or cancels invitations. Each use case re-checks the role itself (the
// actions check it too) and writes in one transaction with its audit entry and mail.

function requireAdmin(viewer: Viewer) {
  if (viewer.role !== "admin") throw new AppError("forbidden", "Only an administrator can invite staff or change their programs.");
}

/** The chosen programs, all of which must exist; answers their names for the mail. */
async function requirePrograms(tx: Tx, programIds: number[]) {
  const unique = [...new Set(programIds)];
  const found = await listProgramsById(tx, unique);
  if (found.length !== unique.length) throw new AppError("bad_request", "One of the chosen programs no longer exists. Reload the page and choose again.", { programIds: ["Choose programs from the list."] });
  return found;
}

const linkExpiry = () => new Date(Date.now() + INVITE_DAYS * 86400_000);

export interface StaffInvitation {
  viewer: Viewer;
  name: string;
  email: string;
  role: "coordinator" | "admin";
  /** The programs a coordinator runs; an administrator reaches every program, so none are stored. */
  programIds: number[];
  /** The one-time link's token; drawn fresh unless a test needs to know it. */
  token?: string;
}

/** Invites a coordinator or an administrator by e-mail: a new account without a password, its programs, the link and the mail. */
export async function inviteStaff(p: StaffInvitation): Promise<number> {
  requireAdmin(p.viewer);
  const token = p.token ?? newToken();
  return db.transaction(async (tx) => {
    const existing = await lockAccountByEmail(tx, p.email);
    if (existing) {
      const message = existing.hasPassword
        ? "This e-mail already has a Seedplot account. Change its role in the list above instead."
        : "This e-mail already has an invitation. Use Resend in the list above to send a new link.";
      throw new AppError("conflict", message, { email: [message] });
    }
    const programIds = p.role === "coordinator" ? p.programIds : [];
    const chosen = await requirePrograms(tx, programIds);
    return insertStaffInvitation(tx, {
      viewer: p.viewer,
      name: p.name,
      email: p.email,
      role: p.role,
      programIds: chosen.map((c) => c.id),
      tokenHash: hashToken(token),
      expiresAt: linkExpiry(),
      mail: staffInviteMail({ to: p.email, name: p.name, inviterName: p.viewer.name, roleLabel: ROLE_LABELS[p.role], programNames: chosen.map((c) => c.name), link: `${env.APP_URL}/invite/${token}` }),
    });
  });
}

/** Sends a new invitation link to someone who has not set a password yet; the earlier links stop working. */
export async function resendInvitation(p: { viewer: Viewer; userId: number; token?: string }): Promise<{ email: string }> {
  requireAdmin(p.viewer);
  const token = p.token ?? newToken();
  return db.transaction(async (tx) => {
    const account = await lockAccountForAdmin(tx, p.viewer, p.userId);
    if (account.hasPassword) throw new AppError("conflict", `${account.name} has already set a password, so there is no invitation to resend.`);
    if (!account.active) throw new AppError("conflict", `${account.name}'s account is deactivated. Reactivate it before sending a new invitation.`);
    const link = `${env.APP_URL}${withLanguage(`/invite/${token}`, account.role === "cooperator" ? account.locale : "en")}`;
    const mail =
      account.role === "cooperator"
        ? inviteMail({ to: account.email, name: account.name, inviterName: p.viewer.name, link, locale: account.locale })
        : staffInviteMail({ to: account.email, name: account.name, inviterName: p.viewer.name, roleLabel: ROLE_LABELS[account.role], programNames: account.role === "coordinator" ? await listCoordinatorProgramNames(tx, account.id) : [], link });
    await insertInvitationLink(tx, { viewer: p.viewer, userId: account.id, tokenHash: hashToken(token), expiresAt: linkExpiry(), mail });
    return { email: account.email };
  });
}

/** Stops someone's invitation: their links no longer work. Resend sends a new one later. */
export async function cancelInvitation(p: { viewer: Viewer; userId: number }): Promise<{ name: string }> {
  requireAdmin(p.viewer);
  return db.transaction(async (tx) => {
    const account = await lockAccountForAdmin(tx, p.viewer, p.userId);
    if (account.hasPassword) throw new AppError("conflict", `${account.name} has already accepted the invitation. Deactivate the account instead if they should no longer sign in.`);
    await voidInvitation(tx, { viewer: p.viewer, userId: account.id });
    return { name: account.name };
  });
}

/** Sets the programs a coordinator runs (admins reach every program, growers none, so only coordinators have any). */
export async function assignPrograms(p: { viewer: Viewer; userId: number; programIds: number[] }): Promise<{ name: string }> {
  requireAdmin(p.viewer);
  return db.transaction(async (tx) => {
    const account = await lockAccountForAdmin(tx, p.viewer, p.userId);
    if (account.role !== "coordinator") throw new AppError("bad_request", `${account.name} is not a coordinator. Only coordinators are assigned to programs.`);
    const chosen = await requirePrograms(tx, p.programIds);
    await replaceCoordinatorPrograms(tx, { viewer: p.viewer, userId: account.id, programIds: chosen.map((c) => c.id) });
    return { name: account.name };
  });
}
