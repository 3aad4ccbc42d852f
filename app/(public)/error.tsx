"use client";
import { useTranslations } from "next-intl";

export default function PublicError({ retry }: { error: unknown; retry: () => void }) {
  const t = useTranslations("frame");
  return (
    <div role="alert" className="mx-auto max-w-xl px-4 py-16 text-center">
      <h1 className="text-2xl font-bold">{t("title")}</h1>
      <p className="mt-2 text-loam-700">{t("publicText")}</p>
      <button type="button" onClick={retry} className="mt-6 min-h-11 rounded-lg bg-sprout-600 px-4 font-semibold text-white">
        {t("tryAgain")}
      </button>
    </div>
  );
}
