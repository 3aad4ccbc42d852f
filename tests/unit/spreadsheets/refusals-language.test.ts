import { describe, expect, it } from "vitest";
import ExcelJS from "exceljs";
import * as CFB from "cfb";
import { strFromU8, strToU8, unzipSync, zipSync } from "fflate";
import { entryColumns, type TraitForColumns } from "@/lib/domain/observations/columns";
import { readUpload } from "@/lib/domain/spreadsheets/read";
import { inspectUpload, UploadRefused } from "@/lib/domain/spreadsheets/safety";
import { translatorFor } from "@/lib/domain/i18n/catalogue";

// A whole-file refusal is the one message a grower gets for an upload, so it is in their language, and it
// keeps the row, column, cell or sheet it names. English stays word for word what it was.

const trait = (t: Partial<TraitForColumns> & Pick<TraitForColumns, "id" | "code" | "name">): TraitForColumns => ({
  unit: null,
  valueType: "count",
  minValue: null,
  maxValue: null,
  dueDaysAfterSowing: null,
  dueNote: null,
  computation: "none",
  ...t,
});
const columns = entryColumns([trait({ id: 1, code: "seeds_sown", name: "Seeds sown", unit: "seeds" }), trait({ id: 2, code: "quality", name: "Overall quality", valueType: "rating", unit: "1-9", minValue: 1, maxValue: 9 })]);
const headings = ["Plot", "Block", "Code", ...columns.map((c) => c.heading)];
const ctx = { columns, plotCodes: ["P101", "P102"] };
const es = translatorFor("es");
const en = translatorFor("en");
const enc = (s: string) => new TextEncoder().encode(s);

async function refusal(read: () => unknown): Promise<UploadRefused> {
  try {
    await read();
  } catch (e) {
    if (e instanceof UploadRefused) return e;
    throw e;
  }
  throw new Error("the file was not refused");
}
const csv = (rows: string[][]) => enc(rows.map((r) => r.join(",")).join("\n"));

async function workbook(fill: (ws: ExcelJS.Worksheet) => void): Promise<Uint8Array> {
  const wb = new ExcelJS.Workbook();
  const ws = wb.addWorksheet("Plots");
  ws.addRow(headings);
  fill(ws);
  return new Uint8Array(await wb.xlsx.writeBuffer());
}

describe("whole-file upload refusals in the grower's language", () => {
  it("what the file really is, in Spanish, naming the extension it pretends to have; English unchanged", async () => {
    const pdf = enc("%PDF-1.7 not a sheet");
    expect((await refusal(() => inspectUpload(pdf, "plots.xlsx", es))).message).toBe(
      "Este archivo se llama .xlsx, pero es un PDF. Suba la plantilla de Excel (.xlsx) o un archivo CSV (.csv) con las mismas columnas.",
    );
    expect((await refusal(() => inspectUpload(pdf, "plots.xlsx", en))).message).toBe("This file is named .xlsx but is a PDF. Upload the Excel template (.xlsx) or a CSV file (.csv) with the same columns.");
    expect((await refusal(() => inspectUpload(new Uint8Array(0), "plots.csv", es))).message).toBe("El archivo está vacío. Elija la hoja completada e inténtelo de nuevo.");
    expect((await refusal(() => inspectUpload(enc("<!DOCTYPE html><html></html>"), "plots.csv", es))).message).toMatch(/^Este archivo se llama \.csv, pero es una página web \(HTML\), no una hoja de cálculo\. Ábralo en su programa/);
    const big = new Uint8Array(5 * 1024 * 1024 + 300_000);
    big.set(enc("Plot,Block"));
    expect((await refusal(() => inspectUpload(big, "plots.csv", es))).message).toBe("Este archivo pesa 5,3 MB; el límite es 5 MB. Quite imágenes u hojas de más, o suba un CSV.");
    expect((await refusal(() => inspectUpload(big, "plots.csv", en))).message).toBe("This file is 5.3 MB; the limit is 5 MB. Remove pictures or extra sheets, or upload a CSV.");
  });

  it("a password-protected or macro-enabled workbook is refused in Spanish", async () => {
    const cfb = CFB.utils.cfb_new();
    CFB.utils.cfb_add(cfb, "EncryptionInfo", Buffer.from([4, 0, 4, 0, 0x40, 0, 0, 0]));
    CFB.utils.cfb_add(cfb, "EncryptedPackage", Buffer.alloc(512, 7));
    const locked = new Uint8Array(CFB.write(cfb, { type: "array" }) as number[]);
    expect((await refusal(() => inspectUpload(locked, "plots.xlsx", es))).message).toMatch(/^Este libro está protegido con contraseña, así que no se puede leer\./);

    const parts = unzipSync(await workbook(() => undefined));
    parts["[Content_Types].xml"] = strToU8(strFromU8(parts["[Content_Types].xml"]!).replace("</Types>", '<Default Extension="bin" ContentType="application/vnd.ms-office.vbaProject"/></Types>'));
    parts["xl/vbaProject.bin"] = new Uint8Array(64);
    expect((await refusal(() => inspectUpload(zipSync(parts), "plots.xlsx", es))).message).toMatch(/^Este libro contiene macros .* Archivo → Guardar como → Libro de Excel \(\.xlsx\) y suba esa copia\.$/);
  });

  it("a formula keeps its sheet, row and column in Spanish", async () => {
    const bytes = await workbook((ws) => {
      ws.addRow(["P101", 1, "A"]);
      ws.getCell("D2").value = { formula: "1+2", result: 3 };
    });
    expect((await refusal(() => readUpload(bytes, "xlsx", ctx, es))).message).toBe(
      `Hoja «Plots»: La fila 2, columna D («${headings[3]}») contiene una fórmula. Reemplace las fórmulas por los valores mismos (copiar y luego Pegar valores) y vuelva a subir el archivo.`,
    );
    expect((await refusal(() => readUpload(bytes, "xlsx", ctx, en))).message).toBe(
      `Sheet "Plots": Row 2, column D ("${headings[3]}") holds a formula. Replace formulas with the values themselves (copy, then Paste Values) and upload again.`,
    );
  });

  it("a missing heading column, a value under no heading and a short CSV line name their column, cell and line in Spanish", async () => {
    const withoutQuality = csv([headings.slice(0, 4), ["P101", "1", "A", "12"]]);
    expect((await refusal(() => readUpload(withoutQuality, "csv", ctx, es))).message).toBe(
      `Las columnas no coinciden con la plantilla de este ensayo. Falta la columna «${headings[4]}». Descargue una plantilla nueva o vuelva a añadir la columna con ese encabezado exacto.`,
    );
    const stray = csv([[...headings, ""], ["P101", "1", "A", "12", "5", ""], ["P102", "2", "B", "10", "6", "oops"]]);
    expect((await refusal(() => readUpload(stray, "csv", ctx, es))).message).toBe("La fila 3 tiene un valor en la celda F3, una columna sin encabezado. Bórrelo o páselo a la columna que corresponde.");
    const short = csv([headings, ["P101", "1", "A", "12", "5"], ["P102", "2", "B"]]);
    expect((await refusal(() => readUpload(short, "csv", ctx, es))).message).toMatch(
      new RegExp(`^La línea 3 tiene 3 de los 5 campos, así que no tiene lugar para ${headings[3]!.replace(/[[\]]/g, "\\$&")} \\(columna D\\) y ${headings[4]!.replace(/[[\]]/g, "\\$&")} \\(columna E\\)\\. Una línea con menos campos`),
    );
    const moved = csv([["Mis datos"], headings, ["P101", "1", "A", "12", "5"]]);
    expect((await refusal(() => readUpload(moved, "csv", ctx, es))).message).toBe("Los encabezados de columna están en la fila 2, pero deben estar en la fila 1. Borre la fila de arriba (fila 1) y vuelva a subir el archivo.");
    expect((await refusal(() => readUpload(moved, "csv", ctx, en))).message).toBe("The column headings are on row 2, but they must be on row 1. Delete the row above them (row 1) and upload again.");
  });

  it("a CSV that is not UTF-8 and a formula in a CSV cell are refused in Spanish with row and column", async () => {
    expect((await refusal(() => readUpload(new Uint8Array([0x50, 0x6c, 0x6f, 0x74, 0xe9, 0xff]), "csv", ctx, es))).message).toBe(
      "El archivo CSV no está en UTF-8. En su programa de hojas de cálculo elija Guardar como → CSV UTF-8 e inténtelo de nuevo.",
    );
    const formula = csv([headings, ["P101", "1", "A", "=1+1", "5"]]);
    expect((await refusal(() => readUpload(formula, "csv", ctx, es))).message).toBe(
      `La fila 2, columna D («${headings[3]}») empieza con «=», que los programas de hojas de cálculo ejecutan como fórmula. Escriba el valor mismo.`,
    );
  });
});
