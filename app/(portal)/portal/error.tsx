"use client";
import { useTranslations } from "next-intl";

export default function PortalError({ retry }: { error: unknown; retry: () => void }) {
  const t = useTranslations("pageErrors");
  return (
    <div role="alert" className="rounded-xl border border-beet-600 bg-beet-50 p-6">
      <h1 className="text-xl font-bold text-beet-700">{t("couldNotLoad")}</h1>
      <p className="mt-2 text-loam-900">{t("nothingLost")}</p>
      <button type="button" onClick={retry} className="mt-4 min-h-11 rounded-lg bg-sprout-600 px-4 font-semibold text-white">
        {t("tryAgain")}
      </button>
    </div>
  );
}
