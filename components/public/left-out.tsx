import { useTranslations } from "next-intl";
import type { PublicExclusion, PublicSnapshot } from "@/lib/domain/publish/public-shape";
import { notIncludedKind } from "@/lib/domain/publish/site-inclusion";

/** "Results from N of M sites", naming the sites this version does not include and why. */
export function SiteCoverage({ coverage }: { coverage: PublicSnapshot["coverage"] }) {
  const t = useTranslations("publicTables");
  const whyInWords = (why: string) => {
    const kind = notIncludedKind(why);
    if (!kind) return why;
    return "why" in kind ? t("notIncludedWhy", { why: kind.why }) : t("leftOutWhy", { reason: t("exclusion", { category: kind.category }) });
  };
  return (
    <div>
      <p className="font-semibold">{t("coverage", { count: String(coverage.inResults), total: coverage.enrolled })}</p>
      {coverage.notIncluded.length > 0 && (
        <ul className="mt-1 list-disc pl-5 text-sm text-loam-700" aria-label={t("sitesNotIncluded")}>
          {coverage.notIncluded.map((s) => (
            <li key={s.name}>{t("siteNotIncluded", { site: s.name, reason: whyInWords(s.reason) })}</li>
          ))}
        </ul>
      )}
    </div>
  );
}

/** The sites and plots left out of one trait's analysis, with the public reason (its category, in the page's language). */
export function LeftOutOfTrait({ exclusions }: { exclusions: PublicExclusion[] }) {
  const t = useTranslations("publicTables");
  if (exclusions.length === 0) return null;
  return (
    <div className="mt-4 text-sm">
      <h3 className="font-bold">{t("leftOut")}</h3>
      <ul className="mt-1 list-disc pl-5">
        {exclusions.map((x, i) => (
          <li key={i}>
            {x.plotCode ? t("plotAt", { plot: x.plotCode, site: x.siteName ?? "" }) : t("allPlotsAt", { site: x.siteName ?? "" })}: {t("exclusion", { category: x.category })}
          </li>
        ))}
      </ul>
    </div>
  );
}
