/**
 * How each site is named in public results. A site whose grower did not agree to be named is published
 * as "Site N, region" (N in the order the sites joined the trial) in every page, download, PDF and API
 * answer, and without its public address, so nothing ties the anonymous results to the named site.
 */
export interface SiteForNaming {
  siteId: number;
  name: string;
  region: string;
  /** the grower agreed to be named in public results */
  named: boolean;
  /** the order the site joined the trial (its enrolment id) */
  joined: number;
}

/** The public name of each site that is not named: site id -> "Site N, region". Named sites are absent. */
export function anonymousSiteNames(sites: readonly SiteForNaming[]): Map<number, string> {
  const inOrder = [...sites].sort((a, b) => a.joined - b.joined);
  const out = new Map<number, string>();
  inOrder.forEach((s, i) => {
    if (!s.named) out.set(s.siteId, `Site ${i + 1}, ${s.region}`);
  });
  return out;
}
