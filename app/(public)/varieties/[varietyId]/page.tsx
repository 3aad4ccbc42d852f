import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { z } from "zod";
import { getPublicVariety } from "@/server/publish/public-snapshots";
import { CheckHistoryTable, VarietyTraitTable } from "@/components/public/variety-trait-table";
import { publicVarietyAcrossSeasons } from "@/server/publish/public-variety-mixed";
import { AcrossSeasonsStanding } from "@/components/analysis/across-seasons-standing";

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
  const variety = await load(params);
  if (!variety) return { title: "Not found" };
  return { title: `${variety.name} (${variety.crop}) trial results`, description: `How ${variety.name} did in ${variety.trials.length} published on-farm variety trials.` };
}

export default async function PublicVarietyPage({ params }: { params: Params }) {
  const variety = await load(params);
  if (!variety) notFound();
  // the id in the address, which the public page already shows; the view itself carries no ids
  const acrossSeasons = await publicVarietyAcrossSeasons((await idOf(params))!);
  return (
    <div className="mx-auto max-w-5xl px-4 py-10">
      <p className="text-sm font-semibold text-sprout-700"><Link href="/results">Results</Link> · {variety.crop}</p>
      <h1 className="mt-1 text-3xl font-bold">{variety.name}</h1>
      <p className="mt-2 text-loam-700">
        Results in {variety.trials.length} published {variety.trials.length === 1 ? "trial" : "trials"}. Rank 1 is the best for the trait&apos;s direction: the
        highest where higher is better (yield), the lowest or earliest where lower is better (days to emergence); traits with no better direction are not
        ranked. % of check compares this variety&apos;s mean with the check variety&apos;s in the same trial (check = 100).
      </p>
      <section className="mt-6 rounded-xl border border-husk-200 bg-white p-5" aria-labelledby="check-history">
        <h2 id="check-history" className="text-xl font-bold">% of check, season by season</h2>
        <div className="mt-3">
          <CheckHistoryTable seasons={variety.trials.map((t) => ({ code: t.code, season: t.season, isCheck: t.isCheck, traits: t.traits }))} caption={`${variety.name}: % of check by season`} />
        </div>
      </section>
      {acrossSeasons.length > 0 && (
        <section className="mt-6 rounded-xl border border-husk-200 bg-white p-5" aria-labelledby="across-seasons">
          <h2 id="across-seasons" className="text-xl font-bold">All seasons together</h2>
          <div className="mt-3">
            <AcrossSeasonsStanding rows={acrossSeasons} name={variety.name} />
          </div>
        </section>
      )}
      {variety.trials.map((t) => (
        <section key={t.code} className="mt-6 rounded-xl border border-husk-200 bg-white p-5" aria-labelledby={`t-${t.code}`}>
          <h2 id={`t-${t.code}`} className="text-xl font-bold">
            <Link href={`/results/${t.code}`}>{t.title}</Link>
          </h2>
          <p className="text-sm text-loam-700">{t.season} · {t.sites} sites · {t.entriesInTrial} varieties{t.isCheck ? " · grown as the check variety" : ""}</p>
          <div className="mt-3">
            <VarietyTraitTable rows={t.traits} caption={`${variety.name} in ${t.title}`} isCheck={t.isCheck} />
          </div>
        </section>
      ))}
    </div>
  );
}
