import { afterAll, beforeAll, describe, expect, it } from "vitest";
import sharp from "sharp";
import { testDatabase } from "../helpers/db";
import { demoSite, demoViewer, writeCounts } from "../helpers/demo";
import type { Viewer } from "@/lib/domain/viewer";
import { readPhotoForViewer, uploadPhotoForViewer } from "@/server/photos/upload";
import { listSitePhotos } from "@/db/queries/photos";
import { localDiskStorage } from "@/server/storage";
import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";

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

afterAll(async () => {
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
    await store.put("photos/a.jpg", new Uint8Array([1, 2]));
    expect([...(await store.get("photos/a.jpg"))!]).toEqual([1, 2]);
    await expect(store.put("../escape.jpg", new Uint8Array([1]))).rejects.toThrow(/invalid storage key/);
    await expect(store.put("photos/../../escape.jpg", new Uint8Array([1]))).rejects.toThrow(/invalid storage key/);
    expect(await store.get("photos/missing.jpg")).toBeNull();
  });
});
