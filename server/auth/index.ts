import "server-only";
import NextAuth from "next-auth";
import { authOptions } from "./config";

export const authHandler = NextAuth(authOptions);
export { authOptions };
