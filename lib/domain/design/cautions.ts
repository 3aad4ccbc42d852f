// Protocol cautions printed on every sheet. They point to the label and to local rules rather than
// prescribing products or electrical work, which Seedplot has no business advising on.

export interface CautionContext {
  /** blind codes whose packets hold treated seed */
  treatedCodes: readonly string[];
  plotUnit: "insert" | "cells" | "bed_row";
  growingSetup: "indoor_lights" | "greenhouse" | "high_tunnel" | "field";
}

export interface Caution {
  title: string;
  text: string;
}

export function cautionsFor(c: CautionContext): Caution[] {
  const out: Caution[] = [];
  if (c.treatedCodes.length > 0) {
    const codes = c.treatedCodes.join(", ");
    out.push({
      title: "Treated seed in this kit",
      text: `${c.treatedCodes.length === 1 ? `The packet coded ${codes} holds` : `The packets coded ${codes} hold`} treated seed (marked TREATED on the maps and labels). Read the seed tag and follow its directions: wear gloves when handling, keep it away from children and animals; treated seed is not for food or feed. Dispose of leftovers as the label and local rules require. Organic certification may not allow it; check before sowing.`,
    });
  }
  if (c.plotUnit !== "bed_row") {
    out.push({
      title: "Clean trays before sowing",
      text: "Wash reused flats and inserts, then sanitise them as the product label directs (a common method is a soak in diluted household bleach, then a rinse). Never mix cleaning products.",
    });
  }
  if (c.growingSetup === "indoor_lights" || c.growingSetup === "greenhouse" || c.plotUnit !== "bed_row") {
    out.push({
      title: "Electrical equipment near water",
      text: "Heat mats, lights and timers sit close to water. Use equipment made for the purpose, plugged into a protected (GFCI) outlet; keep cords and plugs dry and off the floor, and follow the maker's instructions and your local electrical code.",
    });
  }
  out.push({
    title: "Labels and local rules come first",
    text: "Where these notes differ from a product label, the label and your local regulations apply. Ask your coordinator if in doubt.",
  });
  return out;
}

/** One column of the field data sheet: a trait on one scheduled day, or a trait recorded once. */
export interface SheetColumn {
  traitId: number;
  heading: string;
  /** Day after sowing, or null for traits timed by an event (first harvest, etc.). */
  day: number | null;
  when: string;
}

/** Lists what is recorded on each plot, in the trial's trait order (a scheduled count once per day, in place). */
export function sheetColumns(
  traits: { id: number; name: string; unit: string | null; dueDaysAfterSowing: number[] | null; dueNote: string | null }[],
  dueDate: (day: number) => string | null,
): SheetColumn[] {
  const columns: SheetColumn[] = [];
  for (const t of traits) {
    const unit = t.unit ? ` (${t.unit})` : "";
    if (t.dueDaysAfterSowing && t.dueDaysAfterSowing.length > 0) {
      for (const day of t.dueDaysAfterSowing) columns.push({ traitId: t.id, heading: `${t.name}${unit}`, day, when: `Day ${day}${dueDate(day) ? ` · ${dueDate(day)}` : ""}` });
    } else {
      columns.push({ traitId: t.id, heading: `${t.name}${unit}`, day: null, when: t.dueNote ?? "When it happens" });
    }
  }
  return columns;
}
