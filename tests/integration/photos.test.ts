import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { eq } from "drizzle-orm";
import * as schema from "@/db/schema";
import sharp from "sharp";
import { testDatabase } from "../helpers/db";
import { demoSite, demoViewer, writeCounts } from "../helpers/demo";
import type { Viewer } from "@/lib/domain/viewer";
import { deletePhotoForViewer, readPhotoForViewer, uploadPhotoForViewer } from "@/server/photos/upload";
import { listSitePhotos } from "@/db/queries/photos";
import { getStorage, localDiskStorage, s3Storage } from "@/server/storage";
import { env } from "@/lib/env";
import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { and, inArray } from "drizzle-orm";
import { DEMO_STAFF } from "@/db/demo-data";
import { unique } from "../helpers/db";
import { rollTrialForward } from "@/server/trials/design";
import { randomiseTrialSite } from "@/server/trials/enrolment";

const { db, pool } = testDatabase();
let luis: Viewer;
let tomas: Viewer;
let brightwater: Awaited<ReturnType<typeof demoSite>>;
let withGps: Buffer;

// GPS IFD pointer tag 0x8825, little- or big-endian, as it appears in an EXIF block.
const hasGps = (exif: Buffer | undefined) => !!exif && (exif.includes(Buffer.from([0x25, 0x88])) || exif.includes(Buffer.from([0x88, 0x25])));

beforeAll(async () => {
  luis = await demoViewer(db, "luis@brightwater.example");
  tomas = await demoViewer(db, "tomas@willowbend.example");
  brightwater = await demoSite(db, "TV27-KAL", "Brightwater Flower Farm");
  withGps = await sharp({ create: { width: 80, height: 60, channels: 3, background: "green" } })
    .jpeg()
    .withExif({ IFD0: { Make: "PhoneCo" }, IFD3: { GPSLatitudeRef: "N", GPSLatitude: "45/1 30/1 0/1" } })
    .toBuffer();
  expect(hasGps((await sharp(withGps).metadata()).exif)).toBe(true);
});

const createdTrials: number[] = [];

afterAll(async () => {
  // Children first: plots refer to entries with ON DELETE RESTRICT.
  if (createdTrials.length) {
    await db.delete(schema.plots).where(inArray(schema.plots.trialId, createdTrials));
    await db.delete(schema.trials).where(inArray(schema.trials.id, createdTrials));
  }
  await pool.end();
});

const fields = (extra: Record<string, string> = {}) => ({ trialId: String(brightwater.trialId), siteId: String(brightwater.siteId), ...extra });

describe("plot photos", () => {
  it("are stored without GPS or other metadata unless the grower keeps the location", async () => {
    const stripped = await uploadPhotoForViewer(luis, fields({ plotId: String(brightwater.plots[0]!.id), caption: "Day 7, trays under lights" }), withGps);
    const back = await readPhotoForViewer(luis, stripped.id);
    expect(back.contentType).toBe("image/jpeg");
    expect((await sharp(back.bytes).metadata()).exif).toBeUndefined();

    const kept = await uploadPhotoForViewer(luis, fields({ keepLocation: "on" }), withGps);
    expect(hasGps((await sharp((await readPhotoForViewer(luis, kept.id)).bytes).metadata()).exif)).toBe(true);
    const list = await listSitePhotos(luis, brightwater);
    expect(list.find((p) => p.id === stripped.id)).toMatchObject({ plotCode: brightwater.plots[0]!.plotCode, keptLocation: false, caption: "Day 7, trays under lights" });
  });

  it("accepts only real images, within the size limit, from the site's own grower", async () => {
    const before = await writeCounts(db, brightwater.enrolmentId);
    const cases: [Viewer, Record<string, string>, Uint8Array, RegExp][] = [
      [luis, fields(), new TextEncoder().encode("<svg onload=alert(1)>"), /not a JPEG, PNG or WebP picture/],
      [luis, fields(), new Uint8Array([0x25, 0x50, 0x44, 0x46, 1, 2, 3]), /not a JPEG, PNG or WebP picture/],
      [luis, fields(), new Uint8Array([0, 0, 0, 0x18, 0x66, 0x74, 0x79, 0x70, 0x68, 0x65, 0x69, 0x63]), /HEIC/],
      [luis, fields(), new Uint8Array([0xff, 0xd8, 0xff, 0xe0, 1, 2, 3, 4]), /damaged or too large/],
      [luis, fields(), new Uint8Array(16 * 1024 * 1024).fill(0xff), /the limit is 15 MB/],
      [tomas, fields(), withGps, /not one of yours/],
      [luis, fields({ plotId: "999999999" }), withGps, /not one of this site's plots/],
      [luis, fields({ takenOn: "yesterday" }), withGps, /Enter the date like/],
    ];
    for (const [viewer, f, bytes, message] of cases) {
      await expect(uploadPhotoForViewer(viewer, f, bytes)).rejects.toThrow(message);
    }
    await expect(readPhotoForViewer(tomas, (await listSitePhotos(luis, brightwater))[0]!.id)).rejects.toMatchObject({ code: "not_found" });
    expect(await listSitePhotos(tomas, brightwater)).toEqual([]);
    expect(await writeCounts(db, brightwater.enrolmentId)).toEqual(before);
  });

  it("local storage refuses keys that would leave its folder", async () => {
    const store = localDiskStorage(mkdtempSync(path.join(tmpdir(), "seedplot-store-")));
    await store.put("photos/a.jpg", new Uint8Array([1, 2]), "image/jpeg");
    expect([...(await store.get("photos/a.jpg"))!]).toEqual([1, 2]);
    await expect(store.put("../escape.jpg", new Uint8Array([1]), "image/jpeg")).rejects.toThrow(/invalid storage key/);
    await expect(store.put("photos/../../escape.jpg", new Uint8Array([1]), "image/jpeg")).rejects.toThrow(/invalid storage key/);
    expect(await store.get("photos/missing.jpg")).toBeNull();
  });

  it("are kept in the shared object store when the S3 store is set, where any instance reads them", async () => {
    expect(env.STORAGE_DRIVER).toBe("s3");
    const photo = await uploadPhotoForViewer(luis, fields(), withGps);
    const [row] = await db.select({ key: schema.photos.storageKey }).from(schema.photos).where(eq(schema.photos.id, photo.id));
    // A second client of the same bucket, as another app instance would have.
    const other = s3Storage({ endpoint: env.S3_ENDPOINT, region: env.S3_REGION, bucket: env.S3_BUCKET, accessKeyId: env.S3_ACCESS_KEY_ID, secretAccessKey: env.S3_SECRET_ACCESS_KEY, forcePathStyle: true });
    expect(Buffer.compare((await other.get(row!.key))!, (await readPhotoForViewer(luis, photo.id)).bytes)).toBe(0);
    expect(await other.get("photos/missing.jpg")).toBeNull();
  });

  it("a failed put leaves no row pointing at nothing", async () => {
    const before = await writeCounts(db, brightwater.enrolmentId);
    const photosBefore = (await listSitePhotos(luis, brightwater)).length;
    const put = vi.spyOn(getStorage(), "put").mockRejectedValueOnce(new Error("store unreachable"));
    await expect(uploadPhotoForViewer(luis, fields(), withGps)).rejects.toThrow(/store unreachable/);
    put.mockRestore();
    expect((await listSitePhotos(luis, brightwater)).length).toBe(photosBefore);
    expect(await writeCounts(db, brightwater.enrolmentId)).toEqual(before);
  });

  it("deleting a photo deletes its object, and only the site's growers and the trial's staff may", async () => {
    const photo = await uploadPhotoForViewer(luis, fields(), withGps);
    const [row] = await db.select({ key: schema.photos.storageKey }).from(schema.photos).where(eq(schema.photos.id, photo.id));
    await expect(deletePhotoForViewer(tomas, photo.id)).rejects.toMatchObject({ code: "not_found" });
    expect(await getStorage().get(row!.key)).not.toBeNull();
    await deletePhotoForViewer(luis, photo.id);
    expect(await db.select().from(schema.photos).where(eq(schema.photos.id, photo.id))).toEqual([]);
    expect(await getStorage().get(row!.key)).toBeNull();
    const [audit] = await db.select({ action: schema.auditLog.action }).from(schema.auditLog).where(eq(schema.auditLog.entityId, String(photo.id)));
    expect(audit).toBeDefined();
    await expect(deletePhotoForViewer(luis, photo.id)).rejects.toMatchObject({ code: "not_found" });
  });

  it("re-drawing a site's layout deletes the photos of its old plots, rows and stored objects alike", async () => {
    const rosa = await demoViewer(db, DEMO_STAFF[1].email);
    const [season] = await db.select({ id: schema.seasons.id }).from(schema.seasons).where(eq(schema.seasons.name, "Winter 2026–27"));
    const { trialId } = await rollTrialForward(rosa, { trialId: brightwater.trialId, seasonId: season!.id, code: unique("PH").toUpperCase().replace(/[^A-Z0-9-]/g, "").slice(0, 30), title: "Kale photos, re-drawn" });
    createdTrials.push(trialId);
    const site = { trialId: String(trialId), siteId: String(brightwater.siteId) };
    await randomiseTrialSite(rosa, { trialId, siteId: brightwater.siteId });
    const [plot] = await db.select({ id: schema.plots.id, enrolmentId: schema.plots.enrolmentId }).from(schema.plots).where(and(eq(schema.plots.trialId, trialId), eq(schema.plots.siteId, brightwater.siteId))).limit(1);
    const ofPlot = await uploadPhotoForViewer(rosa, { ...site, plotId: String(plot!.id) }, withGps);
    const ofSite = await uploadPhotoForViewer(rosa, site, withGps);
    const keys = Object.fromEntries(
      (await db.select({ id: schema.photos.id, key: schema.photos.storageKey }).from(schema.photos).where(inArray(schema.photos.id, [ofPlot.id, ofSite.id]))).map((r) => [r.id, r.key]),
    );
    expect(await getStorage().get(keys[ofPlot.id]!)).not.toBeNull();

    await randomiseTrialSite(rosa, { trialId, siteId: brightwater.siteId });
    expect(await db.select().from(schema.photos).where(eq(schema.photos.id, ofPlot.id))).toEqual([]);
    expect(await getStorage().get(keys[ofPlot.id]!)).toBeNull();
    // A photo of the site as a whole belongs to no plot and stays, with its object.
    expect((await db.select({ id: schema.photos.id }).from(schema.photos).where(eq(schema.photos.id, ofSite.id))).length).toBe(1);
    expect(await getStorage().get(keys[ofSite.id]!)).not.toBeNull();
  });
});
