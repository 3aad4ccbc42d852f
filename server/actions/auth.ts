"use server";
import "server-only";
import { redirect } from "next/navigation";
import { defineAction } from "./define-action";
import { acceptInviteSchema, forgotPasswordSchema, resetPasswordSchema } from "@/lib/validation/auth";
import { after } from "next/server";
import { hashPassword } from "@/server/auth/password";
import { hashToken } from "@/server/auth/tokens";
import { updatePasswordWithToken } from "@/db/mutations/users";
import { sendPasswordResetLink } from "@/server/auth/password-reset";
import type { Viewer } from "@/lib/domain/viewer";
import { consumeRateLimit } from "@/server/auth/throttle";
import { requestAddress } from "@/server/auth/request-address";
import { translatorFor, type Translator } from "@/lib/domain/i18n/catalogue";
import { withLanguage } from "@/lib/domain/i18n/language-choice";
import type { LinkRefusalWords } from "@/db/mutations/users";

// These forms have no signed-in reader: they answer in the language of the page they were sent from (its
// `?lang=es`, which the form sends as `lang`).

const refusalWords = (t: Translator): LinkRefusalWords => ({
  resetRefused: t("auth.resetRefused"),
  inviteUsedRefused: t("auth.inviteUsedRefused"),
  inviteExpiredRefused: t("auth.inviteExpiredRefused"),
  inviteDeadRefused: t("auth.inviteDeadRefused"),
});

/**
 * An invited person chooses their name and password through the link in their invitation. The form then
 * signs them in with that password through the usual sign-in (throttle, last sign-in and all), so they
 * land in the portal rather than on an empty sign-in form.
 */
export const acceptInvite = defineAction<ReturnType<typeof acceptInviteSchema>, Viewer | null>(
  { roles: "public", schema: acceptInviteSchema },
  async (input) => {
    const t = translatorFor(input.lang);
    await updatePasswordWithToken({ tokenHash: hashToken(input.token), kind: "invite", passwordHash: await hashPassword(input.password), name: input.name, refusals: refusalWords(t) });
    return { ok: true, message: t("auth.passwordSet") };
  },
);

/**
 * Sends a reset link; answers the same, in the same time, whether or not the e-mail has an account: the
 * answer depends only on the rate limits, and looking the account up, issuing the link and mailing it
 * happen after the answer has gone out.
 */
export const requestPasswordReset = defineAction<ReturnType<typeof forgotPasswordSchema>, Viewer | null>(
  { roles: "public", schema: forgotPasswordSchema },
  async (input) => {
    const sameAnswer = { ok: true as const, message: translatorFor(input.lang)("auth.resetSent") };
    const allowed = await consumeRateLimit(
      [
        { key: `reset-to:${input.email}`, max: 3 },
        { key: `reset-from:${requestAddress()}`, max: 20 },
      ],
      60,
    );
    // Past the limit the answer stays the same, so it reveals nothing, but no more mail is sent.
    if (allowed) after(() => sendPasswordResetLink(input.email));
    return sameAnswer;
  },
);

export const resetPassword = defineAction<ReturnType<typeof resetPasswordSchema>, Viewer | null>(
  { roles: "public", schema: resetPasswordSchema },
  async (input) => {
    const t = translatorFor(input.lang);
    await updatePasswordWithToken({ tokenHash: hashToken(input.token), kind: "password_reset", passwordHash: await hashPassword(input.password), refusals: refusalWords(t) });
    redirect(withLanguage("/sign-in?reset=1", t.locale));
  },
);
