import { isAnalysable } from "@/lib/domain/analysis/values";

// Trait codes the code itself relies on (traits are data, but these feed fixed rules: seedling counts,
// germination). One place, so no rule spells a code as a literal.

export const SEEDS_SOWN_CODE = "seeds_sown";
/** Seedlings up at the end of emergence, one count per plot. */
export const EMERGED_FINAL_CODE = "emerged_final";
/** Cumulative seedling counts on fixed days after sowing (the occasion is the day). */
export const EMERGENCE_COUNT_CODE = "emergence_count";

/** The day half a plot's cells show a seedling; later stages (harvest, maturity) cannot come before it. */
export const EMERGENCE_DATE_CODE = "emergence_date";

/**
 * Date traits that mark harvest or maturity: the built-in first harvest date and any trait a coordinator
 * codes with "harvest" or "matur" in it. The date-order checks compare them with emergence, transplanting
 * and the packet's days to maturity.
 */
export const isMaturityDateCode = (code: string): boolean => /harvest|matur/i.test(code);

/** Seedling counts that can never exceed the seeds sown in the same plot. */
export const EMERGED_TRAIT_CODES: readonly string[] = [EMERGENCE_COUNT_CODE, EMERGED_FINAL_CODE];

/** Trait codes whose counts feed the germination and emergence sections whatever trait is chosen. */
export const SEED_COUNT_TRAITS = [SEEDS_SOWN_CODE, EMERGED_FINAL_CODE, EMERGENCE_COUNT_CODE] as const;

/**
 * Traits offered for analysis and publication: every analysable trait except the seeds sown, which only
 * feed the germination sections of another trait's analysis.
 */
export function isPublishableTrait(trait: Parameters<typeof isAnalysable>[0] & { code: string }): boolean {
  return isAnalysable(trait) && trait.code !== SEEDS_SOWN_CODE;
}

/** What the default trait order needs to know about a trait. */
export interface OrderableTrait {
  id: number;
  code: string;
  valueType: string;
  dueDaysAfterSowing: number[] | null;
  dueByDay: number | null;
}

/**
 * The order a new trial records its traits in, as a grower meets them: seeds sown first, then traits due
 * on a day after sowing by that day, then traits an event times (harvest) in the order given, and free-text
 * notes last. The coordinator can change it afterwards.
 */
export function defaultTraitOrder<T extends OrderableTrait>(traits: readonly T[]): T[] {
  const firstDay = (t: T) => (t.code === SEEDS_SOWN_CODE ? -1 : (t.dueDaysAfterSowing?.[0] ?? t.dueByDay ?? null));
  const rank = (t: T) => (t.valueType === "text" ? 2 : firstDay(t) === null ? 1 : 0);
  return traits
    .map((t, i) => ({ t, i }))
    .sort((a, b) => rank(a.t) - rank(b.t) || (firstDay(a.t) ?? 0) - (firstDay(b.t) ?? 0) || a.i - b.i)
    .map(({ t }) => t);
}
