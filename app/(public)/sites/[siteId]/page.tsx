import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { z } from "zod";
import { getLocale, getTranslations } from "next-intl/server";
import { getPublicSite } from "@/server/publish/public-snapshots";
import { SETUP_LABELS } from "@/lib/domain/vocabulary/labels";
import { formatNumber, formatP } from "@/lib/domain/analysis/format";
import type { GrowingSetup } from "@/lib/domain/vocabulary/enums";
import { withLanguage } from "@/lib/domain/i18n/language-choice";
import { localeOr, translatorFor } from "@/lib/domain/i18n/catalogue";
import { figuresOf, localAnalysedAs } from "@/lib/domain/i18n/traits";

type Params = Promise<{ siteId: string }>;
const idSchema = z.coerce.number().int().positive().max(2_000_000_000);

async function load(params: Params) {
  const id = idSchema.safeParse((await params).siteId);
  return id.success ? getPublicSite(id.data) : null;
}

export async function generateMetadata({ params }: { params: Params }): Promise<Metadata> {
  const [found, t] = await Promise.all([load(params), getTranslations("publicPages")]);
  return found ? { title: t("siteMeta", { site: found.site.name }), description: found.site.publicDescription ?? undefined } : { title: t("notFound") };
}

/** A partner site's public description only; growers' names and contacts are never shown. In the address's language. */
export default async function PublicSitePage({ params }: { params: Params }) {
  const found = await load(params);
  if (!found) notFound();
  const [t, nav, locale] = await Promise.all([getTranslations("publicPages"), getTranslations("home"), getLocale()]);
  const translator = translatorFor(localeOr(locale));
  const figures = figuresOf(translator);
  const english = translator.locale === "en";
  const here = (href: string) => withLanguage(href, translator.locale);
  const { site, trials } = found;
  return (
    <div className="mx-auto max-w-3xl px-4 py-10">
      <p className="text-sm font-semibold text-sprout-700"><Link href={here("/results")}>{t("results")}</Link> · {t("partnerKind", { kind: site.kind })}</p>
      <h1 className="mt-1 text-3xl font-bold">{site.name}</h1>
      {site.publicDescription && <p className="mt-3 text-lg">{site.publicDescription}</p>}
      <dl className="mt-6 grid grid-cols-[auto_1fr] gap-x-6 gap-y-2 rounded-xl border border-husk-200 bg-white p-5">
        <dt className="font-semibold">{t("region")}</dt><dd>{site.region}</dd>
        <dt className="font-semibold">{t("growingSetup")}</dt><dd>{english ? (SETUP_LABELS[site.growingSetup as GrowingSetup] ?? site.growingSetup) : nav("setup", { setup: site.growingSetup })}</dd>
        {site.soil && (<><dt className="font-semibold">{t("soil")}</dt><dd>{site.soil}</dd></>)}
        {site.irrigation && (<><dt className="font-semibold">{t("watering")}</dt><dd>{site.irrigation}</dd></>)}
      </dl>
      <h2 className="mt-8 text-xl font-bold">{t("grownHere")}</h2>
      <ul className="mt-2 space-y-4">
        {trials.map((trial) => (
          <li key={trial.code} className="rounded-xl border border-husk-200 bg-white p-5">
            <h3 className="font-bold"><Link href={here(`/results/${trial.code}`)}>{trial.title}</Link> ({trial.season})</h3>
            {!trial.inResults && <p className="mt-1 text-sm">{t("siteNotIncluded")}</p>}
            {trial.leaders.length > 0 && (
              <dl className="mt-2 space-y-1 text-sm" aria-label={t("firstAt", { site: site.name })}>
                {trial.leaders.map((l) => {
                  const trait = english ? l.trait : localAnalysedAs(translator, l.traitShape);
                  const heading = english
                    ? l.clear ? `${l.trait}, ${l.heading.charAt(0).toLowerCase()}${l.heading.slice(1)}: ` : `${l.trait}: `
                    : !l.clear ? t("leaderUnclear", { trait }) : l.traitShape.betterWhen === "neither" ? t("leaderPlain", { trait, word: l.word }) : t("leaderBest", { trait, word: l.word });
                  return (
                    <div key={l.trait}>
                      <dt className="inline font-semibold">{heading}</dt>
                      <dd className="inline">
                        {l.clear ? (
                          <>
                            {l.variety}, {english ? l.value : figures.value(l.traitShape, l.rawValue)}
                            {l.isCheck ? t("theCheck") : l.percentOfCheck !== null ? t("ofCheck", { percent: english ? formatNumber(l.percentOfCheck, 0) : figures.number(l.percentOfCheck, 0) }) : ""}
                          </>
                        ) : (
                          t("noClearLeader", { p: english ? formatP(l.entryP) : figures.p(l.entryP) })
                        )}
                      </dd>
                    </div>
                  );
                })}
              </dl>
            )}
          </li>
        ))}
      </ul>
      <p className="mt-3 text-sm text-loam-700">{t("oneSiteNote")}</p>
    </div>
  );
}
