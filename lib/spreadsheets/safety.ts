import { Unzip, UnzipInflate } from "fflate";
import { BODY_LIMITS } from "@/lib/http/limits";

// Checks made on an uploaded file before any parser sees it: size, what the bytes really are (never the
// name alone), and for workbooks the zip directory, so a small file that inflates to gigabytes is refused.

export const MAX_UPLOAD_BYTES = BODY_LIMITS.spreadsheet.fileBytes;
export const MAX_UNZIPPED_BYTES = 60 * 1024 * 1024;
const MAX_ZIP_ENTRIES = 500;
// Spreadsheet XML compresses well, but not beyond about 100:1; far higher ratios are how zip bombs work.
const MAX_RATIO = 200;

export type UploadKind = "xlsx" | "csv";

export class UploadRefused extends Error {
  constructor(message: string) {
    super(message);
    this.name = "UploadRefused";
  }
}

const startsWith = (b: Uint8Array, sig: number[]) => sig.every((x, i) => b[i] === x);

/** What a binary file seems to be, for a refusal that tells the grower what they actually picked. */
function describeBinary(b: Uint8Array): string | null {
  if (startsWith(b, [0xd0, 0xcf, 0x11, 0xe0])) return "an old-style Excel 97-2003 (.xls) file. Open it and save it as an Excel Workbook (.xlsx)";
  if (startsWith(b, [0x25, 0x50, 0x44, 0x46])) return "a PDF";
  if (startsWith(b, [0x89, 0x50, 0x4e, 0x47])) return "a PNG picture";
  if (startsWith(b, [0xff, 0xd8, 0xff])) return "a JPEG picture";
  if (startsWith(b, [0x4d, 0x5a])) return "a Windows program";
  if (startsWith(b, [0x7f, 0x45, 0x4c, 0x46])) return "a program";
  if (startsWith(b, [0x1f, 0x8b])) return "a gzip archive";
  return null;
}

/**
 * Decides whether the upload is a workbook or CSV from its bytes and checks the name agrees. Throws
 * UploadRefused with a message for the grower; returns the kind otherwise.
 */
export function inspectUpload(bytes: Uint8Array, fileName: string): UploadKind {
  if (bytes.length === 0) throw new UploadRefused("The file is empty. Choose the filled-in sheet and try again.");
  if (bytes.length > MAX_UPLOAD_BYTES) throw new UploadRefused(`The file is ${(bytes.length / 1024 / 1024).toFixed(1)} MB; the limit is ${MAX_UPLOAD_BYTES / 1024 / 1024} MB. Remove pictures or extra sheets, or upload a CSV.`);
  const ext = /\.([a-z0-9]+)$/i.exec(fileName.trim())?.[1]?.toLowerCase() ?? "";
  if (ext !== "xlsx" && ext !== "csv") throw new UploadRefused("Upload the Excel template (.xlsx) or a CSV file (.csv) with the same columns.");
  const isZip = startsWith(bytes, [0x50, 0x4b, 0x03, 0x04]);
  const binary = describeBinary(bytes);
  if (ext === "xlsx") {
    if (!isZip) throw new UploadRefused(`This file is named .xlsx but is ${binary ?? "not an Excel workbook"}. Upload the Excel template or a CSV file.`);
    checkZip(bytes);
    return "xlsx";
  }
  if (isZip) throw new UploadRefused("This file is named .csv but is really an Excel workbook or another zip file. Rename it to .xlsx, or save it as CSV.");
  if (binary) throw new UploadRefused(`This file is named .csv but is ${binary}. Save your sheet as CSV and try again.`);
  if (bytes.subarray(0, 8192).includes(0)) throw new UploadRefused("This file is named .csv but is not text. Save your sheet as CSV (UTF-8) and try again.");
  return "csv";
}

/**
 * Reads the zip central directory (sizes as declared), then inflates every entry with a running cap,
 * because a hostile file can declare small sizes and still inflate to gigabytes.
 */
export function checkZip(bytes: Uint8Array) {
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  let eocd = -1;
  for (let i = bytes.length - 22; i >= Math.max(0, bytes.length - 65_557); i -= 1) {
    if (view.getUint32(i, true) === 0x06054b50) {
      eocd = i;
      break;
    }
  }
  const broken = new UploadRefused("This workbook is damaged or not a real Excel file. Open it in your spreadsheet program, save it again as .xlsx and retry.");
  if (eocd < 0) throw broken;
  const entries = view.getUint16(eocd + 10, true);
  const cdSize = view.getUint32(eocd + 12, true);
  const cdOffset = view.getUint32(eocd + 16, true);
  if (entries === 0xffff || cdOffset === 0xffffffff) throw new UploadRefused("This workbook is far too large inside to be a trial sheet. Upload the template you downloaded.");
  if (entries > MAX_ZIP_ENTRIES) throw new UploadRefused(`This workbook holds ${entries} parts; a trial sheet has a few dozen. Upload the template you downloaded.`);
  if (cdOffset + cdSize > bytes.length) throw broken;
  let p = cdOffset;
  let total = 0;
  const names = new Set<string>();
  for (let n = 0; n < entries; n += 1) {
    if (p + 46 > bytes.length || view.getUint32(p, true) !== 0x02014b50) throw broken;
    const compressed = view.getUint32(p + 20, true);
    const size = view.getUint32(p + 24, true);
    const nameLen = view.getUint16(p + 28, true);
    const extraLen = view.getUint16(p + 30, true);
    const commentLen = view.getUint16(p + 32, true);
    names.add(new TextDecoder().decode(bytes.subarray(p + 46, p + 46 + nameLen)));
    total += size;
    if (size === 0xffffffff || total > MAX_UNZIPPED_BYTES || (size > 1_000_000 && size / Math.max(compressed, 1) > MAX_RATIO)) {
      throw new UploadRefused("This workbook unpacks to far more data than a trial sheet could hold (it looks like a zip bomb). Nothing was saved.");
    }
    p += 46 + nameLen + extraLen + commentLen;
  }
  if (!names.has("xl/workbook.xml") || !names.has("[Content_Types].xml")) {
    throw new UploadRefused("This is a zip file but not an Excel workbook. Upload the Excel template (.xlsx) or a CSV file.");
  }
  let inflated = 0;
  let bomb = false;
  const unzip = new Unzip((file) => {
    file.ondata = (err, chunk) => {
      if (err) return;
      inflated += chunk.length;
      if (inflated > MAX_UNZIPPED_BYTES && !bomb) {
        bomb = true;
        file.terminate();
      }
    };
    if (!bomb) file.start();
  });
  unzip.register(UnzipInflate);
  try {
    for (let i = 0; i < bytes.length && !bomb; i += 65_536) unzip.push(bytes.subarray(i, Math.min(bytes.length, i + 65_536)), i + 65_536 >= bytes.length);
  } catch {
    throw broken;
  }
  if (bomb) throw new UploadRefused("This workbook unpacks to far more data than a trial sheet could hold (it looks like a zip bomb). Nothing was saved.");
}

/**
 * Makes a text cell safe to open in a spreadsheet program: a leading =, +, -, @ (or tab/CR) would make
 * it run as a formula, so it is prefixed with an apostrophe (OWASP CSV injection guidance, from memory).
 */
export function neutraliseCell(value: string): string {
  return /^[=+\-@\t\r]/.test(value) ? `'${value}` : value;
}

/** Undoes neutraliseCell on upload, so a value exported and uploaded again stays the same. */
export function unneutraliseCell(value: string): string {
  return /^'[=+\-@\t\r]/.test(value) ? value.slice(1) : value;
}
