import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import sharp from "sharp";
import type { Viewer } from "@/lib/domain/viewer";
import { BODY_LIMITS } from "@/lib/domain/request-limits";
import { testDatabase } from "../helpers/db";
import { demoSite, demoViewer } from "../helpers/demo";

// What a grower reads back from a form or a request, in the grower's own language: the request checks (zod),
// the confirmations, the refusals of a photo and of a body over its limit. English readers get the same words
// as before. Mei's language is given on her viewer here, as the session carries it.

vi.mock("@/server/auth/guards", () => import("../helpers/signed-in-as"));
vi.mock("next/cache", () => ({ revalidatePath: () => undefined }));
const { testAuth } = await import("../helpers/signed-in-as");
const { removePhoto } = await import("@/server/actions/photos");
const { setMyLanguage } = await import("@/server/actions/account");
const { saveObservationsForViewer } = await import("@/server/observations/recording");
const { uploadPhotoForViewer } = await import("@/server/photos/upload");
const uploadRoute = await import("@/app/api/record/[trialId]/[siteId]/upload/route");
const { env } = await import("@/lib/env");

const { db, pool } = testDatabase();
let meiEs: Viewer;
let meiEn: Viewer;
let cedar: Awaited<ReturnType<typeof demoSite>>;

beforeAll(async () => {
  const mei = await demoViewer(db, "mei@cedarhollow.example");
  meiEs = { ...mei, locale: "es" };
  meiEn = { ...mei, locale: "en" };
  cedar = await demoSite(db, "TV27-KAL", "Cedar Hollow Market Garden");
});
afterAll(async () => {
  testAuth.viewer = null;
  await pool.end();
});

const form = (fields: Record<string, string | number>) => {
  const f = new FormData();
  for (const [k, v] of Object.entries(fields)) f.set(k, String(v));
  return f;
};
const refusalOf = (p: Promise<unknown>) => p.then(() => "saved", (e: Error) => e.message);

describe("a Spanish-reading grower's forms and requests", () => {
  it("a value the save request refuses is refused in Spanish; an English reader gets the English words", async () => {
    const tooLong = { trialId: cedar.trialId, siteId: cedar.siteId, values: [{ plotId: cedar.plots[0]!.id, key: "plot_notes", value: "x".repeat(2001) }] };
    expect(await refusalOf(saveObservationsForViewer(meiEs, tooLong))).toBe("Ese valor es demasiado largo.");
    expect(await refusalOf(saveObservationsForViewer(meiEn, tooLong))).toBe("That value is too long.");
    expect(await refusalOf(saveObservationsForViewer(meiEs, { trialId: cedar.trialId, siteId: cedar.siteId, values: [] }))).toBe("No hay nada que guardar.");
    const both = { trialId: cedar.trialId, siteId: cedar.siteId, values: [{ plotId: cedar.plots[0]!.id, key: "plot_notes", value: "12", missingReason: "died" }] };
    expect(await refusalOf(saveObservationsForViewer(meiEs, both))).toBe("Escriba un valor o elija por qué no lo hay, pero no ambos.");
  });

  it("a form action's field errors and its confirmation come back in Spanish", async () => {
    testAuth.viewer = meiEs;
    const wrong = await removePhoto(null, form({ photoId: "abc", trialId: cedar.trialId, siteId: cedar.siteId }));
    expect(wrong).toMatchObject({ ok: false, formError: "Corrija los campos marcados.", fieldErrors: { photoId: ["Esa foto no existe."] } });
    expect(await setMyLanguage(null, form({ locale: "fr" }))).toMatchObject({ ok: false, fieldErrors: { locale: ["Elija inglés o español."] } });

    const png = await sharp({ create: { width: 40, height: 30, channels: 3, background: "green" } }).png().toBuffer();
    const photo = await uploadPhotoForViewer(meiEs, { trialId: String(cedar.trialId), siteId: String(cedar.siteId) }, png);
    expect(await removePhoto(null, form({ photoId: photo.id, trialId: cedar.trialId, siteId: cedar.siteId }))).toEqual({ ok: true, message: "Foto eliminada." });
    const again = await uploadPhotoForViewer(meiEn, { trialId: String(cedar.trialId), siteId: String(cedar.siteId) }, png);
    testAuth.viewer = meiEn;
    expect(await removePhoto(null, form({ photoId: again.id, trialId: cedar.trialId, siteId: cedar.siteId }))).toEqual({ ok: true, message: "Photo removed." });
  });

  it("a photo that is not a picture and a sheet over the size limit are refused in Spanish", async () => {
    const fields = { trialId: String(cedar.trialId), siteId: String(cedar.siteId) };
    expect(await refusalOf(uploadPhotoForViewer(meiEs, fields, new TextEncoder().encode("%PDF-1.7")))).toBe("Este archivo no es una imagen JPEG, PNG ni WebP. Solo se pueden adjuntar fotos.");
    const post = async (viewer: Viewer) => {
      testAuth.viewer = viewer;
      const request = new Request(`${env.APP_URL}/api/record/${cedar.trialId}/${cedar.siteId}/upload`, {
        method: "POST",
        headers: { origin: new URL(env.APP_URL).origin, "content-type": "multipart/form-data; boundary=x" },
        body: new Uint8Array(BODY_LIMITS.spreadsheet.bytes + 1024),
      });
      const answer = await uploadRoute.POST(request, { params: Promise.resolve({ trialId: String(cedar.trialId), siteId: String(cedar.siteId) }) });
      return { status: answer.status, error: ((await answer.json()) as { error: string }).error };
    };
    expect(await post(meiEs)).toEqual({ status: 413, error: "El archivo supera el límite de 5 MB. Quite imágenes u hojas de más, o suba un CSV." });
    expect(await post(meiEn)).toEqual({ status: 413, error: "The file is larger than the 5 MB limit. Remove pictures or extra sheets, or upload a CSV." });
  });
});
