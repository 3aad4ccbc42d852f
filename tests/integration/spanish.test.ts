import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { and, desc, eq, gt } from "drizzle-orm";
import { testDatabase } from "../helpers/db";
import { demoSite, demoViewer } from "../helpers/demo";
import * as s from "@/db/schema";
import type { Viewer } from "@/lib/domain/viewer";
import { insertDueReminders } from "@/server/review/reminders";
import { updateSitePrintLocale } from "@/db/mutations/sites";
import { languageSchema } from "@/lib/validation/users";
import { previewUpload } from "@/server/spreadsheets/upload";
import { templateForViewer } from "@/server/spreadsheets/files";
import ExcelJS from "exceljs";
import { translatorFor } from "@/lib/domain/i18n/catalogue";

const { db, pool } = testDatabase();
const MEI = "mei@cedarhollow.example";
let cedar: Awaited<ReturnType<typeof demoSite>>;
let rosa: Viewer;
let owen: Viewer;
let mei: Viewer;
let mailMark = 0;

beforeAll(async () => {
  await db.update(s.users).set({ locale: "es" }).where(eq(s.users.email, MEI));
  [rosa, owen, mei] = await Promise.all([demoViewer(db, "rosa.delgado@tamarack-valley.example"), demoViewer(db, "owen.marsh@juniper-flats.example"), demoViewer(db, MEI)]);
  cedar = await demoSite(db, "TV27-KAL", "Cedar Hollow Market Garden");
  await db.delete(s.auditLog).where(and(eq(s.auditLog.action, "reminder.sent"), eq(s.auditLog.entityId, String(cedar.enrolmentId))));
  const [last] = await db.select({ id: s.mailOutbox.id }).from(s.mailOutbox).orderBy(desc(s.mailOutbox.id)).limit(1);
  mailMark = last?.id ?? 0;
});
afterAll(async () => {
  await db.update(s.users).set({ locale: "en" }).where(eq(s.users.email, MEI));
  await db.update(s.sites).set({ printLocale: null }).where(eq(s.sites.id, cedar.siteId));
  await pool.end();
});

describe("a grower who reads Spanish", () => {
  it("gets reminders in Spanish: the frame, the trait names and the dates", async () => {
    await insertDueReminders({ appUrl: "http://seedplot.test" });
    const mails = await db.select({ subject: s.mailOutbox.subject, text: s.mailOutbox.textBody }).from(s.mailOutbox).where(and(gt(s.mailOutbox.id, mailMark), eq(s.mailOutbox.toAddress, MEI)));
    expect(mails).toHaveLength(1);
    expect(mails[0]!.subject).toBe("Conteos atrasados en Cedar Hollow Market Garden");
    expect(mails[0]!.text).toContain("Hola, Mei Lin Harrow:");
    expect(mails[0]!.text).toMatch(/Atrasados:\n- Plántulas emergidas \(conteo\), día \d+ \(para el \d{1,2} [a-z]{3,4}\.? 20\d\d\): faltan \d+ de 18 parcelas por registrar/);
    expect(mails[0]!.text).toContain("Regístrelos aquí (también desde el teléfono):");
    expect(mails[0]!.text).not.toMatch(/Hello|Seedlings|plots to record/);
  });

  it("reads an upload's problems in Spanish with their row and column, while the sheet's headings stay the ones uploads are read by", async () => {
    const template = await templateForViewer(mei, { trialId: String(cedar.trialId), siteId: String(cedar.siteId) });
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.load(template.body as unknown as ArrayBuffer);
    const plots = wb.getWorksheet("Plots")!;
    const header = (plots.getRow(1).values as unknown[]).slice(1).map(String);
    const sown = header.indexOf("Seeds sown [seeds]") + 1;
    expect(sown).toBeGreaterThan(0);
    plots.getCell(2, 2).value = 3;
    plots.getCell(3, sown).value = "12,500";
    const preview = await previewUpload(mei, { trialId: cedar.trialId, siteId: cedar.siteId, bytes: new Uint8Array(await wb.xlsx.writeBuffer()), fileName: "cedar.xlsx" });
    const letter = String.fromCharCode(64 + sown);
    expect(preview.problems).toEqual(
      expect.arrayContaining([
        { row: 2, column: "columna B (Block)", message: expect.stringMatching(/^La parcela \S+ está en el bloque 1, pero esta fila dice bloque 3\. Revise que la fila no se haya movido\.$/) },
        { row: 3, column: `columna ${letter} (Seeds sown [seeds])`, message: expect.stringMatching(/^«12,500» está guardado en esta celda como texto, no como número/) },
      ]),
    );
  });
});

describe("languages are chosen by whom they belong to", () => {
  it("a coordinator sets the printout language of their own program's sites only, and it is audited", async () => {
    await expect(updateSitePrintLocale(owen, { siteId: cedar.siteId, printLocale: "es" })).rejects.toMatchObject({ code: "not_found" });
    await expect(updateSitePrintLocale(mei, { siteId: cedar.siteId, printLocale: "es" })).rejects.toMatchObject({ code: "forbidden" });
    expect((await db.select({ l: s.sites.printLocale }).from(s.sites).where(eq(s.sites.id, cedar.siteId)))[0]!.l).toBeNull();
    await updateSitePrintLocale(rosa, { siteId: cedar.siteId, printLocale: "es" });
    expect((await db.select({ l: s.sites.printLocale }).from(s.sites).where(eq(s.sites.id, cedar.siteId)))[0]!.l).toBe("es");
    const [audit] = await db.select({ actorId: s.auditLog.actorId, newValue: s.auditLog.newValue }).from(s.auditLog).where(and(eq(s.auditLog.action, "change_print_language"), eq(s.auditLog.entityId, String(cedar.siteId)))).orderBy(desc(s.auditLog.id)).limit(1);
    expect(audit).toMatchObject({ actorId: rosa.id, newValue: { printLocale: "es" } });
  });

  it("the profile form can only name a language, never whose: a smuggled account id is dropped", () => {
    expect(languageSchema(translatorFor()).parse({ locale: "es", userId: "1", id: "1" })).toEqual({ locale: "es" });
    expect(languageSchema(translatorFor()).safeParse({ locale: "fr" }).success).toBe(false);
  });
});
