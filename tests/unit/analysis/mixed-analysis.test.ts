// The mixed model as the product tells it: across seasons a variety is one entry in every season it was
// grown (site-years as environments), the numbers are the library's (checked against R in
// tests/unit/stats/r-mixed-model.test.ts), and nothing is called "best" without a preferred direction.
import { describe, expect, it } from "vitest";
import { mixedAcrossSeasons, type SeasonResult } from "@/lib/domain/analysis/mixed-seasons";
import { analyseMixed, type MixedEntryInfo, type MixedRow } from "@/lib/domain/analysis/mixed";
import { mixedFromPublished, standingAcrossSeasons, type PublishedSeason } from "@/lib/domain/analysis/mixed-variety";
import type { AnalysisResult, PlotValue } from "@/lib/domain/analysis/types";
import { readCsv, readJson, relativeError } from "../stats/fixtures";

const unquote = (row: Record<string, string>) => Object.fromEntries(Object.entries(row).map(([k, v]) => [k.replace(/"/g, ""), v.replace(/"/g, "")]));

const TRAIT = { id: 1, code: "yield", name: "Yield", unit: "g per plot", valueType: "number" as const, computation: "none" as const, betterWhen: "higher" as const, analysedAs: "Yield (g per plot)" };

/** The multi-year reference case as one trial per season, each variety with its own blind code per trial. */
function seasonsOfCase03(): SeasonResult[] {
  const rows = readCsv("r-mixed/mix-pub-03-multi-year-unbalanced.csv").map(unquote);
  const years = [...new Set(rows.map((r) => r.year))];
  const sites = [...new Set(rows.map((r) => r.site))];
  return years.map((year, y) => {
    const trialId = 100 + y;
    const varieties = [...new Set(rows.filter((r) => r.year === year).map((r) => r.entry))];
    const plots: PlotValue[] = rows
      .filter((r) => r.year === year && r.value !== "" && r.value !== "NA")
      .map((r, i) => ({
        plotCode: `P${i}`,
        siteId: sites.indexOf(r.site) + 1,
        siteName: r.site,
        block: Number(r.block),
        entryId: trialId * 100 + varieties.indexOf(r.entry),
        blindCode: `T${y}-${varieties.indexOf(r.entry) + 1}`,
        varietyName: r.entry,
        value: Number(r.value),
        status: "used" as const,
      }));
    const means = varieties.map((v, i) => ({ entryId: trialId * 100 + i, blindCode: `T${y}-${i + 1}`, varietyName: v, varietyId: Number(v.slice(1)), isCheck: v === "V01" }));
    const perSite = sites.map((site, i) => ({ siteId: i + 1, siteName: site, result: { means } }));
    const result = { trial: { code: `T${year}` }, trait: TRAIT, perSite, combined: { means }, plots } as unknown as AnalysisResult;
    return { trialId, season: year, result };
  });
}

describe("across seasons", () => {
  it("varieties entering and leaving are compared through the site-years they share, as R's site-year model", () => {
    const outcome = mixedAcrossSeasons(seasonsOfCase03());
    expect(outcome.mixedProblem).toBeNull();
    const mixed = outcome.mixed!;
    expect(mixed.environmentWord).toBe("site-year");
    expect(mixed.environments).toHaveLength(12);
    const reference = readJson("r-mixed/mix-pub-03-multi-year-unbalanced.json").analyses;
    const components = reference.find((a: { id: string }) => a.id === "variance_components").components;
    for (const c of components) {
      expect(relativeError(mixed.components.find((x) => x.term === c.term)!.variance, c.variance)).toBeLessThan(1e-6);
    }
    const means = reference.find((a: { id: string }) => a.id === "entry_means_satterthwaite").means;
    for (const m of means) {
      const mine = mixed.means.find((x) => x.varietyName === m.entry)!;
      expect(relativeError(mine.mean, m.mean)).toBeLessThan(1e-7);
      expect(relativeError(mine.se, m.se)).toBeLessThan(1e-6);
    }
    // a variety grown in some seasons only still has its mean; the count of site-years says so
    expect(new Set(mixed.means.map((m) => m.environments)).size).toBeGreaterThan(1);
    expect(mixed.means.find((m) => m.isCheck)!.percentOfCheck).toBeCloseTo(100, 9);
    expect(mixed.means.map((m) => m.rank)).toEqual(mixed.means.map((_, i) => i + 1));
  });
});

describe("the mixed model in words", () => {
  const rows: MixedRow[] = [];
  const entries: MixedEntryInfo[] = ["A", "B", "C", "D"].map((key) => ({ key, label: key, blindCode: key, varietyName: null, varietyId: null, isCheck: key === "A" }));
  const siteShift = [0, 6, -4];
  const gain: Record<string, number> = { A: 0, B: 3, C: 6, D: 1 };
  const noise = [0.4, -0.3, 0.1, -0.5, 0.2, 0.6, -0.2, 0.3, -0.6, 0.5, -0.1, 0.2];
  let k = 0;
  siteShift.forEach((shift, s) => {
    for (let b = 1; b <= 3; b++) {
      for (const e of Object.keys(gain)) {
        rows.push({ site: `S${s + 1}`, block: String(b), entryKey: e, value: 20 + shift + gain[e] + 0.3 * b + ((s + e.charCodeAt(0)) % 3) * 0.4 + noise[k++ % noise.length] });
      }
    }
  });

  it("never calls a variety best for a trait without a preferred direction", () => {
    const neither = analyseMixed(rows, entries, { name: "Plant height", unit: "cm", valueType: "number", computation: "none", betterWhen: "neither" }).mixed!;
    expect(neither.means.every((m) => m.rank === null)).toBe(true);
    expect(neither.notes.join(" ")).not.toMatch(/best/i);
    const higher = analyseMixed(rows, entries, { name: "Yield", unit: "kg", valueType: "number", computation: "none", betterWhen: "higher" }).mixed!;
    expect(higher.means[0]!.key).toBe("C");
    expect(higher.means[0]!.rank).toBe(1);
    expect(higher.notes.join(" ")).toMatch(/best \(highest\) is C/);
  });

  it("says how much sites differ and how much varieties change rank between them, with letters from the pairwise tests", () => {
    const mixed = analyseMixed(rows, entries, { name: "Yield", unit: "kg", valueType: "number", computation: "none", betterWhen: "higher" }).mixed!;
    const words = mixed.components.map((c) => c.words).join(" ");
    expect(words).toMatch(/How much sites differ/);
    expect(words).toMatch(/How much varieties change rank between sites/);
    expect(mixed.means.every((m) => m.letter !== null)).toBe(true);
    // C and A are 6 apart with small noise: they cannot share a letter
    const letterOf = (key: string) => mixed.means.find((m) => m.key === key)!.letter!;
    expect([...letterOf("C")].some((ch) => letterOf("A").includes(ch))).toBe(false);
  });

  it("one site is a plain problem, not an error", () => {
    const outcome = analyseMixed(rows.filter((r) => r.site === "S1"), entries, { name: "Yield", unit: "kg", valueType: "number", computation: "none", betterWhen: "higher" });
    expect(outcome.mixed).toBeNull();
    expect(outcome.problem).toMatch(/at least two/);
  });
});

describe("variety history across seasons from published versions", () => {
  /** Case 03 as one published version per season; `data` rows as the snapshot stores them. */
  function published(): PublishedSeason[] {
    const rows = readCsv("r-mixed/mix-pub-03-multi-year-unbalanced.csv").map(unquote);
    return [...new Set(rows.map((r) => r.year))].map((year) => {
      const mine = rows.filter((r) => r.year === year);
      const varieties = [...new Set(mine.map((r) => r.entry))];
      const code = (v: string) => `C${year.slice(2)}${varieties.indexOf(v)}`;
      return {
        trial: { code: `T${year}`, season: "Summer", year: Number(year) },
        entries: varieties.map((v) => ({ blindCode: code(v), varietyId: Number(v.slice(1)), variety: v, isCheck: v === "V01" })),
        results: [{ result: { trait: { ...TRAIT } } }],
        data: mine.map((r) => ({ site: r.site, block: Number(r.block), blindCode: code(r.entry), trait: TRAIT.analysedAs, value: r.value === "" || r.value === "NA" ? null : Number(r.value), status: r.value === "" || r.value === "NA" ? "missing" : "used" })),
      };
    });
  }

  it("uses only the published versions' used values, with site-years as environments, as R's model", () => {
    const { mixed, seasons } = mixedFromPublished(published(), "yield");
    expect(seasons).toBe(3);
    const reference = readJson("r-mixed/mix-pub-03-multi-year-unbalanced.json").analyses;
    const means = reference.find((a: { id: string }) => a.id === "entry_means_satterthwaite").means;
    for (const m of means) {
      const standing = standingAcrossSeasons(mixed!, `variety:${Number(m.entry.slice(1))}`)!;
      expect(relativeError(standing.mean, m.mean)).toBeLessThan(1e-7);
      expect(relativeError(standing.se, m.se)).toBeLessThan(1e-6);
      expect(standing.totalEnvironments).toBe(12);
    }
  });

  it("a value marked excluded or from another trait never enters the model", () => {
    const versions = published();
    const clean = mixedFromPublished(versions, "yield").mixed!;
    const tampered = versions.map((v) => ({ ...v, data: [...v.data, { site: "S1", block: 1, blindCode: v.entries[0]!.blindCode, trait: TRAIT.analysedAs, value: 1e6, status: "excluded" }, { site: "S1", block: 1, blindCode: v.entries[0]!.blindCode, trait: "Other trait", value: 1e6, status: "used" }] }));
    const again = mixedFromPublished(tampered, "yield").mixed!;
    expect(again.n).toBe(clean.n);
    expect(again.means.map((m) => m.mean)).toEqual(clean.means.map((m) => m.mean));
  });
});
