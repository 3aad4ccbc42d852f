import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { SignInForm } from "@/components/auth/sign-in-form";
import { getViewer } from "@/server/auth/guards";

export const metadata: Metadata = { title: "Sign in" };

// Only local paths are accepted as a destination after sign-in, so the link cannot send people elsewhere.
function safeCallback(value: string | string[] | undefined): string {
  const v = Array.isArray(value) ? value[0] : value;
  if (!v) return "/portal";
  try {
    const url = new URL(v, "http://placeholder.local");
    if (url.origin !== "http://placeholder.local" && !v.startsWith("/")) return "/portal";
    return url.pathname.startsWith("/portal") ? url.pathname + url.search : "/portal";
  } catch {
    return "/portal";
  }
}

export default async function SignInPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const params = await searchParams;
  if (await getViewer()) redirect("/portal");
  const notice = params.welcome ? "Your password is set. Sign in to start recording." : params.reset ? "Your password was changed. Sign in with the new one." : undefined;
  return (
    <>
      <h1 className="mb-1 text-2xl font-bold">Sign in</h1>
      <p className="mb-6 text-loam-700">For program staff and partner growers.</p>
      <SignInForm callbackUrl={safeCallback(params.callbackUrl)} notice={notice} />
    </>
  );
}
