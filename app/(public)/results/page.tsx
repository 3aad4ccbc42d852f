import type { Metadata } from "next";
import Link from "next/link";
import { listPublicTrials } from "@/server/publish/public-snapshots";
import { SelectField, TextField } from "@/components/ui/field";
import { Button } from "@/components/ui/button";
import { API_BASE, OPENAPI_PATH } from "@/lib/domain/publish/open-data";

export const metadata: Metadata = {
  title: "Variety trial results",
  description: "Published results of the Tamarack Valley on-farm vegetable and flower variety trials, by crop and season.",
};

type Search = Promise<Record<string, string | string[] | undefined>>;
const one = (v: string | string[] | undefined) => (Array.isArray(v) ? v[0] : v)?.slice(0, 100) || undefined;

export default async function ResultsIndex({ searchParams }: { searchParams: Search }) {
  const params = await searchParams;
  const filters = { q: one(params.q), crop: one(params.crop), season: one(params.season) };
  const { trials, crops, seasons } = await listPublicTrials(filters);
  return (
    <div className="mx-auto max-w-6xl px-4 py-10">
      <h1 className="text-3xl font-bold">Variety trial results</h1>
      <p className="mt-2 max-w-3xl text-loam-700">
        Results our partner farms and gardens grew, with the varieties named. Each trial page has a plain-language summary, the
        numbers behind it, a PDF report and the data. Programs and researchers can read every published trial as open JSON from{" "}
        <a href={`${API_BASE}/trials`}>the open data API</a> (<a href={OPENAPI_PATH}>OpenAPI description</a>).
      </p>
      <form role="search" aria-label="Find results" className="mt-6 grid gap-3 rounded-xl border border-husk-200 bg-white p-4 sm:grid-cols-[2fr_1fr_1fr_auto]">
        <TextField label="Search" name="q" id="q" defaultValue={filters.q} placeholder="Crop, variety or trial" />
        <SelectField label="Crop" name="crop" id="crop" defaultValue={filters.crop ?? ""}>
          <option value="">All crops</option>
          {crops.map((c) => <option key={c}>{c}</option>)}
        </SelectField>
        <SelectField label="Season" name="season" id="season" defaultValue={filters.season ?? ""}>
          <option value="">All seasons</option>
          {seasons.map((s) => <option key={s}>{s}</option>)}
        </SelectField>
        <Button type="submit" className="self-end">
          Show
        </Button>
      </form>
      <p className="mt-6 text-sm text-loam-700" aria-live="polite">
        {trials.length === 0 ? "No published results match." : `${trials.length} published ${trials.length === 1 ? "trial" : "trials"}`}
      </p>
      <ul className="mt-3 grid gap-4 md:grid-cols-2">
        {trials.map((t) => (
          <li key={t.code} className="rounded-xl border border-husk-200 bg-white p-5">
            <p className="text-sm font-semibold text-sprout-700">{t.crop} · {t.season}</p>
            <h2 className="mt-1 text-xl font-bold">
              <Link href={`/results/${t.code}`}>{t.title}</Link>
            </h2>
            <p className="mt-2 text-loam-900">{t.summary}</p>
            <p className="mt-2 text-sm text-loam-700">
              {t.sites} sites · {t.entries.length} varieties · version {t.version}, {t.publishedAt.slice(0, 10)}
            </p>
          </li>
        ))}
      </ul>
    </div>
  );
}
