import { describe, expect, it } from "vitest";
import { summariseForGrowers, type SummarisedResult } from "@/lib/domain/publish/summary";
import { localComparisonNote, toPublicGerminationView, toPublicTraitView } from "@/lib/domain/publish/public-view";
import { translatorFor } from "@/lib/domain/i18n/catalogue";
import type { PublicTraitResult } from "@/lib/domain/publish/public-shape";

// The public trial page words its summary again from the published figures when it is read in Spanish: the
// same statistical claims (a difference only with a significant F test, ties said as ties) in Spanish, with
// Spanish numbers, and the variety names as they were typed.

const mean = (blindCode: string, varietyName: string, value: number, rank: number | null, letter: string | null) => ({ blindCode, varietyName, mean: value, lsMean: null, rank, letter });

const YIELD: SummarisedResult = {
  trait: { code: "marketable_yield", name: "Marketable yield", unit: "g per plot", valueType: "number", computation: "none", betterWhen: "higher", analysedAs: "Marketable yield" },
  combined: { sites: 3, entryP: 0.004, interactionP: 0.01, means: [mean("A1", "Bloomsdale Long Standing", 2812.4, 1, "a"), mean("B2", "Red Kitten", 2650.2, 2, "a"), mean("C3", "Space", 2101.7, 3, "b")] },
  perSite: [],
};
const EMERGENCE: SummarisedResult = {
  trait: { code: "emergence_date", name: "Emergence date", unit: "date", valueType: "date", computation: "days_from_sowing", betterWhen: "lower", analysedAs: "Emergence date (days from sowing)" },
  combined: { sites: 3, entryP: 0.31, interactionP: null, means: [mean("A1", "Bloomsdale Long Standing", 6.2, 1, null), mean("B2", "Red Kitten", 6.8, 2, null)] },
  perSite: [],
};
const HARVEST: SummarisedResult = {
  trait: { code: "harvest_date", name: "First harvest date", unit: "date", valueType: "date", computation: "days_from_sowing", betterWhen: "neither", analysedAs: "First harvest date (days from sowing)" },
  combined: null,
  perSite: [{ result: { entryP: 0.001, means: [mean("A1", "Bloomsdale Long Standing", 41.5, null, "a"), mean("B2", "Red Kitten", 47.25, null, "b")] } }],
};

const ENGLISH_PHRASES = ["did not differ clearly", "came first", "across 3 sites", "not clearly different from", "treat any order as a tie", "Rankings changed", "neither end is better", "days from sowing", "g per plot", "Marketable yield", "was earliest"];

describe("the public trial page's summary in Spanish", () => {
  it("a Spanish translator words every summary sentence in Spanish, with a decimal comma and the variety names as typed", () => {
    const lines = summariseForGrowers([YIELD, EMERGENCE, HARVEST], translatorFor("es"));
    expect(lines).toEqual([
      "Rendimiento comercial: Bloomsdale Long Standing quedó en primer lugar en los 3 sitios con la media más alta (2812 g por parcela), sin diferencia clara con Red Kitten. El orden cambió de un sitio a otro, así que fíjese en el sitio más parecido al suyo.",
      "Fecha de emergencia (días desde la siembra): las variedades no difirieron claramente en los 3 sitios (p = 0,310); considere cualquier orden como un empate.",
      "Fecha de primera cosecha (días desde la siembra): Bloomsdale Long Standing fue la más temprana en el único sitio analizado (41,5 días) y Red Kitten la más tardía (47,3 días); ningún extremo es mejor en sí mismo.",
    ]);
    const text = lines.join(" ");
    for (const phrase of ENGLISH_PHRASES) expect(text, phrase).not.toContain(phrase);
  });

  it("English stays the published wording", () => {
    expect(summariseForGrowers([YIELD, EMERGENCE])).toEqual([
      "Marketable yield: Bloomsdale Long Standing came first across 3 sites with the highest mean (2,812 g per plot), not clearly different from Red Kitten. Rankings changed from site to site, so look at the site most like your own.",
      "Emergence date (days from sowing): the varieties did not differ clearly across 3 sites (p = 0.310); treat any order as a tie.",
    ]);
    expect(summariseForGrowers([], translatorFor("es"))).toEqual(["No hubo datos suficientes para comparar las variedades."]);
  });

  it("the notes and the order sentence under a Spanish means table are Spanish (DMS, Tukey, puesto)", () => {
    const es = translatorFor("es");
    const trait = { ...YIELD.trait, unit: "g per plot" } as PublicTraitResult["trait"];
    expect(localComparisonNote(es, trait, { lsd: 134.2, comparisonNote: "LSD 0.05 = 134 g per plot." })).toBe("DMS 0,05 = 134 g por parcela.");
    expect(localComparisonNote(es, trait, { lsd: null, comparisonNote: "Tukey found 2 pairs that differ at α = 0.05." })).toBe("La prueba de Tukey encontró 2 pares que difieren a α = 0,05.");
    expect(localComparisonNote(es, trait, { lsd: null, comparisonNote: "no LSD is given across sites because the variety F test was not significant (protected LSD)." })).toMatch(/^No se da DMS/);
    const view = toPublicTraitView({ trait, perSite: [], combined: { sites: 3, means: [], cv: 8.25, lsd: 134.2, entryP: 0.004, comparisonNote: "LSD 0.05 = 134 g per plot.", cellMeans: [] } as never, combinedProblem: null, missing: [], exclusions: [], warnings: [], notes: [], germination: null, emergence: null } as PublicTraitResult, es);
    expect(view.analysedAs).toBe("Rendimiento comercial");
    expect(view.unit).toBe("g por parcela");
    expect(view.scope).toBe("en los 3 sitios");
    expect(view.orderSentence).toBe("Ordenadas de la más alta a la más baja: en este carácter más alto es mejor, así que el puesto 1 tiene la media más alta.");
    expect(toPublicTraitView({ ...view, trait, perSite: [], combined: null, combinedProblem: null } as unknown as PublicTraitResult).orderSentence).toBe(
      "Listed highest first: higher is better for this trait, so rank 1 has the highest mean.",
    );
  });

  it("a reason stored in English (no combined analysis, a germination test that could not run) is not shown to a Spanish reader", () => {
    const es = translatorFor("es");
    const trait = { ...YIELD.trait } as PublicTraitResult["trait"];
    const empty = { trait, perSite: [], combined: null, combinedProblem: "A combined analysis needs at least 2 analysed sites (there is 1).", missing: [], exclusions: [], warnings: [], notes: [], germination: null, emergence: null } as unknown as PublicTraitResult;
    expect(toPublicTraitView(empty, es).problem).toBeNull();
    expect(toPublicTraitView(empty).problem).toBe("A combined analysis needs at least 2 analysed sites (there is 1).");
    const germination = { byEntry: [], bySite: [], chiSquare: null, cmh: null, labels: [], note: "The germination chi-square could not be run: every count is zero." };
    const withCounts = [{ result: { ...empty, germination } as unknown as PublicTraitResult }];
    expect(toPublicGerminationView(withCounts, es)!.note).toBe("No se pudieron realizar las pruebas de germinación con estos conteos.");
    expect(toPublicGerminationView(withCounts)!.note).toBe(germination.note);
  });
});
