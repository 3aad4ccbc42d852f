import { isAnalysable } from "@/lib/domain/analysis/values";

// Trait codes the code itself relies on (traits are data, but these feed fixed rules: seedling counts,
// germination). One place, so no rule spells a code as a literal.

export const SEEDS_SOWN_CODE = "seeds_sown";
/** Seedlings up at the end of emergence, one count per plot. */
export const EMERGED_FINAL_CODE = "emerged_final";
/** Cumulative seedling counts on fixed days after sowing (the occasion is the day). */
export const EMERGENCE_COUNT_CODE = "emergence_count";

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
