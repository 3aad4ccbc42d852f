import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { z } from "zod";
import { getPublicSite } from "@/server/publish/public-snapshots";
import { SETUP_LABELS } from "@/lib/domain/vocabulary/labels";
import { formatNumber, formatP } from "@/lib/domain/analysis/format";
import type { GrowingSetup } from "@/lib/domain/vocabulary/enums";

type Params = Promise<{ siteId: string }>;
const idSchema = z.coerce.number().int().positive().max(2_000_000_000);

async function load(params: Params) {
  const id = idSchema.safeParse((await params).siteId);
  return id.success ? getPublicSite(id.data) : null;
}

export async function generateMetadata({ params }: { params: Params }): Promise<Metadata> {
  const found = await load(params);
  return found ? { title: `${found.site.name} — partner site`, description: found.site.publicDescription ?? undefined } : { title: "Not found" };
}

/** A partner site's public description only; growers' names and contacts are never shown. */
export default async function PublicSitePage({ params }: { params: Params }) {
  const found = await load(params);
  if (!found) notFound();
  const { site, trials } = found;
  return (
    <div className="mx-auto max-w-3xl px-4 py-10">
      <p className="text-sm font-semibold text-sprout-700"><Link href="/results">Results</Link> · partner {site.kind}</p>
      <h1 className="mt-1 text-3xl font-bold">{site.name}</h1>
      {site.publicDescription && <p className="mt-3 text-lg">{site.publicDescription}</p>}
      <dl className="mt-6 grid grid-cols-[auto_1fr] gap-x-6 gap-y-2 rounded-xl border border-husk-200 bg-white p-5">
        <dt className="font-semibold">Region</dt><dd>{site.region}</dd>
        <dt className="font-semibold">Growing setup</dt><dd>{SETUP_LABELS[site.growingSetup as GrowingSetup] ?? site.growingSetup}</dd>
        {site.soil && (<><dt className="font-semibold">Soil or medium</dt><dd>{site.soil}</dd></>)}
        {site.irrigation && (<><dt className="font-semibold">Watering</dt><dd>{site.irrigation}</dd></>)}
      </dl>
      <h2 className="mt-8 text-xl font-bold">Published trials grown here</h2>
      <ul className="mt-2 space-y-4">
        {trials.map((t) => (
          <li key={t.code} className="rounded-xl border border-husk-200 bg-white p-5">
            <h3 className="font-bold"><Link href={`/results/${t.code}`}>{t.title}</Link> ({t.season})</h3>
            {!t.inResults && <p className="mt-1 text-sm">This site is not included in the published results of this trial.</p>}
            {t.leaders.length > 0 && (
              <dl className="mt-2 space-y-1 text-sm" aria-label={`What came first at ${site.name}`}>
                {t.leaders.map((l) => (
                  <div key={l.trait}>
                    <dt className="inline font-semibold">{l.clear ? `${l.trait}, ${l.heading.charAt(0).toLowerCase()}${l.heading.slice(1)}: ` : `${l.trait}: `}</dt>
                    <dd className="inline">
                      {l.clear ? (
                        <>
                          {l.variety}, {l.value}
                          {l.isCheck ? " (the check)" : l.percentOfCheck !== null ? ` (${formatNumber(l.percentOfCheck, 0)}% of check)` : ""}
                        </>
                      ) : (
                        `the varieties did not differ clearly here (${formatP(l.entryP)}).`
                      )}
                    </dd>
                  </div>
                ))}
              </dl>
            )}
          </li>
        ))}
      </ul>
      <p className="mt-3 text-sm text-loam-700">One site and one season; the trial pages compare every variety across all sites.</p>
    </div>
  );
}
