import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { testDatabase, unique } from "../helpers/db";
import { writeCounts } from "../helpers/demo";
import { bigSiteCsv, insertBigSite } from "../helpers/big-site";
import { commitUpload, previewUpload } from "@/server/spreadsheets/upload";
import { addDays, todayIso } from "@/lib/domain/schedule";

const { db, pool } = testDatabase();
let site: Awaited<ReturnType<typeof insertBigSite>>;

beforeAll(async () => {
  site = await insertBigSite(db, { plots: 1000, tag: unique("k"), sownOn: addDays(todayIso(), -30) });
});

afterAll(async () => {
  await pool.end();
});

describe("a 1,000-row sheet", () => {
  it("with a mistake on row 999 writes nothing; corrected, all 3,000 values land together", async () => {
    const target = (bytes: Uint8Array) => ({ trialId: site.trialId, siteId: site.siteId, bytes, fileName: "big.csv" });
    const bad = bigSiteCsv(site, (row, cells) => {
      if (row === 999) cells[4] = "n/a";
    });
    const preview = await previewUpload(site.viewer, target(bad));
    expect(preview.ok).toBe(false);
    expect(preview.problems).toEqual([{ row: 999, column: "column E (Marketable yield [g per plot])", message: expect.stringMatching(/"n\/a" is not a number/) }]);
    expect((await commitUpload(site.viewer, target(bad))).ok).toBe(false);
    expect((await writeCounts(db, site.enrolmentId)).observations).toBe(0);

    const good = await commitUpload(site.viewer, target(bigSiteCsv(site)));
    expect(good).toMatchObject({ ok: true, saved: 3000 });
    const after = await writeCounts(db, site.enrolmentId);
    expect(after).toMatchObject({ observations: 3000, history: 0, audit: 3000 });

    const corrected = await commitUpload(site.viewer, target(bigSiteCsv(site, (row, cells) => {
      if (row === 999) cells[5] = cells[5] === "9" ? "8" : "9";
    })));
    expect(corrected).toMatchObject({ ok: true, saved: 1, counts: { new: 0, changed: 1, unchanged: 2999 } });
    expect(await writeCounts(db, site.enrolmentId)).toMatchObject({ observations: 3000, history: 1, audit: 3001 });
  }, 60_000);
});
