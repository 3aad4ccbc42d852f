import type { NextAuthOptions } from "next-auth";
import CredentialsProvider from "next-auth/providers/credentials";
import { env } from "@/lib/env";
import { getSignInRecord } from "@/db/queries/users";
import { signInSchema } from "@/lib/validation/auth";
import { verifyPassword } from "./password";
import { isThrottled, recordAttempt } from "./throttle";
import { requestAddress } from "./request-address";
import { SIGN_IN_FAILED, SIGN_IN_THROTTLED, SIGN_IN_UNAVAILABLE } from "./messages";
import type { Role } from "@/db/schema/enums";

export const authOptions: NextAuthOptions = {
  secret: env.NEXTAUTH_SECRET,
  session: { strategy: "jwt", maxAge: 8 * 3600 },
  pages: { signIn: "/sign-in" },
  providers: [
    CredentialsProvider({
      name: "E-mail and password",
      credentials: { email: { label: "E-mail", type: "email" }, password: { label: "Password", type: "password" } },
      async authorize(credentials) {
        const parsed = signInSchema.safeParse(credentials ?? {});
        if (!parsed.success) throw new Error(parsed.error.issues[0]?.message ?? SIGN_IN_FAILED);
        const { email, password } = parsed.data;
        const address = requestAddress();
        let outcome: "throttled" | "failed" | { id: number; email: string; name: string; role: Role };
        try {
          if (await isThrottled(email, address)) outcome = "throttled";
          else {
            const record = await getSignInRecord(email);
            // The hash check runs even for unknown e-mails so timing does not reveal which accounts exist.
            const ok = await verifyPassword(record?.passwordHash ?? null, password);
            const success = record !== null && ok && record.active;
            await recordAttempt(email, address, success);
            outcome = success ? record : "failed";
          }
        } catch (e) {
          // next-auth puts the thrown message in the URL, so internals (SQL, hosts) must never reach it.
          console.error("[auth] sign-in check failed:", e);
          throw new Error(SIGN_IN_UNAVAILABLE);
        }
        if (outcome === "throttled") throw new Error(SIGN_IN_THROTTLED);
        if (outcome === "failed") throw new Error(SIGN_IN_FAILED);
        return { id: String(outcome.id), email: outcome.email, name: outcome.name, role: outcome.role };
      },
    }),
  ],
  callbacks: {
    jwt({ token, user }) {
      if (user) {
        token.uid = Number(user.id);
        token.role = user.role as Role;
      }
      return token;
    },
    session({ session, token }) {
      session.user = { id: token.uid ?? 0, email: token.email ?? "", name: token.name ?? "", role: token.role ?? "cooperator" };
      return session;
    },
  },
};
