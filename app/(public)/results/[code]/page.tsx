import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { getPublicReportAt } from "@/server/publish/public-snapshots";
import { PublicTraitResults } from "@/components/public/trait-results";
import { LeftOutOfTrait, SiteCoverage } from "@/components/public/left-out";
import { GerminationSection } from "@/components/public/germination-section";
import { toPublicGerminationView, toPublicTraitView } from "@/lib/domain/publish/public-view";
import { linksFor, OPENAPI_PATH } from "@/lib/domain/publish/open-data";
import { SETUP_LABELS } from "@/lib/domain/vocabulary/labels";
import type { GrowingSetup } from "@/lib/domain/vocabulary/enums";
import { getLocale, getTranslations } from "next-intl/server";
import { withLanguage } from "@/lib/domain/i18n/language-choice";
import { formatDate } from "@/lib/domain/vocabulary/labels";
import { localeOr, translatorFor } from "@/lib/domain/i18n/catalogue";
import { summariseForGrowers } from "@/lib/domain/publish/summary";
import { localAnalysedAs } from "@/lib/domain/i18n/traits";

type Params = Promise<{ code: string }>;
type Search = Promise<Record<string, string | string[] | undefined>>;

async function load(params: Params, searchParams: Search) {
  const { code } = await params;
  const search = await searchParams;
  return getPublicReportAt(code, Array.isArray(search.version) ? search.version[0] : search.version);
}

export async function generateMetadata({ params, searchParams }: { params: Params; searchParams: Search }): Promise<Metadata> {
  const [report, words, locale] = await Promise.all([load(params, searchParams), getTranslations("publicPages"), getLocale()]);
  if (!report) return { title: words("notFound") };
  if (report.kind === "withdrawn") return { title: words("withdrawnMeta", { title: report.title }), robots: { index: false } };
  const t = report.snapshot.trial;
  const summary = summaryIn(report.snapshot, locale);
  return {
    title: `${t.title} (${t.season})`,
    description: summary.join(" ").slice(0, 300),
    openGraph: { title: words("trialMeta", { title: t.title, crop: t.crop }), description: summary[0] ?? "", type: "article" },
  };
}

/**
 * The summary in the page's language: the published English lines as they were published, or the same
 * sentences worded again from the published figures in another language (variety names stay as typed).
 */
function summaryIn(snapshot: { summary: string[]; results: { result: Parameters<typeof summariseForGrowers>[0][number] }[] }, locale: string): string[] {
  const language = localeOr(locale);
  return language === "en" ? snapshot.summary : summariseForGrowers(snapshot.results.map((r) => r.result), translatorFor(language));
}

export default async function PublicTrialPage({ params, searchParams }: { params: Params; searchParams: Search }) {
  const report = await load(params, searchParams);
  if (!report) notFound();
  // Everything follows the address's language (?lang=es); names and what staff typed stay as typed.
  const [words, nav, menu, pages, locale] = await Promise.all([getTranslations("public"), getTranslations("home"), getTranslations("nav"), getTranslations("publicPages"), getLocale()]);
  const translator = translatorFor(localeOr(locale));
  const here = (href: string) => withLanguage(href, locale);
  if (report.kind === "withdrawn") {
    return (
      <div className="mx-auto max-w-3xl px-4 py-12">
        <h1 className="text-3xl font-bold">{report.title}</h1>
        <div role="status" className="mt-6 rounded-xl border border-marigold-400 bg-marigold-100 p-5">
          <h2 className="text-lg font-bold">{words("withdrawnTitle")}</h2>
          <p className="mt-2">{report.reason}</p>
          <p className="mt-2 text-sm text-loam-700">{words("withdrawnOn", { date: locale === "en" ? report.withdrawnAt.toISOString().slice(0, 10) : formatDate(report.withdrawnAt, locale) })}</p>
        </div>
        <p className="mt-6"><Link href={here("/results")}>{words("allResults")}</Link></p>
      </div>
    );
  }
  const { snapshot, versions, latestVersion } = report;
  const t = snapshot.trial;
  const isLatest = snapshot.version === latestVersion;
  const versionQuery = isLatest ? "" : `?version=${snapshot.version}`;
  const notIncluded = new Set(snapshot.coverage.notIncluded.map((s) => s.name));
  const germination = toPublicGerminationView(snapshot.results, translator);
  const api = linksFor(t.code, isLatest ? null : snapshot.version);
  return (
    <div className="mx-auto max-w-6xl space-y-8 px-4 py-10">
      <header>
        <p className="text-sm font-semibold text-sprout-700">
          <Link href={here("/results")}>{menu("results")}</Link> · {t.crop} · {t.season}
        </p>
        <h1 className="mt-1 text-3xl font-bold">{t.title}</h1>
        <p className="mt-1 text-loam-700">
          {words("trialLineFull", { program: snapshot.program, code: t.code, entries: String(snapshot.entries.length), blocks: String(t.blocks) })}
        </p>
        <div className="mt-2">
          <SiteCoverage coverage={snapshot.coverage} />
        </div>
        {!isLatest && (
          <p role="status" className="mt-3 rounded-lg border border-marigold-400 bg-marigold-100 px-3 py-2">
            {words("oldVersion", { version: String(snapshot.version) })} <Link href={here(`/results/${t.code}`)}>{words("latest", { version: String(latestVersion) })}</Link>.
          </p>
        )}
      </header>

      <section aria-labelledby="summary" className="rounded-xl border border-husk-200 bg-white p-5">
        <h2 id="summary" className="text-xl font-bold">{words("summary")}</h2>
        <ul className="mt-3 list-disc space-y-2 pl-5">
          {summaryIn(snapshot, locale).map((line, i) => <li key={i}>{line}</li>)}
        </ul>
        <p className="mt-3 text-sm text-loam-700">
          {words("lettersNote")}
        </p>
        <div className="mt-4 flex flex-wrap gap-3">
          <a className="inline-flex min-h-11 items-center rounded-lg bg-sprout-600 px-4 font-semibold text-white no-underline hover:bg-sprout-700" href={`/results/${t.code}/report${versionQuery}`}>
            {words("pdf")}
          </a>
          <a className="inline-flex min-h-11 items-center rounded-lg border border-loam-300 bg-white px-4 font-semibold no-underline" href={`/results/${t.code}/data?format=csv${versionQuery ? `&version=${snapshot.version}` : ""}`}>
            {words("plotCsv")}
          </a>
          <a className="inline-flex min-h-11 items-center rounded-lg border border-loam-300 bg-white px-4 font-semibold no-underline" href={`/results/${t.code}/data?format=csv&table=means${versionQuery ? `&version=${snapshot.version}` : ""}`}>
            {words("meansCsv")}
          </a>
          <a className="inline-flex min-h-11 items-center rounded-lg border border-loam-300 bg-white px-4 font-semibold no-underline" href={`/results/${t.code}/data?format=xlsx${versionQuery ? `&version=${snapshot.version}` : ""}`}>
            {words("excel")}
          </a>
        </div>
        <p className="mt-3 text-sm text-loam-700">
          {pages.rich("openJson", {
            trial: (chunks) => <a href={api.self}>{chunks}</a>,
            results: (chunks) => <a href={api.results}>{chunks}</a>,
            plots: (chunks) => <a href={api.plots}>{chunks}</a>,
            api: (chunks) => <a href={OPENAPI_PATH}>{chunks}</a>,
          })}
        </p>
      </section>

      {snapshot.results.map(({ trait, result }) => (
        <section key={trait} aria-labelledby={`trait-${trait}`} className="rounded-xl border border-husk-200 bg-white p-5">
          <h2 id={`trait-${trait}`} className="mb-3 text-xl font-bold">{localAnalysedAs(translator, result.trait)}</h2>
          <PublicTraitResults view={toPublicTraitView(result, translator)} />
          <LeftOutOfTrait exclusions={result.exclusions} />
        </section>
      ))}

      {germination && (
        <section aria-labelledby="germination" className="rounded-xl border border-husk-200 bg-white p-5">
          <h2 id="germination" className="mb-3 text-xl font-bold">{words("germination")}</h2>
          <GerminationSection germination={germination} />
        </section>
      )}

      <section aria-labelledby="varieties" className="rounded-xl border border-husk-200 bg-white p-5">
        <h2 id="varieties" className="text-xl font-bold">{words("varieties")}</h2>
        <ul className="mt-3 grid gap-2 sm:grid-cols-2">
          {snapshot.entries.map((e) => (
            <li key={e.blindCode}>
              <Link href={here(`/varieties/${e.varietyId}`)}>{e.variety}</Link>
              {e.isCheck && words("check")} <span className="text-sm text-loam-700">— {e.seedSource ?? words("noSource")}{e.treated ? words("treatedSeed") : ""}</span>
            </li>
          ))}
        </ul>
      </section>

      <section aria-labelledby="sites" className="rounded-xl border border-husk-200 bg-white p-5">
        <h2 id="sites" className="text-xl font-bold">{words("sites")}</h2>
        <ul className="mt-3 grid gap-2 sm:grid-cols-2">
          {snapshot.sites.map((s) => (
            <li key={s.name}>
              {s.id !== null ? <Link href={here(`/sites/${s.id}`)}>{s.name}</Link> : <span title={words("unnamed")}>{s.name}</span>}{" "}
              <span className="text-sm text-loam-700">
                — {s.region}, {locale === "en" ? (SETUP_LABELS[s.growingSetup as GrowingSetup] ?? s.growingSetup) : nav("setup", { setup: s.growingSetup })}
                {notIncluded.has(s.name) && words("notIncluded")}
              </span>
            </li>
          ))}
        </ul>
      </section>

      <section aria-labelledby="versions" className="text-sm text-loam-700">
        <h2 id="versions" className="text-base font-bold text-loam-900">{words("versions")}</h2>
        <ul className="mt-2 space-y-1">
          {versions.map((v) => (
            <li key={v.version}>
              <Link href={here(`/results/${t.code}${v.version === latestVersion ? "" : `?version=${v.version}`}`)}>{words("version", { version: String(v.version) })}</Link>, {locale === "en" ? v.publishedAt.toISOString().slice(0, 10) : formatDate(v.publishedAt, locale)}
              {v.changeNote ? ` — ${v.changeNote}` : ""}
            </li>
          ))}
        </ul>
        <p className="mt-3">{words("citeAs", { citation: snapshot.citation })}</p>
      </section>
    </div>
  );
}
