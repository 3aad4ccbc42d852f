import type { PublicExclusion, PublicSnapshot } from "@/lib/domain/publish/public-shape";
import { plural } from "@/lib/domain/vocabulary/words";

/** "Results from N of M sites", naming the sites this version does not include and why. */
export function SiteCoverage({ coverage }: { coverage: PublicSnapshot["coverage"] }) {
  return (
    <div>
      <p className="font-semibold">
        Results from {coverage.inResults} of {plural(coverage.enrolled, "site")}.
      </p>
      {coverage.notIncluded.length > 0 && (
        <ul className="mt-1 list-disc pl-5 text-sm text-loam-700" aria-label="Sites not included">
          {coverage.notIncluded.map((s) => (
            <li key={s.name}>
              {s.name} is not included: {s.reason}.
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}

/** The sites and plots left out of one trait's analysis, with the public reason. */
export function LeftOutOfTrait({ exclusions }: { exclusions: PublicExclusion[] }) {
  if (exclusions.length === 0) return null;
  return (
    <div className="mt-4 text-sm">
      <h3 className="font-bold">Left out of this analysis</h3>
      <ul className="mt-1 list-disc pl-5">
        {exclusions.map((x, i) => (
          <li key={i}>
            {x.plotCode ? `Plot ${x.plotCode} at ${x.siteName}` : `All plots at ${x.siteName}`}: {x.reason}
          </li>
        ))}
      </ul>
    </div>
  );
}
