// The session and token carry the viewer's id and role; declared here, not in lib/domain, because it augments next-auth.
import type { Role } from "@/lib/domain/vocabulary/enums";
import "next-auth";
import "next-auth/jwt";

declare module "next-auth" {
  interface Session {
    user: { id: number; email: string; name: string; role: Role };
  }
  interface User {
    id: string;
    email: string;
    name: string;
    role: Role;
    sessionGeneration: number;
  }
}

declare module "next-auth/jwt" {
  interface JWT {
    uid?: number;
    role?: Role;
    /** The account's session generation when this session was issued (see db/schema/users.ts). */
    gen?: number;
  }
}
