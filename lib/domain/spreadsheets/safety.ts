import { Unzip, UnzipInflate } from "fflate";
import * as CFB from "cfb";
import { BODY_LIMITS } from "@/lib/domain/request-limits";
import { translatorFor, type Translator } from "@/lib/domain/i18n/catalogue";
import { localFileTooLarge } from "@/lib/domain/i18n/files";

// Checks made on an uploaded file before any parser sees it: size, what the bytes really are (never the
// name, which only shapes the wording), and for workbooks the zip directory, so a small file that inflates to
// gigabytes is refused, and the declared content types, so a macro-enabled workbook is refused whatever its name.
// Every refusal is worded in the grower's language (the Translator passed in; English when none).

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

type FileKindWord = "kindPdf" | "kindPng" | "kindJpeg" | "kindGif" | "kindRiff" | "kindWindows" | "kindProgram" | "kindGzip" | "kindRar" | "kind7z" | "kindHtml" | "kindXml" | "kindRtf";

/** What a file that is neither a workbook nor text seems to be, for a refusal that says what was picked. */
function describeOther(b: Uint8Array): FileKindWord | null {
  if (startsWith(b, [0x25, 0x50, 0x44, 0x46])) return "kindPdf";
  if (startsWith(b, [0x89, 0x50, 0x4e, 0x47])) return "kindPng";
  if (startsWith(b, [0xff, 0xd8, 0xff])) return "kindJpeg";
  if (startsWith(b, [0x47, 0x49, 0x46, 0x38])) return "kindGif";
  if (startsWith(b, [0x52, 0x49, 0x46, 0x46])) return "kindRiff";
  if (startsWith(b, [0x4d, 0x5a])) return "kindWindows";
  if (startsWith(b, [0x7f, 0x45, 0x4c, 0x46])) return "kindProgram";
  if (startsWith(b, [0x1f, 0x8b])) return "kindGzip";
  if (startsWith(b, [0x52, 0x61, 0x72, 0x21])) return "kindRar";
  if (startsWith(b, [0x37, 0x7a, 0xbc, 0xaf])) return "kind7z";
  return null;
}

/** The start of a text file, lower-cased, for telling a web page or XML export from CSV. */
function describeText(b: Uint8Array): FileKindWord | null {
  const head = new TextDecoder("utf-8").decode(b.subarray(0, 512)).replace(/^\uFEFF/, "").trimStart().toLowerCase();
  if (head.startsWith("<!doctype html") || head.startsWith("<html") || head.startsWith("<table")) return "kindHtml";
  if (head.startsWith("<?xml")) return "kindXml";
  if (head.startsWith("{\\rtf")) return "kindRtf";
  return null;
}

/**
 * The spreadsheet-like extension the content belies ("none" when the name fits or says nothing), so a refusal
 * can say "This file is named .xlsx but is…" and the grower sees what went wrong.
 */
function named(fileName: string, fits: string[] = []): string {
  const ext = /\.([a-z0-9]{1,8})$/i.exec(fileName.trim())?.[1]?.toLowerCase();
  return ext && !fits.includes(ext) && ["xlsx", "xlsm", "xls", "xlsb", "csv", "txt", "ods"].includes(ext) ? ext : "none";
}

/**
 * Decides from the bytes alone whether the upload is a workbook (.xlsx) or CSV text; the name never decides.
 * Throws UploadRefused with a message for the grower; returns the kind otherwise.
 */
export function inspectUpload(bytes: Uint8Array, fileName: string, t: Translator = translatorFor()): UploadKind {
  if (bytes.length === 0) throw new UploadRefused(t("refusals.empty"));
  if (bytes.length > MAX_UPLOAD_BYTES) throw new UploadRefused(localFileTooLarge(t, "spreadsheet", bytes.length));
  if (startsWith(bytes, [0x50, 0x4b, 0x03, 0x04])) {
    checkZip(bytes, t);
    return "xlsx";
  }
  if (startsWith(bytes, CFB_MAGIC)) checkOldOffice(bytes, fileName, t);
  const other = describeOther(bytes);
  if (other) throw new UploadRefused(t("refusals.otherFile", { ext: named(fileName), what: t(`refusals.${other}`) }));
  if (bytes.subarray(0, 8192).includes(0)) throw new UploadRefused(t("refusals.notText", { ext: named(fileName) }));
  const text = describeText(bytes);
  if (text) throw new UploadRefused(t("refusals.textFile", { ext: named(fileName), what: t(`refusals.${text}`), saveAs: t("refusals.saveAs") }));
  return "csv";
}

/**
 * An old-style Office file (a compound file): an Excel 97-2003 workbook, or any Office file protected with a
 * password, which Office stores as an EncryptionInfo and an EncryptedPackage stream in such a container.
 * Always refuses; the message says which of these the file is.
 */
function checkOldOffice(bytes: Uint8Array, fileName: string, t: Translator): never {
  const saveAs = t("refusals.saveAs");
  let names: Set<string>;
  let container: CFB.CFB$Container;
  try {
    container = CFB.read(bytes, { type: "array" });
    names = new Set(container.FileIndex.filter((e) => e.type === 2).map((e) => e.name));
  } catch {
    throw new UploadRefused(t("refusals.oldDamaged", { ext: named(fileName, ["xls"]), saveAs }));
  }
  if (names.has("EncryptionInfo") || names.has("EncryptedPackage")) throw new UploadRefused(t("refusals.password"));
  const book = container.FileIndex.find((e) => e.type === 2 && (e.name === "Workbook" || e.name === "Book"));
  if (book) {
    if (hasFilePass(book.content)) throw new UploadRefused(t("refusals.password"));
    throw new UploadRefused(t("refusals.oldXls", { ext: named(fileName, ["xls"]), saveAs }));
  }
  if (names.has("WordDocument")) throw new UploadRefused(t("refusals.wordDocument", { ext: named(fileName) }));
  throw new UploadRefused(t("refusals.oldOffice", { ext: named(fileName), saveAs }));
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
export function checkZip(bytes: Uint8Array, t: Translator = translatorFor()) {
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  let eocd = -1;
  for (let i = bytes.length - 22; i >= Math.max(0, bytes.length - 65_557); i -= 1) {
    if (view.getUint32(i, true) === 0x06054b50) {
      eocd = i;
      break;
    }
  }
  const broken = new UploadRefused(t("refusals.damaged"));
  if (eocd < 0) throw broken;
  const entries = view.getUint16(eocd + 10, true);
  const cdSize = view.getUint32(eocd + 12, true);
  const cdOffset = view.getUint32(eocd + 16, true);
  if (entries === 0xffff || cdOffset === 0xffffffff) throw new UploadRefused(t("refusals.farTooLargeInside"));
  if (entries > MAX_ZIP_ENTRIES) throw new UploadRefused(t("refusals.tooManyParts", { count: String(entries) }));
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
      throw new UploadRefused(t("refusals.zipBomb"));
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
  if (bomb) throw new UploadRefused(t("refusals.zipBomb"));

  const text = (name: string) => new TextDecoder().decode(Buffer.concat(descriptors[name] ?? []));
  if (names.has("mimetype") && /opendocument\.spreadsheet/.test(text("mimetype"))) {
    throw new UploadRefused(t("refusals.ods", { saveAs: t("refusals.saveAs") }));
  }
  if (names.has("xl/workbook.bin")) throw new UploadRefused(t("refusals.xlsb", { saveAs: t("refusals.saveAs") }));
  if (!names.has("xl/workbook.xml") || !names.has("[Content_Types].xml")) throw new UploadRefused(t("refusals.zipNotWorkbook"));
  // Content types name every part; a macro-enabled workbook declares its main part or its VBA project there.
  const contentTypes = [...text("[Content_Types].xml").matchAll(/ContentType\s*=\s*["']([^"']*)["']/g)].map((m) => m[1]!);
  const macroPart = [...names].some((n) => /(^|\/)vbaProject\.bin$/i.test(n) || /^xl\/macrosheets\//i.test(n));
  if (macroPart || contentTypes.some((type) => /macroEnabled|vbaProject|macrosheet/i.test(type))) throw new UploadRefused(t("refusals.macros"));
}
