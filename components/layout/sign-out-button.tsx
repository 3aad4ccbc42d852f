"use client";
import { signOut } from "next-auth/react";
import { useTranslations } from "next-intl";

export function SignOutButton() {
  const t = useTranslations("nav");
  return (
    <button type="button" onClick={() => signOut({ callbackUrl: "/" })} className="min-h-11 rounded-lg px-3 font-semibold text-loam-700 hover:bg-husk-100">
      {t("signOut")}
    </button>
  );
}
