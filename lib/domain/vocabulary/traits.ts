// Trait codes the code itself relies on (traits are data, but these feed fixed rules: seedling counts,
// germination). One place, so no rule spells a code as a literal.

export const SEEDS_SOWN_CODE = "seeds_sown";

/** Seedling counts that can never exceed the seeds sown in the same plot. */
export const EMERGED_TRAIT_CODES = ["emergence_count", "emerged_final"];

/** Trait codes whose counts feed the germination and emergence sections whatever trait is chosen. */
export const SEED_COUNT_TRAITS = ["seeds_sown", "emerged_final", "emergence_count"] as const;
