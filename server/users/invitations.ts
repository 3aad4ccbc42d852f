import "server-only";
import { db, type Tx } from "@/db/index";
import { getStaffSite, insertInvitation, insertSiteAttachment, lockAccountByEmail } from "@/db/mutations/users";
import { inviteMail, siteAccessMail } from "@/lib/domain/mail/templates";
import type { Viewer } from "@/lib/domain/viewer";
import { AppError } from "@/lib/errors";
import { env } from "@/lib/env";
import { hashToken, newToken } from "@/server/auth/tokens";
import type { Locale } from "@/lib/domain/vocabulary/enums";
import { withLanguage } from "@/lib/domain/i18n/language-choice";

export const INVITE_DAYS = 7;

export interface GrowerInvitation {
  viewer: Viewer;
  name: string;
  email: string;
  siteId: number;
  /** Tell someone who already has an account that they were added; enrolment sends its own notice instead. */
  noticeForAccount: boolean;
  /** The language of the invitation and of a new account, chosen by the coordinator; someone already invited keeps theirs unless one is given. */
  locale?: Locale;
  /** The one-time link's token; drawn fresh unless a test needs to know it. */
  token?: string;
}

/**
 * Invites a grower to one of the viewer's sites, inside the caller's transaction: a new account without a
 * password, or a fresh link for someone who never set one, with the invitation mail; someone who already
 * has an account is attached to the site (and told so when `noticeForAccount`). A staff account's e-mail
 * is refused.
 */
export async function inviteGrowerInTx(tx: Tx, p: GrowerInvitation): Promise<{ userId: number; invited: boolean }> {
  const site = await getStaffSite(tx, p.viewer, p.siteId);
  const existing = await lockAccountByEmail(tx, p.email);
  if (existing && existing.role !== "cooperator") {
    throw new AppError("conflict", "This e-mail belongs to a staff account.", { email: ["This e-mail belongs to a staff account."] });
  }
  if (existing && existing.hasPassword) {
    const mail = p.noticeForAccount ? siteAccessMail({ to: p.email, name: existing.name, inviterName: p.viewer.name, siteName: site.name, link: `${env.APP_URL}${withLanguage("/portal", existing.locale)}`, locale: existing.locale }) : null;
    await insertSiteAttachment(tx, { viewer: p.viewer, siteId: site.id, userId: existing.id, mail });
    return { userId: existing.id, invited: false };
  }
  const token = p.token ?? newToken();
  const locale = p.locale ?? existing?.locale ?? "en";
  const userId = await insertInvitation(tx, {
    viewer: p.viewer,
    siteId: site.id,
    name: p.name,
    email: p.email,
    locale,
    existingUserId: existing?.id ?? null,
    // Only the digest is stored, so a database leak does not expose working links.
    tokenHash: hashToken(token),
    expiresAt: new Date(Date.now() + INVITE_DAYS * 86400_000),
    mail: inviteMail({ to: p.email, name: p.name, inviterName: p.viewer.name, siteName: site.name, link: `${env.APP_URL}${withLanguage(`/invite/${token}`, locale)}`, locale }),
  });
  return { userId, invited: true };
}

/** The invitation in its own transaction: the account, the link and the mail are stored together or not at all. */
export async function inviteGrower(p: GrowerInvitation) {
  return db.transaction((tx) => inviteGrowerInTx(tx, p));
}
