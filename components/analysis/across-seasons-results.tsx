"use client";
import type { MixedAnalysis } from "@/lib/domain/analysis/mixed";
import type { UnitShape } from "@/lib/domain/analysis/format";
import { MixedModelSection } from "./mixed-model-card";

/** The across-seasons mixed model with variety names (staff only), and where each variety was grown. */
export function AcrossSeasonsResults({ mixed, trait, unit, order }: { mixed: MixedAnalysis; trait: UnitShape; unit: string; order: string }) {
  const grown = [...mixed.means].sort((a, b) => a.label.localeCompare(b.label));
  return (
    <div className="space-y-3">
      <MixedModelSection mixed={mixed} trait={trait} label={(e) => e.varietyName ?? e.blindCode} unit={unit} order={order} testId="across-seasons-model" />
      <p className="text-sm text-loam-700">
        Site-years each variety was grown in: {grown.map((m) => `${m.label} ${m.environments}`).join(", ")} (of {mixed.environments.length}).
      </p>
    </div>
  );
}
