import "server-only";
import type { NextAuthOptions } from "next-auth";
import CredentialsProvider from "next-auth/providers/credentials";
import { env } from "@/lib/env";
import { getActiveViewer, getDeactivationContact, getSignInRecord } from "@/db/queries/users";
import { endSessions, updateLastSignIn } from "@/db/mutations/users";
import { signInSchema } from "@/lib/validation/auth";
import { parseIn } from "@/lib/validation/field-errors";
import { verifyPassword } from "./password";
import { isThrottled, recordAttempt } from "./throttle";
import { requestAddress } from "./request-address";
import { signInAnswer, signInDeactivated } from "@/lib/domain/sign-in-messages";
import { localeOr, translatorFor } from "@/lib/domain/i18n/catalogue";
import type { Role } from "@/lib/domain/vocabulary/enums";

/** Thrown when a session's cookie is still signed but the account ended it; next-auth then clears the cookie. */
class SessionEndedError extends Error {
  constructor() {
    super("This session has ended.");
    this.name = "SessionEndedError";
  }
}

export const authOptions: NextAuthOptions = {
  secret: env.NEXTAUTH_SECRET,
  session: { strategy: "jwt", maxAge: 8 * 3600 },
  pages: { signIn: "/sign-in" },
  providers: [
    CredentialsProvider({
      name: "E-mail and password",
      credentials: { email: { label: "E-mail", type: "email" }, password: { label: "Password", type: "password" } },
      async authorize(credentials) {
        // The form sends its page's language (`lang`, as in the address), so the answers below are in it.
        const t = translatorFor(localeOr((credentials as Record<string, unknown> | undefined)?.lang));
        const parsed = parseIn(signInSchema, credentials ?? {}, t);
        if (!parsed.success) throw new Error(parsed.error.issues[0]?.message ?? signInAnswer(t, "failed"));
        const { email, password } = parsed.data;
        const address = requestAddress();
        let outcome: "throttled" | "failed" | { deactivated: string } | { id: number; email: string; name: string; role: Role; sessionGeneration: number };
        try {
          if (await isThrottled(email, address)) outcome = "throttled";
          else {
            const record = await getSignInRecord(email);
            // The hash check runs even for unknown e-mails so timing does not reveal which accounts exist.
            const ok = await verifyPassword(record?.passwordHash ?? null, password);
            const success = record !== null && ok && record.active;
            // A deactivated account counts as a failed attempt (it must not lift the throttle), but its owner,
            // who just proved the password, is told why and whom to ask. A wrong password gets the usual
            // answer, so nobody without the password learns that the account exists or was deactivated.
            await recordAttempt(email, address, success);
            if (success) await updateLastSignIn(record.id);
            outcome = success ? record : record !== null && ok ? { deactivated: signInDeactivated(await getDeactivationContact(record.id), t) } : "failed";
          }
        } catch (e) {
          // next-auth puts the thrown message in the URL, so internals (SQL, hosts) must never reach it.
          console.error("[auth] sign-in check failed:", e);
          throw new Error(signInAnswer(t, "unavailable"));
        }
        if (outcome === "throttled") throw new Error(signInAnswer(t, "throttled"));
        if (outcome === "failed") throw new Error(signInAnswer(t, "failed"));
        if ("deactivated" in outcome) throw new Error(outcome.deactivated);
        return { id: String(outcome.id), email: outcome.email, name: outcome.name, role: outcome.role, sessionGeneration: outcome.sessionGeneration };
      },
    }),
  ],
  callbacks: {
    // Called with `user` once at sign-in, then on every read of the session through next-auth's own
    // routes (the app's pages, actions and routes check the same thing in server/auth/guards.ts).
    async jwt({ token, user }) {
      if (user) {
        token.uid = Number(user.id);
        token.role = user.role as Role;
        token.gen = user.sessionGeneration;
        return token;
      }
      const viewer = typeof token.uid === "number" && typeof token.gen === "number" ? await getActiveViewer(token.uid, token.gen) : null;
      if (!viewer) throw new SessionEndedError();
      token.role = viewer.role;
      token.name = viewer.name;
      return token;
    },
    session({ session, token }) {
      session.user = { id: token.uid ?? 0, email: token.email ?? "", name: token.name ?? "", role: token.role ?? "cooperator" };
      return session;
    },
  },
  events: {
    // Signing out ends the account's sessions on the server too, so a copy of the cookie stops working.
    async signOut({ token }) {
      if (typeof token?.uid === "number" && typeof token.gen === "number") await endSessions({ userId: token.uid, sessionGeneration: token.gen });
    },
  },
  logger: {
    error(code, metadata) {
      // An ended session read through next-auth is expected; its cookie is cleared, nothing to report.
      if (code === "JWT_SESSION_ERROR" && metadata instanceof SessionEndedError) return;
      console.error(`[next-auth][error][${code}]`, metadata);
    },
  },
};
