import Link from "next/link";
import { buttonClasses } from "@/components/ui/button";
import { listPublicTrials } from "@/server/publish/public-snapshots";
import { OPENAPI_PATH } from "@/lib/domain/publish/open-data";

export const dynamic = "force-dynamic";

const STEPS = [
  { title: "Choose and code", text: "Extension staff pick crops and varieties, give each a blind code, and pack seed kits with a protocol." },
  { title: "Sow in blocks", text: "Partner farms and gardens sow replicated plots in randomised blocks, in trays under lights or in beds." },
  { title: "Record", text: "Growers count seedlings, note emergence and harvest dates, weigh yield and rate quality, by phone or spreadsheet." },
  { title: "Analyse and publish", text: "Staff check the data, compare varieties within and across sites, and publish plain-language results." },
];

export default async function HomePage() {
  const latest = (await listPublicTrials({})).trials.slice(0, 4);
  return (
    <div>
      <section className="bg-loam-900 text-white">
        <div className="mx-auto grid max-w-6xl gap-8 px-4 py-14 md:grid-cols-[3fr_2fr] md:py-20">
          <div>
            <p className="text-sm font-semibold uppercase tracking-widest text-marigold-400">Tamarack Valley Extension District</p>
            <h1 className="mt-3 text-4xl font-bold leading-tight md:text-5xl">Variety trials grown by the farms that will use the results</h1>
            <p className="mt-5 max-w-2xl text-lg text-loam-100">
              Each season our partner farms and gardens grow side-by-side plots of vegetable and flower varieties under
              their own conditions. Seedplot collects their counts, dates, yields and ratings, runs the statistics, and
              publishes which varieties did well where — and how sure we are.
            </p>
            <div className="mt-8 flex flex-wrap gap-3">
              <Link href="/results" className={buttonClasses("primary")}>
                See the results
              </Link>
              <Link href="/sign-in" className={buttonClasses("secondary")}>
                Partner sign-in
              </Link>
            </div>
          </div>
          <dl className="grid grid-cols-2 gap-4 self-end">
            {[
              ["Partner sites", "farms, market gardens and school gardens"],
              ["Blind-coded entries", "so nobody's favourite gets a head start"],
              ["Replicated blocks", "at every site, randomised separately"],
              ["Open results", "means, LSD, CV and plain-language notes"],
            ].map(([term, detail]) => (
              <div key={term} className="rounded-xl bg-loam-700 p-4">
                <dt className="font-bold text-white">{term}</dt>
                <dd className="mt-1 text-sm text-loam-100">{detail}</dd>
              </div>
            ))}
          </dl>
        </div>
      </section>
      {latest.length > 0 && (
        <section className="mx-auto max-w-6xl px-4 pt-12" aria-labelledby="latest">
          <h2 id="latest" className="text-2xl font-bold">Latest results</h2>
          <ul className="mt-4 grid gap-4 md:grid-cols-2">
            {latest.map((t) => (
              <li key={t.code} className="rounded-xl border border-husk-200 bg-white p-5">
                <p className="text-sm font-semibold text-sprout-700">{t.crop} · {t.season}</p>
                <h3 className="mt-1 text-lg font-bold"><Link href={`/results/${t.code}`}>{t.title}</Link></h3>
                <p className="mt-2">{t.summary}</p>
              </li>
            ))}
          </ul>
          <p className="mt-4 text-sm text-loam-700">
            <Link href="/results">All published results</Link> · open data for your own analysis: <a href={OPENAPI_PATH}>the JSON API and its description</a>
          </p>
        </section>
      )}
      <section className="mx-auto max-w-6xl px-4 py-12" aria-labelledby="how">
        <h2 id="how" className="text-2xl font-bold">How a season works</h2>
        <ol className="mt-6 grid gap-4 md:grid-cols-4">
          {STEPS.map((step, i) => (
            <li key={step.title} className="rounded-xl border border-husk-200 bg-white p-5">
              <span className="inline-flex size-8 items-center justify-center rounded-full bg-sprout-600 font-bold text-white">{i + 1}</span>
              <h3 className="mt-3 font-bold">{step.title}</h3>
              <p className="mt-1 text-loam-700">{step.text}</p>
            </li>
          ))}
        </ol>
        <p className="mt-8 max-w-3xl text-loam-700">
          Want to host a trial? Partner sites commit a small bed or a few flats of trays for one season. Talk to your
          district extension office; your coordinator will send an invitation to Seedplot.
        </p>
      </section>
    </div>
  );
}
