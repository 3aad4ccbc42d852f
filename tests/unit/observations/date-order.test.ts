import { describe, expect, it } from "vitest";
import { entryColumns, type TraitForColumns } from "@/lib/domain/observations/columns";
import { datesToCheck, packetTolerance, type SiteDates } from "@/lib/domain/observations/date-order";
import { flagValues } from "@/lib/domain/observations/flags";
import { parseCell, type CellValue } from "@/lib/domain/observations/values";
import { formatDate } from "@/lib/domain/vocabulary/labels";
import { translatorFor } from "@/lib/domain/i18n/catalogue";

const trait = (t: Partial<TraitForColumns> & Pick<TraitForColumns, "id" | "code" | "name">): TraitForColumns => ({
  unit: "date",
  valueType: "date",
  minValue: null,
  maxValue: null,
  dueDaysAfterSowing: null,
  dueNote: null,
  computation: "days_from_sowing",
  ...t,
});
const columns = entryColumns([
  trait({ id: 1, code: "emergence_date", name: "Emergence date" }),
  trait({ id: 2, code: "harvest_date", name: "First harvest date" }),
  trait({ id: 3, code: "transplant_maturity", name: "Maturity date", computation: "days_from_transplant" }),
  trait({ id: 4, code: "quality", name: "Quality", valueType: "rating", unit: "1-9" }),
]);
const col = (code: string) => columns.find((c) => c.traitCode === code)!;
const date = (iso: string): CellValue => ({ valueNumber: null, valueDate: iso, valueText: null });
const site: SiteDates = { sownOn: "2026-04-01", transplantedOn: null };
const ctx = { sownOn: site.sownOn, today: "2026-12-01" };

function check(values: Record<string, string>, opts: { packetDays?: number | null; site?: SiteDates; audience?: "grower" | "staff" } = {}) {
  return datesToCheck({ columns, value: (key) => (values[key] ? date(values[key]!) : null), site: opts.site ?? site, packetDays: opts.packetDays ?? null, audience: opts.audience ?? "grower" });
}

describe("date-order checks", () => {
  it("a harvest date before the plot's emergence date is a warning naming both dates, under both fields", () => {
    const found = check({ emergence_date: "2026-05-09", harvest_date: "2026-05-03" });
    expect(found).toEqual([
      {
        key: "harvest_date",
        keys: ["harvest_date", "emergence_date"],
        kind: "date_order",
        message: `First harvest on ${formatDate("2026-05-03")} is before emergence on ${formatDate("2026-05-09")} in this plot — check both dates.`,
      },
    ]);
    // A warning, not a refusal: the harvest date itself still parses.
    expect(parseCell(col("harvest_date"), "2026-05-03", ctx)).toMatchObject({ ok: true });
  });

  it("a harvest on the day of emergence is flagged; one after it is not", () => {
    expect(check({ emergence_date: "2026-04-08", harvest_date: "2026-04-08" })[0]?.message).toMatch(/is on the same day as emergence on/);
    expect(check({ emergence_date: "2026-04-08", harvest_date: "2026-05-20" })).toEqual([]);
    expect(check({ harvest_date: "2026-05-20" })).toEqual([]);
  });

  it("a harvest far from the packet's days to maturity is a warning; one within the rule of thumb is not", () => {
    expect(packetTolerance(46)).toBe(18);
    expect(packetTolerance(24)).toBe(14);
    // 1 day after sowing, packet 46 days: the case found in the walk-through.
    const early = check({ harvest_date: "2026-04-02" }, { packetDays: 46, audience: "staff" });
    expect(early).toEqual([
      { key: "harvest_date", keys: ["harvest_date"], kind: "far_from_packet", message: `First harvest on ${formatDate("2026-04-02")} is 1 day after sowing, far from the 46 days to maturity on this entry's seed packet — check the date.` },
    ]);
    expect(check({ harvest_date: "2026-05-16" }, { packetDays: 46 })).toEqual([]); // 45 days
    expect(check({ harvest_date: "2026-05-05" }, { packetDays: 46 })).toEqual([]); // 34 days: 12 early, within 18
    expect(check({ harvest_date: "2026-07-01" }, { packetDays: 46 })[0]?.kind).toBe("far_from_packet"); // 91 days
    expect(check({ harvest_date: "2026-04-02" }, { packetDays: null })).toEqual([]);
  });

  it("a grower's packet warning never states the packet's figure (entries are blind)", () => {
    const [early] = check({ harvest_date: "2026-04-02" }, { packetDays: 46 });
    expect(early?.message).toBe(`First harvest on ${formatDate("2026-04-02")} is 1 day after sowing, much sooner than this entry is expected to be ready — check the date.`);
    expect(early?.message).not.toMatch(/46/);
    expect(check({ harvest_date: "2026-08-01" }, { packetDays: 46 })[0]?.message).toMatch(/122 days after sowing, much later than/);
  });

  it("transplant-counted maturity is measured from the transplanting date; a sowing-counted harvest before transplanting is a warning", () => {
    const transplanted: SiteDates = { sownOn: "2026-03-01", transplantedOn: "2026-04-10" };
    // 60 days after transplanting against a 60-day packet: fine, although 100 days after sowing.
    expect(check({ transplant_maturity: "2026-06-09" }, { packetDays: 60, site: transplanted })).toEqual([]);
    expect(check({ transplant_maturity: "2026-04-20" }, { packetDays: 60, site: transplanted, audience: "staff" })[0]?.message).toMatch(/is 10 days after transplanting, far from the 60 days/);
    expect(check({ harvest_date: "2026-04-05" }, { site: transplanted })).toEqual([
      { key: "harvest_date", keys: ["harvest_date"], kind: "date_order", message: `First harvest on ${formatDate("2026-04-05")} is before this site's transplanting date, ${formatDate("2026-04-10")} — check the date.` },
    ]);
  });

  it("a date counted from transplanting cannot be before the transplanting date: refused with both dates", () => {
    const c = { ...ctx, sownOn: "2026-03-01", transplantedOn: "2026-04-10" };
    expect(parseCell(col("transplant_maturity"), "2026-04-09", c)).toEqual({
      ok: false,
      message: `Maturity on ${formatDate("2026-04-09")} is before this site's transplanting date, ${formatDate("2026-04-10")}, and it is counted in days from transplanting. Check the date; if the transplanting date is wrong, ask your coordinator to correct it.`,
    });
    expect(parseCell(col("transplant_maturity"), "2026-04-10", c)).toMatchObject({ ok: true });
    // Emergence happens in the tray before transplanting: only the sowing date bounds it.
    expect(parseCell(col("emergence_date"), "2026-03-08", c)).toMatchObject({ ok: true });
  });

  it("an emergence date before sowing is refused in the app's date format", () => {
    expect(parseCell(col("emergence_date"), "2026-03-30", ctx)).toEqual({
      ok: false,
      message: `Emergence on ${formatDate("2026-03-30")} is before this site's sowing date, ${formatDate("2026-04-01")}. Check the date; if the sowing date is wrong, ask your coordinator to correct it.`,
    });
  });

  it("Values to check lists stored dates out of order and far from the packet, worded for staff", () => {
    const plots = [
      { id: 10, blindCode: "AAA", plotCode: "S1-101" },
      { id: 11, blindCode: "BBB", plotCode: "S1-102" },
    ];
    const values = { 10: { emergence_date: date("2026-04-09"), harvest_date: date("2026-04-02") }, 11: { emergence_date: date("2026-04-08"), harvest_date: date("2026-05-18") } };
    const flags = flagValues({ columns, plots, values, dates: { site, packetDays: { 10: 46, 11: 46 } } });
    expect(flags.map((f) => [f.plotId, f.key, f.kind])).toEqual([
      [10, "harvest_date", "date_order"],
      [10, "harvest_date", "far_from_packet"],
    ]);
    expect(flags[1]!.message).toMatch(/46 days to maturity on this entry's seed packet/);
  });
  it("a grower reading Spanish gets date-order warnings and refusals in Spanish, with the dates written the Spanish way", () => {
    const es = translatorFor("es");
    const spanish = entryColumns([trait({ id: 1, code: "emergence_date", name: "Emergence date" }), trait({ id: 2, code: "harvest_date", name: "First harvest date" })], es);
    const found = datesToCheck({ columns: spanish, value: (key) => ({ emergence_date: date("2026-05-09"), harvest_date: date("2026-05-03") })[key] ?? null, site, packetDays: 80, audience: "grower", t: es });
    expect(found.map((w) => w.message)).toEqual([
      `La fecha de primera cosecha (${formatDate("2026-05-03", "es")}) es anterior a la de emergencia (${formatDate("2026-05-09", "es")}) en esta parcela: revise ambas fechas.`,
      `La fecha de primera cosecha (${formatDate("2026-05-03", "es")}) cae 32 días después de la siembra, mucho antes de cuando se espera que esta variedad esté lista: revise la fecha.`,
    ]);
    expect(formatDate("2026-05-03", "es")).toMatch(/^3 may/);
    const sameDay = datesToCheck({ columns: spanish, value: () => date("2026-05-09"), site, packetDays: null, audience: "grower", t: es });
    expect(sameDay[0]!.message).toMatch(/^La fecha de primera cosecha \(.+\) cae el mismo día que la de emergencia \(.+\) en esta parcela/);
    const emergence = spanish.find((c) => c.traitCode === "emergence_date")!;
    expect(parseCell(emergence, "2026-03-30", { ...ctx, t: es })).toEqual({
      ok: false,
      message: `La fecha de emergencia (${formatDate("2026-03-30", "es")}) es anterior a la fecha de siembra de este sitio, ${formatDate("2026-04-01", "es")}. Revise la fecha; si la fecha de siembra está mal, pida a la coordinación que la corrija.`,
    });
  });
});
