import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { SignInForm } from "@/components/auth/sign-in-form";
import { getViewer } from "@/server/auth/guards";
import { getTranslations } from "next-intl/server";

export async function generateMetadata(): Promise<Metadata> {
  return { title: (await getTranslations("auth"))("signInTitle") };
}

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
  const t = await getTranslations("auth");
  const notice = params.welcome ? t("welcomeNotice") : params.reset ? t("resetNotice") : undefined;
  return (
    <>
      <h1 className="mb-1 text-2xl font-bold">{t("signInTitle")}</h1>
      <p className="mb-6 text-loam-700">{t("signInIntro")}</p>
      <SignInForm callbackUrl={safeCallback(params.callbackUrl)} notice={notice} />
    </>
  );
}
