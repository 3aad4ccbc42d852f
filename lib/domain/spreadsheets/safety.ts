import { Unzip, UnzipInflate } from "fflate";
import * as CFB from "cfb";
import { BODY_LIMITS, fileTooLarge } from "@/lib/domain/request-limits";

// Checks made on an uploaded file before any parser sees it: size, what the bytes really are (never the
// name, which only shapes the wording), and for workbooks the zip directory, so a small file that inflates to
// gigabytes is refused, and the declared content types, so a macro-enabled workbook is refused whatever its name.

export const MAX_UPLOAD_BYTES = BODY_LIMITS.spreadsheet.fileBytes;
export const MAX_UNZIPPED_BYTES = 60 * 1024 * 1024;
const MAX_ZIP_ENTRIES = 500;
// Spreadsheet XML compresses well, but not beyond about 100:1; far higher ratios are how zip bombs work.
const MAX_RATIO = 200;
// Parts read whole to decide what a zip is; real ones are a few kilobytes.
const MAX_DESCRIPTOR_BYTES = 1024 * 1024;

export type UploadKind = "xlsx" | "csv";

export class UploadRefused extends Error {
  /** The worksheet the problem was found on, when the file is a workbook. */
  sheet: string | null;
  constructor(message: string, sheet: string | null = null) {
    super(message);
    this.name = "UploadRefused";
    this.sheet = sheet;
  }
}

const startsWith = (b: Uint8Array, sig: number[]) => sig.every((x, i) => b[i] === x);
const CFB_MAGIC = [0xd0, 0xcf, 0x11, 0xe0, 0xa1, 0xb1, 0x1a, 0xe1];
const SAVE_AS_XLSX = "Open it in your spreadsheet program and save it as an Excel Workbook (.xlsx), or as CSV, then upload that copy.";
const PASSWORD_MESSAGE =
  "This workbook is protected with a password, so it cannot be read. Open it, save a copy without the password (in Excel: File → Info → Protect Workbook → Encrypt with Password, then clear the password and save), and upload that copy.";
const MACRO_MESSAGE =
  "This workbook contains macros (it is a macro-enabled workbook, whatever its name says), and Seedplot does not take files that can run programs. In your spreadsheet program choose File → Save As → Excel Workbook (.xlsx), then upload that copy.";

/** What a file that is neither a workbook nor text seems to be, for a refusal that says what was picked. */
function describeOther(b: Uint8Array): string | null {
  if (startsWith(b, [0x25, 0x50, 0x44, 0x46])) return "a PDF";
  if (startsWith(b, [0x89, 0x50, 0x4e, 0x47])) return "a PNG picture";
  if (startsWith(b, [0xff, 0xd8, 0xff])) return "a JPEG picture";
  if (startsWith(b, [0x47, 0x49, 0x46, 0x38])) return "a GIF picture";
  if (startsWith(b, [0x52, 0x49, 0x46, 0x46])) return "a picture or sound file";
  if (startsWith(b, [0x4d, 0x5a])) return "a Windows program";
  if (startsWith(b, [0x7f, 0x45, 0x4c, 0x46])) return "a program";
  if (startsWith(b, [0x1f, 0x8b])) return "a gzip archive";
  if (startsWith(b, [0x52, 0x61, 0x72, 0x21])) return "a RAR archive";
  if (startsWith(b, [0x37, 0x7a, 0xbc, 0xaf])) return "a 7-Zip archive";
  return null;
}

/** The start of a text file, lower-cased, for telling a web page or XML export from CSV. */
function describeText(b: Uint8Array): string | null {
  const head = new TextDecoder("utf-8").decode(b.subarray(0, 512)).replace(/^\uFEFF/, "").trimStart().toLowerCase();
  if (head.startsWith("<!doctype html") || head.startsWith("<html") || head.startsWith("<table")) return "a web page (HTML), not a spreadsheet";
  if (head.startsWith("<?xml")) return "an XML file, not a spreadsheet we can read";
  if (head.startsWith("{\\rtf")) return "a word-processor (RTF) document";
  return null;
}

/** "This file is", naming a spreadsheet-like extension the content belies, so the grower sees what went wrong. */
function named(fileName: string, fits: string[] = []): string {
  const ext = /\.([a-z0-9]{1,8})$/i.exec(fileName.trim())?.[1]?.toLowerCase();
  return ext && !fits.includes(ext) && ["xlsx", "xlsm", "xls", "xlsb", "csv", "txt", "ods"].includes(ext) ? `This file is named .${ext} but is` : "This file is";
}

/**
 * Decides from the bytes alone whether the upload is a workbook (.xlsx) or CSV text; the name never decides.
 * Throws UploadRefused with a message for the grower; returns the kind otherwise.
 */
export function inspectUpload(bytes: Uint8Array, fileName: string): UploadKind {
  if (bytes.length === 0) throw new UploadRefused("The file is empty. Choose the filled-in sheet and try again.");
  if (bytes.length > MAX_UPLOAD_BYTES) throw new UploadRefused(fileTooLarge("spreadsheet", bytes.length));
  if (startsWith(bytes, [0x50, 0x4b, 0x03, 0x04])) {
    checkZip(bytes);
    return "xlsx";
  }
  if (startsWith(bytes, CFB_MAGIC)) checkOldOffice(bytes, fileName);
  const other = describeOther(bytes);
  if (other) throw new UploadRefused(`${named(fileName)} ${other}. Upload the Excel template (.xlsx) or a CSV file (.csv) with the same columns.`);
  if (bytes.subarray(0, 8192).includes(0)) throw new UploadRefused(`${named(fileName)} not a spreadsheet or text. Upload the Excel template (.xlsx) or a CSV file (.csv) with the same columns.`);
  const text = describeText(bytes);
  if (text) throw new UploadRefused(`${named(fileName)} ${text}. ${SAVE_AS_XLSX}`);
  return "csv";
}

/**
 * An old-style Office file (a compound file): an Excel 97-2003 workbook, or any Office file protected with a
 * password, which Office stores as an EncryptionInfo and an EncryptedPackage stream in such a container.
 * Always refuses; the message says which of these the file is.
 */
function checkOldOffice(bytes: Uint8Array, fileName: string): never {
  let names: Set<string>;
  let container: CFB.CFB$Container;
  try {
    container = CFB.read(bytes, { type: "array" });
    names = new Set(container.FileIndex.filter((e) => e.type === 2).map((e) => e.name));
  } catch {
    throw new UploadRefused(`${named(fileName, ["xls"])} an old-style Office file (such as an Excel 97-2003 workbook) that is damaged or cannot be read. ${SAVE_AS_XLSX}`);
  }
  if (names.has("EncryptionInfo") || names.has("EncryptedPackage")) throw new UploadRefused(PASSWORD_MESSAGE);
  const book = container.FileIndex.find((e) => e.type === 2 && (e.name === "Workbook" || e.name === "Book"));
  if (book) {
    if (hasFilePass(book.content)) throw new UploadRefused(PASSWORD_MESSAGE);
    throw new UploadRefused(`${named(fileName, ["xls"])} an old-style Excel 97-2003 (.xls) workbook. ${SAVE_AS_XLSX}`);
  }
  if (names.has("WordDocument")) throw new UploadRefused(`${named(fileName)} a Word document, not a spreadsheet. Upload the Excel template (.xlsx) or a CSV file (.csv) with the same columns.`);
  throw new UploadRefused(`${named(fileName)} an old-style Office file, not a spreadsheet we can read. ${SAVE_AS_XLSX}`);
}

/** Whether an Excel 97-2003 workbook stream starts with a FILEPASS record, its mark of password encryption (MS-XLS 2.4.117). */
function hasFilePass(stream: CFB.CFB$Blob | undefined): boolean {
  if (!stream) return false;
  const b = stream instanceof Uint8Array ? stream : Uint8Array.from(stream);
  let p = 0;
  // FILEPASS follows the first BOF record; a few records are enough to find it.
  for (let n = 0; n < 16 && p + 4 <= b.length; n += 1) {
    const type = b[p]! | (b[p + 1]! << 8);
    const size = b[p + 2]! | (b[p + 3]! << 8);
    if (type === 0x002f) return true;
    if (type === 0x000a) return false;
    p += 4 + size;
  }
  return false;
}

/**
 * Reads the zip central directory (sizes as declared), then inflates every entry with a running cap, because
 * a hostile file can declare small sizes and still inflate to gigabytes. Then decides from the parts and the
 * declared content types whether this is a plain workbook: macro-enabled, binary and OpenDocument files are
 * refused by what they contain, not by their name.
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
  let inflated = 0;
  let bomb = false;
  const descriptors: Record<string, Uint8Array[]> = { "[Content_Types].xml": [], mimetype: [] };
  const unzip = new Unzip((file) => {
    const keep = descriptors[file.name];
    let kept = 0;
    file.ondata = (err, chunk) => {
      if (err) return;
      inflated += chunk.length;
      if (keep && kept + chunk.length <= MAX_DESCRIPTOR_BYTES) {
        keep.push(chunk);
        kept += chunk.length;
      }
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

  const text = (name: string) => new TextDecoder().decode(Buffer.concat(descriptors[name] ?? []));
  if (names.has("mimetype") && /opendocument\.spreadsheet/.test(text("mimetype"))) {
    throw new UploadRefused(`This file is an OpenDocument spreadsheet (.ods). ${SAVE_AS_XLSX}`);
  }
  if (names.has("xl/workbook.bin")) throw new UploadRefused(`This workbook is saved in Excel's binary format (.xlsb), which Seedplot cannot read. ${SAVE_AS_XLSX}`);
  if (!names.has("xl/workbook.xml") || !names.has("[Content_Types].xml")) {
    throw new UploadRefused("This is a zip file but not an Excel workbook. Upload the Excel template (.xlsx) or a CSV file.");
  }
  // Content types name every part; a macro-enabled workbook declares its main part or its VBA project there.
  const contentTypes = [...text("[Content_Types].xml").matchAll(/ContentType\s*=\s*["']([^"']*)["']/g)].map((m) => m[1]!);
  const macroPart = [...names].some((n) => /(^|\/)vbaProject\.bin$/i.test(n) || /^xl\/macrosheets\//i.test(n));
  if (macroPart || contentTypes.some((t) => /macroEnabled|vbaProject|macrosheet/i.test(t))) throw new UploadRefused(MACRO_MESSAGE);
}
