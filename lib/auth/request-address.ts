import "server-only";
import { headers } from "next/headers";

/** The caller's network address as the proxy reports it, or "local" when served directly. */
export async function requestAddress(): Promise<string> {
  const h = await headers();
  return h.get("x-forwarded-for")?.split(",")[0]?.trim() || h.get("x-real-ip") || "local";
}
