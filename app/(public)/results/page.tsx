import type { Metadata } from "next";
import Link from "next/link";
import { listPublicTrials } from "@/server/publish/public-snapshots";
import { SelectField, TextField } from "@/components/ui/field";
import { Button } from "@/components/ui/button";
import { API_BASE, OPENAPI_PATH } from "@/lib/domain/publish/open-data";
import { getLocale, getTranslations } from "next-intl/server";
import { withLanguage } from "@/lib/domain/i18n/language-choice";
import { formatDate } from "@/lib/domain/vocabulary/labels";
import { localeOr } from "@/lib/domain/i18n/locales";

export async function generateMetadata(): Promise<Metadata> {
  const t = await getTranslations("publicPages");
  return { title: t("resultsMeta"), description: t("resultsMetaText") };
}

type Search = Promise<Record<string, string | string[] | undefined>>;
const one = (v: string | string[] | undefined) => (Array.isArray(v) ? v[0] : v)?.slice(0, 100) || undefined;

export default async function ResultsIndex({ searchParams }: { searchParams: Search }) {
  const params = await searchParams;
  const filters = { q: one(params.q), crop: one(params.crop), season: one(params.season) };
  const locale = localeOr(await getLocale());
  const [{ trials, crops, seasons }, words] = await Promise.all([listPublicTrials(filters, locale), getTranslations("public")]);
  return (
    <div className="mx-auto max-w-6xl px-4 py-10">
      <h1 className="text-3xl font-bold">{words("resultsTitle")}</h1>
      <p className="mt-2 max-w-3xl text-loam-700">
        {words("resultsIntro")} <a href={`${API_BASE}/trials`}>{words("openData")}</a> (<a href={OPENAPI_PATH}>{words("openApi")}</a>).
      </p>
      <form role="search" aria-label={words("find")} className="mt-6 grid gap-3 rounded-xl border border-husk-200 bg-white p-4 sm:grid-cols-[2fr_1fr_1fr_auto]">
        {locale !== "en" && <input type="hidden" name="lang" value={locale} />}
        <TextField label={words("search")} name="q" id="q" defaultValue={filters.q} placeholder={words("searchHint")} />
        <SelectField label={words("crop")} name="crop" id="crop" defaultValue={filters.crop ?? ""}>
          <option value="">{words("allCrops")}</option>
          {crops.map((c) => <option key={c}>{c}</option>)}
        </SelectField>
        <SelectField label={words("season")} name="season" id="season" defaultValue={filters.season ?? ""}>
          <option value="">{words("allSeasons")}</option>
          {seasons.map((s) => <option key={s}>{s}</option>)}
        </SelectField>
        <Button type="submit" className="self-end">
          {words("show")}
        </Button>
      </form>
      <p className="mt-6 text-sm text-loam-700" aria-live="polite">
        {trials.length === 0 ? words("noMatch") : words("count", { count: trials.length })}
      </p>
      <ul className="mt-3 grid gap-4 md:grid-cols-2">
        {trials.map((t) => (
          <li key={t.code} className="rounded-xl border border-husk-200 bg-white p-5">
            <p className="text-sm font-semibold text-sprout-700">{t.crop} · {t.season}</p>
            <h2 className="mt-1 text-xl font-bold">
              <Link href={withLanguage(`/results/${t.code}`, locale)}>{t.title}</Link>
            </h2>
            <p className="mt-2 text-loam-900">{t.summary}</p>
            <p className="mt-2 text-sm text-loam-700">
              {words("trialLine", { sites: String(t.sites), entries: String(t.entries.length), version: String(t.version), date: formatDate(t.publishedAt, locale) })}
            </p>
          </li>
        ))}
      </ul>
    </div>
  );
}
