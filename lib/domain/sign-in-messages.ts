import type { Translator } from "@/lib/domain/i18n/catalogue";

// Sign-in answers shown to people. One message for every credential failure, so the form never
// reveals whether an e-mail address has an account. The English constants are the catalogue's `auth.*`
// words; the sign-in form sends its page's language, so the answer comes back in it.
export const SIGN_IN_FAILED = "That e-mail and password do not match an account. Check both and try again.";
export const SIGN_IN_THROTTLED =
  "Too many sign-in attempts. Please wait 15 minutes, or reset your password from the link below.";
export const SIGN_IN_UNAVAILABLE = "Sign-in is not available right now. Please try again in a minute.";

/** One of the answers above in the reader's language. */
export function signInAnswer(t: Translator, kind: "failed" | "throttled" | "unavailable"): string {
  return t(`auth.${kind}`);
}

/**
 * For a deactivated account, shown only after its correct password (a wrong one gets SIGN_IN_FAILED), so it
 * tells nothing to someone who does not already hold the account's password.
 */
export function signInDeactivated(contact: { name: string; email: string } | null, t?: Translator): string {
  if (t) return t("auth.deactivated", { contact: contact ? `${contact.name} (${contact.email})` : "none" });
  const ask = contact ? `Ask ${contact.name} (${contact.email}) to reactivate it if you still need it.` : "Ask a Seedplot administrator to reactivate it if you still need it.";
  return `This account has been deactivated, so it cannot sign in. ${ask}`;
}
