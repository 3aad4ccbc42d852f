import { withAuth } from "next-auth/middleware";
import { env } from "@/lib/env";

// An early redirect for signed-out visitors only; every page, action and route still checks the
// viewer and role itself through lib/auth/guards.
export default withAuth({ pages: { signIn: "/sign-in" }, secret: env.NEXTAUTH_SECRET });

export const config = { matcher: ["/portal/:path*"] };
