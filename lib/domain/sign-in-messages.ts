// Sign-in answers shown to people. One message for every credential failure, so the form never
// reveals whether an e-mail address has an account.
export const SIGN_IN_FAILED = "That e-mail and password do not match an account. Check both and try again.";
export const SIGN_IN_THROTTLED =
  "Too many sign-in attempts. Please wait 15 minutes, or reset your password from the link below.";
export const SIGN_IN_UNAVAILABLE = "Sign-in is not available right now. Please try again in a minute.";

/**
 * For a deactivated account, shown only after its correct password (a wrong one gets SIGN_IN_FAILED), so it
 * tells nothing to someone who does not already hold the account's password.
 */
export function signInDeactivated(contact: { name: string; email: string } | null): string {
  const ask = contact ? `Ask ${contact.name} (${contact.email}) to reactivate it if you still need it.` : "Ask a Seedplot administrator to reactivate it if you still need it.";
  return `This account has been deactivated, so it cannot sign in. ${ask}`;
}
