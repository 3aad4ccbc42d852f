// Programs are tenants: a coordinator of one program must not reach another program's sites, growers,
// catalogue or trial data, and no refusal may name what belongs to another program. The demo data has two
// programs: Tamarack Valley (coordinator Rosa, trials TV26-LET, TV26-SPN, TV27-KAL) and Juniper Flats
// (coordinator Owen, draft trial JF27-LET at Juniper Flats Farm).
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { and, desc, eq, inArray, like } from "drizzle-orm";
import * as s from "@/db/schema";
import type { Viewer } from "@/lib/domain/viewer";
import { DEMO_SECOND_PROGRAM, DEMO_SITES, DEMO_STAFF, DEMO_TRIALS } from "@/db/demo-data";
import { testDatabase, unique } from "../helpers/db";
import { demoSite, demoViewer, writeCounts } from "../helpers/demo";
import { refusal } from "../helpers/refusal";
import { traitSchema } from "@/lib/validation/catalogue";

// Actions and route handlers read the session through the guards; tests set the viewer instead.
vi.mock("@/server/auth/guards", () => import("../helpers/signed-in-as"));
vi.mock("next/cache", () => ({ revalidatePath: () => undefined }));
const { testAuth: auth } = await import("../helpers/signed-in-as");
const { inviteCooperator } = await import("@/server/actions/users");
const { GET: exportCsv } = await import("@/app/api/record/[trialId]/[siteId]/export/route");
const { saveObservationsForViewer } = await import("@/server/observations/recording");
const { updatePasswordWithToken } = await import("@/db/mutations/users");
const { hashToken } = await import("@/server/auth/tokens");
const catalogue = await import("@/db/mutations/catalogue");
const { createTrial, addTrialEntry, editTrialDesign } = await import("@/server/trials/design");
const { enrolTrialSite } = await import("@/server/trials/enrolment");
const { listCrops, listSeedLots, listTraits, listVarieties } = await import("@/db/queries/catalogue");
const { listSitesForStaff } = await import("@/db/queries/sites");
const { listCooperators } = await import("@/db/queries/users");
const { listSiteOptions } = await import("@/db/queries/overview");
const { getTrialFormOptions, listEnrolableSites, listEntryOptions } = await import("@/db/queries/trials");
const { getRecordableEnrolment } = await import("@/db/queries/observations");
const { listRecordableSites } = await import("@/server/observations/sheet");
const { getVarietyHistory } = await import("@/db/queries/analysis");
const { pool: appPool } = await import("@/db/index");

const { db, pool } = testDatabase();
let rosa: Viewer;
let owen: Viewer;
let admin: Viewer;
let kale: Awaited<ReturnType<typeof demoSite>>;
let juniperSiteId: number;
let juniperTrialId: number;
// What this file adds to the shared demo data, removed at the end so other files see the demo as it is.
const created = { trials: [] as number[], traits: [] as number[], crops: [] as number[], emails: [] as string[] };
const newEmail = (prefix: string) => {
  const email = `${unique(prefix)}@example.test`;
  created.emails.push(email);
  return email;
};

/** Everything of the first program that the second program's coordinator must never read in a message. */
const FIRST_PROGRAM_NAMES = [...DEMO_TRIALS.map((t) => t.code), ...DEMO_TRIALS.flatMap((t) => t.entries.map((e) => e.variety)), ...DEMO_SITES.map((x) => x.name)];

async function idOf<T extends { id: number }>(rows: Promise<T[]>, what: string) {
  const [row] = await rows;
  if (!row) throw new Error(`${what} missing; reseed the test database`);
  return row.id;
}
const varietyId = (name: string) => idOf(db.select({ id: s.varieties.id }).from(s.varieties).where(eq(s.varieties.name, name)), name);
const siteId = (name: string) => idOf(db.select({ id: s.sites.id }).from(s.sites).where(eq(s.sites.name, name)), name);

/** Runs the invite form as `viewer`, the way the portal does. */
async function invite(viewer: Viewer, fields: { name: string; email: string; siteId: number }) {
  auth.viewer = viewer;
  const form = new FormData();
  form.set("name", fields.name);
  form.set("email", fields.email);
  form.set("siteId", String(fields.siteId));
  return inviteCooperator(null, form);
}

/** The newest queued mail to an address. */
async function lastMailTo(email: string) {
  const [mail] = await db.select().from(s.mailOutbox).where(eq(s.mailOutbox.toAddress, email)).orderBy(desc(s.mailOutbox.id)).limit(1);
  return mail ?? null;
}

/** Accepts the newest invitation mailed to `email` and returns the grower as a signed-in viewer. */
async function acceptLatestInvite(email: string): Promise<Viewer> {
  const mail = await lastMailTo(email);
  const token = mail!.textBody.match(/\/invite\/([A-Za-z0-9_-]+)/)![1]!;
  await updatePasswordWithToken({ tokenHash: hashToken(token), kind: "invite", passwordHash: "not-a-real-hash" });
  return demoViewer(db, email);
}

const expectNoFirstProgramNames = (text: string) => {
  for (const name of FIRST_PROGRAM_NAMES) expect(text, `"${text}" names ${name}`).not.toContain(name);
};

beforeAll(async () => {
  [rosa, owen, admin] = await Promise.all([demoViewer(db, DEMO_STAFF[1].email), demoViewer(db, DEMO_SECOND_PROGRAM.coordinator.email), demoViewer(db, DEMO_STAFF[0].email)]);
  kale = await demoSite(db, "TV27-KAL", DEMO_SITES[0].name);
  juniperSiteId = await siteId(DEMO_SECOND_PROGRAM.site.name);
  juniperTrialId = await idOf(db.select({ id: s.trials.id }).from(s.trials).where(eq(s.trials.code, DEMO_SECOND_PROGRAM.trial.code)), DEMO_SECOND_PROGRAM.trial.code);
});

afterAll(async () => {
  auth.viewer = null;
  if (created.trials.length) await db.delete(s.trials).where(inArray(s.trials.id, created.trials));
  if (created.traits.length) await db.delete(s.traits).where(inArray(s.traits.id, created.traits));
  if (created.crops.length) await db.delete(s.crops).where(inArray(s.crops.id, created.crops));
  if (created.emails.length) await db.delete(s.users).where(inArray(s.users.email, created.emails));
  await pool.end();
  await appPool.end();
});

describe("sites and growers belong to one program", () => {
  it("refuses a coordinator's invitation to another program's site, answering as for a site that does not exist", async () => {
    const email = newEmail("probe");
    const growersOf = () => db.select({ userId: s.siteCooperators.userId }).from(s.siteCooperators).where(eq(s.siteCooperators.siteId, kale.siteId));
    const before = await growersOf();
    const foreign = await invite(owen, { name: "Probe Grower", email, siteId: kale.siteId });
    const missing = await invite(owen, { name: "Probe Grower", email: newEmail("probe"), siteId: 987654321 });
    expect(foreign.ok).toBe(false);
    expect(missing.ok).toBe(false);
    const [a, b] = [foreign, missing].map((r) => (r.ok ? null : { formError: r.formError, fieldErrors: r.fieldErrors }));
    expect(a).toEqual(b);
    expectNoFirstProgramNames(JSON.stringify(foreign));
    expect(await db.select().from(s.users).where(eq(s.users.email, email))).toEqual([]);
    expect(await lastMailTo(email)).toBeNull();
    expect(await growersOf()).toEqual(before);
  });

  it("a grower invited by another program's coordinator cannot export or write the first program's trial data", async () => {
    const email = newEmail("foreign-grower");
    // The attack: invite to the first program's site, then to the coordinator's own site, and accept.
    await invite(owen, { name: "Foreign Grower", email, siteId: kale.siteId });
    expect((await invite(owen, { name: "Foreign Grower", email, siteId: juniperSiteId })).ok).toBe(true);
    const grower = await acceptLatestInvite(email);
    auth.viewer = grower;

    const response = await exportCsv(new Request(`http://test.local/api/record/${kale.trialId}/${kale.siteId}/export`), {
      params: Promise.resolve({ trialId: String(kale.trialId), siteId: String(kale.siteId) }),
    });
    expect(response.status).toBe(404);
    expectNoFirstProgramNames(await response.text());

    const before = await writeCounts(db, kale.enrolmentId);
    const refused = await refusal(saveObservationsForViewer(grower, { trialId: kale.trialId, siteId: kale.siteId, values: [{ plotId: kale.plots[0]!.id, key: "seeds_sown", value: "6" }] }));
    expect(refused.code).toBe("not_found");
    expect(await writeCounts(db, kale.enrolmentId)).toEqual(before);
    expect(await getRecordableEnrolment(db, grower, { trialId: kale.trialId, siteId: kale.siteId })).toBeNull();
    expect((await listRecordableSites(grower)).map((r) => r.trialId)).not.toContain(kale.trialId);
  });

  it("links another program's grower to your site without changing or revealing anything of the other program", async () => {
    // A grower of the first program with an account, and one whose invitation is still pending.
    const active = newEmail("shared-grower");
    expect((await invite(rosa, { name: "Shared Grower", email: active, siteId: kale.siteId })).ok).toBe(true);
    await acceptLatestInvite(active);
    const pending = newEmail("pending-grower");
    expect((await invite(rosa, { name: "Pending Grower", email: pending, siteId: kale.siteId })).ok).toBe(true);

    const linked = await invite(owen, { name: "Someone Else", email: active, siteId: juniperSiteId });
    expect(linked.ok).toBe(true);
    expectNoFirstProgramNames(JSON.stringify(linked));
    const notice = await lastMailTo(active);
    expect(notice!.textBody).toContain(DEMO_SECOND_PROGRAM.site.name);
    expectNoFirstProgramNames(`${notice!.subject} ${notice!.textBody}`);
    expect((await invite(owen, { name: "Renamed By Owen", email: pending, siteId: juniperSiteId })).ok).toBe(true);
    expectNoFirstProgramNames((await lastMailTo(pending))!.textBody);

    const names = await db.select({ email: s.users.email, name: s.users.name }).from(s.users).where(like(s.users.email, "%grower-%@example.test"));
    expect(names.find((u) => u.email === active)!.name).toBe("Shared Grower");
    expect(names.find((u) => u.email === pending)!.name).toBe("Pending Grower");
    const seenByOwen = (await listCooperators(owen)).filter((c) => c.email === active || c.email === pending);
    expect(seenByOwen.map((c) => c.sites)).toEqual([[DEMO_SECOND_PROGRAM.site.name], [DEMO_SECOND_PROGRAM.site.name]]);
    // The first program still has both, with its own site.
    const seenByRosa = (await listCooperators(rosa)).filter((c) => c.email === active || c.email === pending);
    expect(seenByRosa.map((c) => c.sites)).toEqual([[DEMO_SITES[0].name], [DEMO_SITES[0].name]]);
  });

  it("lists only the coordinator's own program's sites, growers, e-mails and coordinates", async () => {
    const sites = await listSitesForStaff(owen);
    expect(sites.map((x) => x.name)).toEqual([DEMO_SECOND_PROGRAM.site.name]);
    expect(sites[0]).toMatchObject({ latitude: DEMO_SECOND_PROGRAM.site.lat, contactEmail: DEMO_SECOND_PROGRAM.site.grower.email });
    expect((await listSiteOptions(owen)).map((x) => x.name)).toEqual([DEMO_SECOND_PROGRAM.site.name]);
    const growers = await listCooperators(owen);
    expect(growers.map((g) => g.email)).toContain(DEMO_SECOND_PROGRAM.site.grower.email);
    const everything = JSON.stringify([sites, growers]);
    for (const site of DEMO_SITES) {
      expect(everything).not.toContain(site.grower.email);
      expect(everything).not.toContain(site.name);
      expect(everything).not.toContain(String(site.lat));
    }

    const rosaSees = JSON.stringify([await listSitesForStaff(rosa), await listCooperators(rosa), await listSiteOptions(rosa)]);
    expect(rosaSees).toContain(DEMO_SITES[0].grower.email);
    expect(rosaSees).not.toContain(DEMO_SECOND_PROGRAM.site.name);
    expect(rosaSees).not.toContain(DEMO_SECOND_PROGRAM.site.grower.email);

    const adminSites = (await listSitesForStaff(admin)).map((x) => x.name);
    expect(adminSites).toEqual(expect.arrayContaining([DEMO_SITES[0].name, DEMO_SECOND_PROGRAM.site.name]));
  });

  it("enrols only the trial's own program's sites", async () => {
    expect((await listEnrolableSites(owen, juniperTrialId)).map((x) => x.name)).toEqual([]);
    const refused = await refusal(enrolTrialSite(owen, { trialId: juniperTrialId, siteId: kale.siteId }));
    expect(refused.code).toBe("bad_request");
    expectNoFirstProgramNames(JSON.stringify(refused));
    expect(await db.select().from(s.enrolments).where(and(eq(s.enrolments.trialId, juniperTrialId), eq(s.enrolments.siteId, kale.siteId)))).toEqual([]);
  });
});

describe("varieties, seed lots and custom traits belong to one program", () => {
  it("refuses a coordinator's rename, edit or delete of another program's variety or seed lot", async () => {
    const copper = await varietyId("Copper Ruffle");
    const [variety] = await db.select().from(s.varieties).where(eq(s.varieties.id, copper));
    // Copper Ruffle was grown in two seasons, with a seed lot for each.
    const lots = await db.select().from(s.seedLots).where(eq(s.seedLots.varietyId, copper)).orderBy(s.seedLots.id);
    const lot = lots[0];
    const refusals = [
      await refusal(catalogue.updateVariety(owen, { varietyId: copper, cropId: variety!.cropId, name: "Renamed by another program" })),
      await refusal(catalogue.deleteVariety(owen, { varietyId: copper })),
      await refusal(catalogue.updateSeedLot(owen, { seedLotId: lot!.id, varietyId: copper, source: "Elsewhere", lotCode: "X1", treated: false })),
      await refusal(catalogue.deleteSeedLot(owen, { seedLotId: lot!.id })),
      await refusal(catalogue.insertSeedLot(owen, { varietyId: copper, source: "Elsewhere", lotCode: unique("X"), treated: false })),
    ];
    for (const r of refusals) expectNoFirstProgramNames(`${r.message} ${JSON.stringify(r.fieldErrors ?? {})}`);
    expect(await db.select({ name: s.varieties.name }).from(s.varieties).where(eq(s.varieties.id, copper))).toEqual([{ name: "Copper Ruffle" }]);
    expect(await db.select().from(s.seedLots).where(eq(s.seedLots.varietyId, copper)).orderBy(s.seedLots.id)).toEqual(lots);
    expect(await getVarietyHistory(owen, copper)).toBeNull();
  });

  it("lets an entry use only its trial's program's varieties", async () => {
    // Both programs grow lettuce, so the crop alone would not stop it.
    expect((await listEntryOptions(owen, juniperTrialId)).map((v) => v.name).sort()).toEqual(DEMO_SECOND_PROGRAM.trial.entries.map((e) => e.variety).sort());
    const refused = await refusal(addTrialEntry(owen, { trialId: juniperTrialId, varietyId: await varietyId("Copper Ruffle"), isCheck: false }));
    expectNoFirstProgramNames(`${refused.message} ${JSON.stringify(refused.fieldErrors ?? {})}`);
  });

  it("never names another program's trial codes, varieties or sites in a refusal", async () => {
    // A custom trait of the first program, recorded by one of its unpublished trials.
    const traitInput = traitSchema.parse({ name: "Leaf sheen", code: unique("sheen").replace(/-/g, "_").slice(0, 38), valueType: "rating", minValue: "1", maxValue: "9" });
    const sheen = await catalogue.insertTrait(rosa, traitInput);
    created.traits.push(sheen);
    const [season] = await db.select({ id: s.seasons.id }).from(s.seasons).innerJoin(s.trials, eq(s.trials.seasonId, s.seasons.id)).where(eq(s.trials.id, kale.trialId));
    const [kaleCrop] = await db.select({ id: s.crops.id, name: s.crops.name }).from(s.crops).where(eq(s.crops.name, "Kale"));
    const secretCode = `TV28-${unique("S").replace(/[^A-Za-z0-9]/g, "").slice(-6).toUpperCase()}`;
    created.trials.push(await createTrial(rosa, { seasonId: season!.id, cropId: kaleCrop!.id, code: secretCode, title: "Unpublished kale", design: "rcbd", blocks: 3, plotUnit: "insert", plotSize: 6, seedsPerCell: 1, traitIds: [sheen] }));
    const ember = await varietyId("Ember Red");
    const [emberLot] = await db.select({ id: s.seedLots.id }).from(s.seedLots).where(eq(s.seedLots.varietyId, ember));

    const refusals: [string, () => Promise<unknown>][] = [
      ["delete a variety in an unpublished trial", () => catalogue.deleteVariety(owen, { varietyId: ember })],
      ["move that variety to another crop", async () => catalogue.updateVariety(owen, { varietyId: ember, cropId: (await listCrops(owen)).find((c) => c.name === "Lettuce")!.id, name: "Ember Red" })],
      ["delete its seed lot", () => catalogue.deleteSeedLot(owen, { seedLotId: emberLot!.id })],
      ["delete the crop of unpublished trials", () => catalogue.deleteCrop(owen, { cropId: kaleCrop!.id })],
      ["rename that crop", () => catalogue.updateCrop(owen, { cropId: kaleCrop!.id, name: "Kale", cropGroup: "brassicas" })],
      ["edit a custom trait an unpublished trial records", () => catalogue.updateTrait(owen, { ...traitInput, name: "Renamed", traitId: sheen })],
      ["delete that trait", () => catalogue.deleteTrait(owen, { traitId: sheen })],
    ];
    for (const [what, attempt] of refusals) {
      const r = await refusal(attempt());
      const text = `${what}: ${r.message} ${JSON.stringify(r.fieldErrors ?? {})}`;
      expectNoFirstProgramNames(text);
      expect(text).not.toContain(secretCode);
    }
    expect((await refusal(catalogue.deleteCrop(owen, { cropId: kaleCrop!.id }))).message).toMatch(/another program/i);
    // The first program's own coordinator is told which of her trials stand in the way.
    expect((await refusal(catalogue.deleteTrait(rosa, { traitId: sheen }))).message).toContain(secretCode);
  });

  it("keeps custom traits in their program: others neither list, edit nor record them", async () => {
    const traitInput = traitSchema.parse({ name: "Rib crack", code: unique("ribcrack").replace(/-/g, "_").slice(0, 38), valueType: "yes_no" });
    const ribs = await catalogue.insertTrait(rosa, traitInput);
    created.traits.push(ribs);
    expect((await listTraits(owen)).map((t) => t.id)).not.toContain(ribs);
    expect((await getTrialFormOptions(owen))!.traits.map((t) => t.id)).not.toContain(ribs);
    expect((await listTraits(rosa)).map((t) => t.id)).toContain(ribs);
    expect((await refusal(catalogue.updateTrait(owen, { ...traitInput, name: "Owen's now", traitId: ribs }))).code).toBe("not_found");
    const [trial] = await db.select().from(s.trials).where(eq(s.trials.id, juniperTrialId));
    const design = { trialId: juniperTrialId, title: trial!.title, design: trial!.design, blocks: trial!.blocks, plotUnit: trial!.plotUnit, plotSize: trial!.plotSize, seedsPerCell: trial!.seedsPerCell, traitIds: [ribs] };
    expect((await refusal(editTrialDesign(owen, design))).fieldErrors?.traitIds).toBeTruthy();
    // The same code may be used by another program; a built-in code may not.
    const own = await catalogue.insertTrait(owen, { ...traitInput, name: "Rib crack (Juniper)" });
    created.traits.push(own);
    expect((await listTraits(owen)).find((t) => t.id === own)).toMatchObject({ code: traitInput.code, program: DEMO_SECOND_PROGRAM.name });
    expect((await refusal(catalogue.insertTrait(owen, { ...traitInput, code: "quality" }))).fieldErrors?.code).toBeTruthy();
  });

  it("lists only the coordinator's own program's varieties and seed lots, and counts only its trials", async () => {
    const varieties = await listVarieties(owen);
    expect(varieties.map((v) => v.name).sort()).toEqual(DEMO_SECOND_PROGRAM.trial.entries.map((e) => e.variety).sort());
    expect((await listSeedLots(owen)).map((l) => l.variety).sort()).toEqual(DEMO_SECOND_PROGRAM.trial.entries.map((e) => e.variety).sort());
    const lettuce = (await listCrops(owen)).find((c) => c.name === "Lettuce")!;
    expect(lettuce).toMatchObject({ varieties: 2, trials: 1, usedByOtherPrograms: true });
    expect((await listVarieties(rosa)).map((v) => v.name)).not.toContain(DEMO_SECOND_PROGRAM.trial.entries[0].variety);
  });

  it("leaves a crop another program grows to admins, while any coordinator may add and rename an unused one", async () => {
    const [lettuce] = await db.select().from(s.crops).where(eq(s.crops.name, "Lettuce"));
    expect((await refusal(catalogue.updateCrop(owen, { cropId: lettuce!.id, name: "Salad", cropGroup: "leafy_greens" }))).code).toBe("conflict");
    expect((await refusal(catalogue.updateCrop(rosa, { cropId: lettuce!.id, name: "Salad", cropGroup: "leafy_greens" }))).code).toBe("conflict");
    await catalogue.updateCrop(admin, { cropId: lettuce!.id, name: "Lettuce", cropGroup: "leafy_greens", scientificName: "Lactuca sativa L." });
    expect((await db.select({ s: s.crops.scientificName }).from(s.crops).where(eq(s.crops.id, lettuce!.id)))[0]!.s).toBe("Lactuca sativa L.");
    await catalogue.updateCrop(admin, { cropId: lettuce!.id, name: "Lettuce", cropGroup: "leafy_greens", scientificName: "Lactuca sativa" });

    const okra = await catalogue.insertCrop(owen, { name: unique("Okra"), cropGroup: "fruiting" });
    created.crops.push(okra);
    await catalogue.updateCrop(rosa, { cropId: okra, name: unique("Okra renamed"), cropGroup: "fruiting" });
  });
});
