// Who may open what. Every page, route handler method and server action in the app must have an entry here;
// access-matrix.test.ts finds them on disk and fails on any that is missing.

/**
 * coopA and coopB grow for sites A and B of the first program, whose coordinator is "coordinator";
 * otherCoordinator runs the second program, where otherCoop grows. Programs must not reach each other.
 */
export const ROLES = ["public", "coopA", "coopB", "coordinator", "otherCoordinator", "otherCoop", "admin"] as const;
export type RoleKey = (typeof ROLES)[number];

/**
 * ok: 2xx. signin: redirect to /sign-in. deny: refused without showing anything (redirect to
 * /portal/forbidden, 403 or 404). missing: 404 only. unauth: 401. refused: passed the access check and
 * then refused for its content (400/409), so nothing was written. redirect: a redirect whose target starts so.
 */
export type Outcome = "ok" | "signin" | "deny" | "missing" | "unauth" | "refused" | { redirect: string };

/** Demo rows the samples point at, read from the e2e database at test time. */
export interface SampleIds {
  /** Collecting, never published during the run. */
  kal: number;
  /** TV27-KAL's crop, which only the first program grows. */
  kalCrop: number;
  /** Published when the demo is loaded (its analysis stays staff-only: no site shares it). */
  spn: number;
  /** Willow Bend Farm (cooperator A) and Cedar Hollow Market Garden (cooperator B), both in TV27-KAL. */
  siteA: number;
  siteB: number;
  /** A site whose only trial is TV27-KAL, so it has no public page. */
  unpublishedSite: number;
  plotA: number;
  plotB: number;
  /** A variety entered only in unpublished trials. */
  unpublishedVariety: number;
  /** A variety id for the staff history page. */
  variety: number;
  /** The second program's draft trial and one of its varieties. */
  otherTrial: number;
  otherVariety: number;
}

export interface Sample {
  note: string;
  path: (ids: SampleIds) => string;
  /** For POST: the body, built fresh per request. Always unacceptable in content, so an allowed role gets "refused" and nothing is written. */
  body?: (ids: SampleIds) => BodyInit;
  expect: Record<RoleKey, Outcome>;
}

const everyone = (o: Outcome): Record<RoleKey, Outcome> => ({ public: o, coopA: o, coopB: o, coordinator: o, otherCoordinator: o, otherCoop: o, admin: o });
const signedIn = (o: Outcome, signedOut: Outcome = "signin"): Record<RoleKey, Outcome> => ({ public: signedOut, coopA: o, coopB: o, coordinator: o, otherCoordinator: o, otherCoop: o, admin: o });
/** Pages every staff member has, each showing only their own programs' rows. */
const staffOnly = (signedOut: Outcome = "signin"): Record<RoleKey, Outcome> => ({ public: signedOut, coopA: "deny", coopB: "deny", coordinator: "ok", otherCoordinator: "ok", otherCoop: "deny", admin: "ok" });
/** An object of the first program: its coordinator and admins only. */
const firstProgramStaff = (signedOut: Outcome = "signin"): Record<RoleKey, Outcome> => ({ ...staffOnly(signedOut), otherCoordinator: "deny" });
/** An object of the second program: its coordinator and admins only. */
const secondProgramStaff = (signedOut: Outcome = "signin"): Record<RoleKey, Outcome> => ({ ...staffOnly(signedOut), coordinator: "deny" });
/** Site B's object: cooperator A and the other program must not see it, cooperator B and the first program's staff may. */
const siteBObject = (allowed: Outcome = "ok", signedOut: Outcome = "signin"): Record<RoleKey, Outcome> => ({
  public: signedOut,
  coopA: "deny",
  coopB: allowed,
  coordinator: allowed,
  otherCoordinator: "deny",
  otherCoop: "deny",
  admin: allowed,
});

const form = (fields: Record<string, string>, file?: { name: string; type: string; text: string }) => {
  const f = new FormData();
  for (const [k, v] of Object.entries(fields)) f.set(k, v);
  if (file) f.set("file", new Blob([file.text], { type: file.type }), file.name);
  return f;
};

/** Keyed by "PAGE /pattern" for pages and "METHOD /pattern" for route handlers; route groups are left out of the pattern. */
export const HTTP_MATRIX: Record<string, Sample[]> = {
  // Public pages.
  "PAGE /": [{ note: "home", path: () => "/", expect: everyone("ok") }],
  "PAGE /results": [{ note: "index", path: () => "/results", expect: everyone("ok") }],
  "PAGE /results/[code]": [
    { note: "unpublished kale", path: () => "/results/TV27-KAL", expect: everyone("missing") },
    { note: "published spinach (the demo publishes it)", path: () => "/results/TV26-SPN", expect: everyone("ok") },
  ],
  "GET /results/[code]/data": [
    { note: "unpublished kale csv", path: () => "/results/TV27-KAL/data?format=csv", expect: everyone("missing") },
    { note: "published spinach means csv", path: () => "/results/TV26-SPN/data?format=csv&table=means", expect: everyone("ok") },
  ],
  "GET /results/[code]/report": [{ note: "unpublished kale pdf", path: () => "/results/TV27-KAL/report", expect: everyone("missing") }],
  "PAGE /sites/[siteId]": [{ note: "site only in an unpublished trial", path: (i) => `/sites/${i.unpublishedSite}`, expect: everyone("missing") }],
  "PAGE /varieties/[varietyId]": [{ note: "variety only in unpublished trials", path: (i) => `/varieties/${i.unpublishedVariety}`, expect: everyone("missing") }],
  // The first public JSON addresses redirect to the open data API, which answers anonymously with published versions only.
  "GET /api/public/trials": [{ note: "first list address", path: () => "/api/public/trials", expect: everyone({ redirect: "/api/public/v1/trials" }) }],
  "GET /api/public/trials/[code]": [{ note: "first trial address", path: () => "/api/public/trials/TV27-KAL", expect: everyone({ redirect: "/api/public/v1/trials/TV27-KAL" }) }],
  "GET /api/public/v1/trials": [{ note: "published list", path: () => "/api/public/v1/trials", expect: everyone("ok") }],
  "GET /api/public/v1/trials/[code]": [
    { note: "unpublished kale", path: () => "/api/public/v1/trials/TV27-KAL", expect: everyone("missing") },
    { note: "published spinach", path: () => "/api/public/v1/trials/TV26-SPN", expect: everyone("ok") },
  ],
  "GET /api/public/v1/trials/[code]/results": [{ note: "unpublished kale", path: () => "/api/public/v1/trials/TV27-KAL/results", expect: everyone("missing") }],
  "GET /api/public/v1/trials/[code]/plots": [{ note: "unpublished kale", path: () => "/api/public/v1/trials/TV27-KAL/plots", expect: everyone("missing") }],
  "GET /api/public/v1/openapi.json": [{ note: "the API description", path: () => "/api/public/v1/openapi.json", expect: everyone("ok") }],
  "GET /api/health": [{ note: "the load balancer's check", path: () => "/api/health", expect: everyone("ok") }],
  "GET /sw.js": [{ note: "the service worker (the same script for everyone)", path: () => "/sw.js", expect: everyone("ok") }],

  // Sign-in and account pages.
  "PAGE /sign-in": [{ note: "signed-in people go home", path: () => "/sign-in", expect: signedIn({ redirect: "/portal" }, "ok") }],
  "PAGE /forgot-password": [{ note: "form", path: () => "/forgot-password", expect: everyone("ok") }],
  "PAGE /invite/[token]": [{ note: "unknown token shows the expiry notice", path: () => "/invite/not-a-real-token-0000000000000000", expect: everyone("ok") }],
  "PAGE /reset-password/[token]": [{ note: "unknown token shows the expiry notice", path: () => "/reset-password/not-a-real-token-0000000000000000", expect: everyone("ok") }],
  "GET /api/auth/[...nextauth]": [{ note: "csrf token", path: () => "/api/auth/csrf", expect: everyone("ok") }],
  "POST /api/auth/[...nextauth]": [
    {
      note: "credentials without a csrf token are sent back untried",
      path: () => "/api/auth/callback/credentials",
      body: () => new URLSearchParams({ email: "nobody@example.org", password: "x" }),
      expect: everyone({ redirect: "/api/auth/signin" }),
    },
  ],

  // Portal pages for everyone signed in.
  "PAGE /portal": [{ note: "home", path: () => "/portal", expect: signedIn("ok") }],
  "PAGE /portal/forbidden": [{ note: "refusal page", path: () => "/portal/forbidden", expect: signedIn("ok") }],
  "PAGE /portal/account": [{ note: "own account and language", path: () => "/portal/account", expect: signedIn("ok") }],
  "PAGE /portal/record": [{ note: "own sites", path: () => "/portal/record", expect: signedIn("ok") }],
  "PAGE /portal/record/[trialId]/[siteId]": [
    { note: "site B's entry page", path: (i) => `/portal/record/${i.kal}/${i.siteB}`, expect: siteBObject() },
    { note: "site A's entry page is not cooperator B's", path: (i) => `/portal/record/${i.kal}/${i.siteA}`, expect: { public: "signin", coopA: "ok", coopB: "deny", coordinator: "ok", otherCoordinator: "deny", otherCoop: "deny", admin: "ok" } },
  ],
  "PAGE /portal/record/[trialId]/[siteId]/upload": [{ note: "site B's upload page", path: (i) => `/portal/record/${i.kal}/${i.siteB}/upload`, expect: siteBObject() }],
  "PAGE /portal/plots/[plotId]": [
    { note: "site B's plot", path: (i) => `/portal/plots/${i.plotB}`, expect: siteBObject({ redirect: "/portal/record/" }) },
    {
      note: "site A's plot",
      path: (i) => `/portal/plots/${i.plotA}`,
      expect: { public: "signin", coopA: { redirect: "/portal/record/" }, coopB: "deny", coordinator: { redirect: "/portal/record/" }, otherCoordinator: "deny", otherCoop: "deny", admin: { redirect: "/portal/record/" } },
    },
  ],
  "PAGE /portal/trials/[trialId]/sites/[siteId]": [{ note: "site B's layout", path: (i) => `/portal/trials/${i.kal}/sites/${i.siteB}`, expect: siteBObject() }],
  "GET /portal/trials/[trialId]/sites/[siteId]/sheets": [{ note: "site B's tray map", path: (i) => `/portal/trials/${i.kal}/sites/${i.siteB}/sheets?kind=map`, expect: siteBObject() }],
  "PAGE /portal/trials/[trialId]/analysis": [{ note: "kale analysis, not shared with growers", path: (i) => `/portal/trials/${i.kal}/analysis`, expect: firstProgramStaff() }],

  // Staff pages.
  "PAGE /portal/trials": [{ note: "list", path: () => "/portal/trials", expect: staffOnly() }],
  "PAGE /portal/trials/new": [{ note: "form", path: () => "/portal/trials/new", expect: staffOnly() }],
  "PAGE /portal/trials/across-seasons": [{ note: "every season of a crop, own programs' trials only", path: () => "/portal/trials/across-seasons", expect: staffOnly() }],
  "PAGE /portal/trials/[trialId]": [
    { note: "kale detail with the code key", path: (i) => `/portal/trials/${i.kal}`, expect: firstProgramStaff() },
    { note: "the second program's draft trial", path: (i) => `/portal/trials/${i.otherTrial}`, expect: secondProgramStaff() },
  ],
  "PAGE /portal/trials/[trialId]/edit": [
    { note: "kale edit", path: (i) => `/portal/trials/${i.kal}/edit`, expect: firstProgramStaff() },
    { note: "the second program's trial edit", path: (i) => `/portal/trials/${i.otherTrial}/edit`, expect: secondProgramStaff() },
  ],
  "PAGE /portal/trials/[trialId]/publish": [{ note: "spinach publish", path: (i) => `/portal/trials/${i.spn}/publish`, expect: firstProgramStaff() }],
  "PAGE /portal/review": [{ note: "queue", path: () => "/portal/review", expect: staffOnly() }],
  "PAGE /portal/review/[trialId]/[siteId]": [{ note: "site B's review", path: (i) => `/portal/review/${i.kal}/${i.siteB}`, expect: firstProgramStaff() }],
  "PAGE /portal/sites": [{ note: "own programs' sites with contacts", path: () => "/portal/sites", expect: staffOnly() }],
  "PAGE /portal/seasons": [{ note: "own programs' seasons", path: () => "/portal/seasons", expect: staffOnly() }],
  "PAGE /portal/catalogue": [{ note: "catalogue", path: () => "/portal/catalogue", expect: staffOnly() }],
  "PAGE /portal/catalogue/traits": [{ note: "trait library", path: () => "/portal/catalogue/traits", expect: staffOnly() }],
  "PAGE /portal/cooperators": [{ note: "growers", path: () => "/portal/cooperators", expect: staffOnly() }],
  "PAGE /portal/mailbox": [{ note: "captured mail, each person's own only", path: () => "/portal/mailbox", expect: signedIn("ok") }],
  "PAGE /portal/varieties/[varietyId]": [
    { note: "variety history", path: (i) => `/portal/varieties/${i.variety}`, expect: firstProgramStaff() },
    { note: "the second program's variety", path: (i) => `/portal/varieties/${i.otherVariety}`, expect: secondProgramStaff() },
  ],
  "PAGE /portal/admin/users": [{ note: "users and roles", path: () => "/portal/admin/users", expect: { public: "signin", coopA: "deny", coopB: "deny", coordinator: "deny", otherCoordinator: "deny", otherCoop: "deny", admin: "ok" } }],

  // JSON and file APIs.
  "GET /api/trials": [{ note: "own trials", path: () => "/api/trials", expect: signedIn("ok", "unauth") }],
  "GET /api/trials/[trialId]": [
    { note: "kale with the code key", path: (i) => `/api/trials/${i.kal}`, expect: firstProgramStaff("unauth") },
    { note: "the second program's trial", path: (i) => `/api/trials/${i.otherTrial}`, expect: secondProgramStaff("unauth") },
  ],
  "GET /api/trials/[trialId]/sites/[siteId]/layout": [{ note: "site B's layout", path: (i) => `/api/trials/${i.kal}/sites/${i.siteB}/layout`, expect: siteBObject("ok", "unauth") }],
  "GET /api/trials/[trialId]/analysis": [{ note: "spinach analysis, not shared", path: (i) => `/api/trials/${i.spn}/analysis`, expect: firstProgramStaff("unauth") }],
  "GET /api/trials/across-seasons/export": [{ note: "kale (first program only) across seasons, trials csv", path: (i) => `/api/trials/across-seasons/export?crop=${i.kalCrop}&trait=marketable_yield&format=csv&table=trials`, expect: firstProgramStaff("unauth") }],
  "GET /api/trials/[trialId]/analysis/sites/[siteId]": [{ note: "site A's section of the spinach analysis, not shared", path: (i) => `/api/trials/${i.spn}/analysis/sites/${i.siteA}`, expect: firstProgramStaff("unauth") }],
  "GET /api/trials/[trialId]/analysis/export": [{ note: "spinach means csv", path: (i) => `/api/trials/${i.spn}/analysis/export?format=csv&table=means`, expect: firstProgramStaff("unauth") }],
  // The demo has no second kale trial, so staff of the program get "not one of your trials of this crop" (spinach is
  // another crop); the answer with a CV is checked in tests/integration/stability-planning.test.ts.
  "GET /api/trials/[trialId]/planning": [{ note: "kale planned from spinach (another crop)", path: (i) => `/api/trials/${i.kal}/planning?from=${i.spn}&trait=1`, expect: { ...firstProgramStaff("unauth"), coordinator: "missing", admin: "missing" } }],
  "GET /api/sites": [{ note: "own sites", path: () => "/api/sites", expect: signedIn("ok", "unauth") }],
  "GET /api/submissions": [{ note: "site B's review state", path: (i) => `/api/submissions?trialId=${i.kal}&siteId=${i.siteB}`, expect: siteBObject("ok", "unauth") }],
  "GET /api/observations": [{ note: "site B's sheet", path: (i) => `/api/observations?trialId=${i.kal}&siteId=${i.siteB}`, expect: siteBObject("ok", "unauth") }],
  "POST /api/observations": [
    {
      note: "an unreadable value for site B's plot",
      path: () => "/api/observations",
      // A Blob carries its type, so fetch sends it as JSON (a plain string would go as text/plain and get a 415).
      body: (i) => new Blob([JSON.stringify({ trialId: i.kal, siteId: i.siteB, values: [{ plotId: i.plotB, key: "seeds_sown", value: "not a count" }] })], { type: "application/json" }),
      expect: siteBObject("refused", "unauth"),
    },
  ],
  "GET /api/record/[trialId]/[siteId]/export": [{ note: "site B's csv", path: (i) => `/api/record/${i.kal}/${i.siteB}/export`, expect: siteBObject("ok", "unauth") }],
  "GET /api/record/[trialId]/[siteId]/template": [{ note: "site B's workbook", path: (i) => `/api/record/${i.kal}/${i.siteB}/template`, expect: siteBObject("ok", "unauth") }],
  "POST /api/record/[trialId]/[siteId]/upload": [
    {
      note: "a file that is not a sheet, saved to site B",
      path: (i) => `/api/record/${i.kal}/${i.siteB}/upload`,
      body: () => form({ mode: "commit" }, { name: "notes.csv", type: "text/csv", text: "this is not the template\n" }),
      expect: siteBObject("refused", "unauth"),
    },
  ],
  "POST /api/photos": [
    {
      note: "a text file as a photo of site B",
      path: () => "/api/photos",
      body: (i) => form({ trialId: String(i.kal), siteId: String(i.siteB) }, { name: "x.jpg", type: "image/jpeg", text: "not an image" }),
      expect: siteBObject("refused", "unauth"),
    },
  ],
  "GET /api/photos/[photoId]": [{ note: "no such photo", path: () => "/api/photos/99999999", expect: signedIn("missing", "unauth") }],
};

/** Server actions by "file#export": the roles defineAction must be given ("public" = anyone, even signed out). */
export const ACTION_MATRIX: Record<string, readonly string[] | "public"> = {
  "auth.ts#acceptInvite": "public",
  "auth.ts#requestPasswordReset": "public",
  "auth.ts#resetPassword": "public",
  "catalogue.ts#createCrop": ["coordinator", "admin"],
  "catalogue.ts#createVariety": ["coordinator", "admin"],
  "catalogue.ts#createSeedLot": ["coordinator", "admin"],
  "catalogue.ts#createTrait": ["coordinator", "admin"],
  "catalogue.ts#editCrop": ["coordinator", "admin"],
  "catalogue.ts#editVariety": ["coordinator", "admin"],
  "catalogue.ts#editSeedLot": ["coordinator", "admin"],
  "catalogue.ts#editTrait": ["coordinator", "admin"],
  "catalogue.ts#removeCrop": ["coordinator", "admin"],
  "catalogue.ts#removeVariety": ["coordinator", "admin"],
  "catalogue.ts#removeSeedLot": ["coordinator", "admin"],
  "catalogue.ts#removeTrait": ["coordinator", "admin"],
  "exclusions.ts#excludeFromAnalysis": ["coordinator", "admin"],
  "exclusions.ts#includeInAnalysis": ["coordinator", "admin"],
  "exclusions.ts#shareSiteResults": ["coordinator", "admin"],
  "photos.ts#removePhoto": ["cooperator", "coordinator", "admin"],
  "publish.ts#publishTrial": ["coordinator", "admin"],
  "publish.ts#unpublishTrial": ["coordinator", "admin"],
  "review.ts#submitForReview": ["cooperator", "coordinator", "admin"],
  "review.ts#acceptSubmission": ["coordinator", "admin"],
  "review.ts#returnSubmission": ["coordinator", "admin"],
  "review.ts#addReviewComment": ["coordinator", "admin"],
  "sites.ts#createSite": ["coordinator", "admin"],
  "sites.ts#setSitePrintLanguage": ["coordinator", "admin"],
  "account.ts#setMyLanguage": ["admin", "coordinator", "cooperator"],
  "trials.ts#createTrial": ["coordinator", "admin"],
  "trials.ts#editTrial": ["coordinator", "admin"],
  "trials.ts#addEntry": ["coordinator", "admin"],
  "trials.ts#removeEntry": ["coordinator", "admin"],
  "trials.ts#enrolSite": ["coordinator", "admin"],
  "trials.ts#randomiseSite": ["coordinator", "admin"],
  "trials.ts#changeSowingDate": ["coordinator", "admin"],
  "trials.ts#changeTrialStatus": ["coordinator", "admin"],
  "trials.ts#setDirection": ["coordinator", "admin"],
  "trials.ts#planNextSeason": ["coordinator", "admin"],
  "trials.ts#changeSiteNaming": ["coordinator", "admin"],
  "trials.ts#moveTrait": ["coordinator", "admin"],
  "trials.ts#chooseEntryLot": ["coordinator", "admin"],
  "users.ts#inviteCooperator": ["coordinator", "admin"],
  "users.ts#changeUserRole": ["admin"],
  "users.ts#setUserActive": ["admin"],
  "users.ts#inviteStaffMember": ["admin"],
  "users.ts#resendUserInvitation": ["admin"],
  "users.ts#cancelUserInvitation": ["admin"],
  "users.ts#setCoordinatorPrograms": ["admin"],
  "seasons.ts#addSeason": ["coordinator", "admin"],
  "seasons.ts#changeSeason": ["coordinator", "admin"],
  "seasons.ts#closeOrReopenSeason": ["coordinator", "admin"],
};
