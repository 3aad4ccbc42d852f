import { isAnalysable } from "@/lib/domain/analysis/values";

// Trait codes the code itself relies on (traits are data, but these feed fixed rules: seedling counts,
// germination). One place, so no rule spells a code as a literal.

export const SEEDS_SOWN_CODE = "seeds_sown";

/** Seedling counts that can never exceed the seeds sown in the same plot. */
export const EMERGED_TRAIT_CODES = ["emergence_count", "emerged_final"];

/** Trait codes whose counts feed the germination and emergence sections whatever trait is chosen. */
export const SEED_COUNT_TRAITS = ["seeds_sown", "emerged_final", "emergence_count"] as const;

/**
 * Traits offered for analysis and publication: every analysable trait except the seeds sown, which only
 * feed the germination sections of another trait's analysis.
 */
export function isPublishableTrait(trait: Parameters<typeof isAnalysable>[0] & { code: string }): boolean {
  return isAnalysable(trait) && trait.code !== SEEDS_SOWN_CODE;
}
