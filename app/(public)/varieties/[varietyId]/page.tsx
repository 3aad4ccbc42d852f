import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { z } from "zod";
import { getLocale, getTranslations } from "next-intl/server";
import { getPublicVariety } from "@/server/publish/public-snapshots";
import { CheckHistoryTable, VarietyTraitTable } from "@/components/public/variety-trait-table";
import { publicVarietyAcrossSeasons } from "@/server/publish/public-variety-mixed";
import { AcrossSeasonsStanding } from "@/components/analysis/across-seasons-standing";
import { withLanguage } from "@/lib/domain/i18n/language-choice";
import { localeOr, translatorFor } from "@/lib/domain/i18n/catalogue";
import { localAnalysedAs } from "@/lib/domain/i18n/traits";

type Params = Promise<{ varietyId: string }>;
const idSchema = z.coerce.number().int().positive().max(2_000_000_000);

async function load(params: Params) {
  const id = idSchema.safeParse((await params).varietyId);
  return id.success ? getPublicVariety(id.data) : null;
}

async function idOf(params: Params): Promise<number | null> {
  const id = idSchema.safeParse((await params).varietyId);
  return id.success ? id.data : null;
}

export async function generateMetadata({ params }: { params: Params }): Promise<Metadata> {
  const [variety, t] = await Promise.all([load(params), getTranslations("publicPages")]);
  if (!variety) return { title: t("notFound") };
  return { title: t("varietyMeta", { variety: variety.name, crop: variety.crop }), description: t("varietyMetaText", { variety: variety.name, count: String(variety.trials.length) }) };
}

export default async function PublicVarietyPage({ params }: { params: Params }) {
  const found = await load(params);
  if (!found) notFound();
  const [t, locale] = await Promise.all([getTranslations("publicPages"), getLocale()]);
  const translator = translatorFor(localeOr(locale));
  const here = (href: string) => withLanguage(href, translator.locale);
  // Trait names in the page's language (built-in traits by code; a coordinator's own keep their words).
  const traitWords = new Map<string, string>();
  const variety = {
    ...found,
    trials: found.trials.map((trial) => ({
      ...trial,
      traits: trial.traits.map(({ traitName, ...row }) => {
        const trait = localAnalysedAs(translator, { code: row.traitCode, name: traitName, unit: row.unit, valueType: row.valueType, computation: row.computation, analysedAs: row.trait });
        traitWords.set(row.traitCode, trait);
        return { ...row, trait };
      }),
    })),
  };
  // the id in the address, which the public page already shows; the view itself carries no ids
  const acrossSeasons = (await publicVarietyAcrossSeasons((await idOf(params))!)).map((r) => ({ ...r, trait: { ...r.trait, analysedAs: traitWords.get(r.traitCode) ?? r.trait.analysedAs } }));
  return (
    <div className="mx-auto max-w-5xl px-4 py-10">
      <p className="text-sm font-semibold text-sprout-700"><Link href={here("/results")}>{t("results")}</Link> · {variety.crop}</p>
      <h1 className="mt-1 text-3xl font-bold">{variety.name}</h1>
      <p className="mt-2 text-loam-700">{t("varietyIntro", { count: variety.trials.length })}</p>
      <section className="mt-6 rounded-xl border border-husk-200 bg-white p-5" aria-labelledby="check-history">
        <h2 id="check-history" className="text-xl font-bold">{t("checkBySeason")}</h2>
        <div className="mt-3">
          <CheckHistoryTable seasons={variety.trials.map((s) => ({ code: s.code, season: s.season, isCheck: s.isCheck, traits: s.traits }))} caption={t("checkBySeasonCaption", { variety: variety.name })} />
        </div>
      </section>
      {acrossSeasons.length > 0 && (
        <section className="mt-6 rounded-xl border border-husk-200 bg-white p-5" aria-labelledby="across-seasons">
          <h2 id="across-seasons" className="text-xl font-bold">{t("allSeasons")}</h2>
          <div className="mt-3">
            <AcrossSeasonsStanding rows={acrossSeasons} name={variety.name} />
          </div>
        </section>
      )}
      {variety.trials.map((trial) => (
        <section key={trial.code} className="mt-6 rounded-xl border border-husk-200 bg-white p-5" aria-labelledby={`t-${trial.code}`}>
          <h2 id={`t-${trial.code}`} className="text-xl font-bold">
            <Link href={here(`/results/${trial.code}`)}>{trial.title}</Link>
          </h2>
          <p className="text-sm text-loam-700">
            {t("trialFacts", { season: trial.season, sites: String(trial.sites), entries: String(trial.entriesInTrial) })}
            {trial.isCheck ? t("grownAsCheck") : ""}
          </p>
          <div className="mt-3">
            <VarietyTraitTable rows={trial.traits} caption={t("varietyIn", { variety: variety.name, trial: trial.title })} isCheck={trial.isCheck} />
          </div>
        </section>
      ))}
    </div>
  );
}
