import { UploadRefused } from "./safety";
import { translatorFor, type Translator } from "@/lib/domain/i18n/catalogue";

type CsvSeparator = "," | ";" | "\t";

export interface CsvRecord {
  /** The record's row as a spreadsheet program shows it (the heading is row 1). */
  row: number;
  /** The line of the file the record starts on; differs from `row` only after a value with a line break. */
  line: number;
  cells: string[];
}

/** Reads CSV text (RFC 4180 quoting). The separator is guessed from the header line: comma, semicolon or tab. */
export function parseCsv(text: string): string[][] {
  return parseCsvRecords(text, { keepBlank: true }).records.map((r) => r.cells);
}

/**
 * Reads CSV text into records with their row and line numbers.
 * Records with no value at all are left out unless `keepBlank`, so a file of empty lines stays small.
 */
export function parseCsvRecords(text: string, opts: { keepBlank?: boolean; t?: Translator } = {}): { records: CsvRecord[] } {
  const body = text.replace(/^\uFEFF/, "");
  const firstLine = body.split(/\r?\n/, 1)[0] ?? "";
  const counts = { ",": 0, ";": 0, "\t": 0 } as Record<CsvSeparator, number>;
  let quoted = false;
  for (const ch of firstLine) {
    if (ch === '"') quoted = !quoted;
    else if (!quoted && ch in counts) counts[ch as CsvSeparator] += 1;
  }
  // Spreadsheets set to a decimal-comma language export with semicolons.
  const sep = (Object.entries(counts) as [CsvSeparator, number][]).sort((a, b) => b[1] - a[1])[0]![0];
  const records: CsvRecord[] = [];
  let row: string[] = [];
  let cell = "";
  let inQuotes = false;
  let line = 1;
  let recordLine = 1;
  let rowNumber = 1;
  const finish = () => {
    row.push(cell);
    if (opts.keepBlank || row.some((c) => c.trim() !== "")) records.push({ row: rowNumber, line: recordLine, cells: row });
    rowNumber += 1;
    row = [];
    cell = "";
  };
  for (let i = 0; i < body.length; i += 1) {
    const ch = body[i]!;
    if (inQuotes) {
      if (ch === '"') {
        if (body[i + 1] === '"') {
          cell += '"';
          i += 1;
        } else inQuotes = false;
      } else {
        if (ch === "\n" || (ch === "\r" && body[i + 1] !== "\n")) line += 1;
        cell += ch;
      }
      continue;
    }
    if (ch === '"' && cell === "") inQuotes = true;
    else if (ch === sep) {
      row.push(cell);
      cell = "";
    } else if (ch === "\n" || ch === "\r") {
      if (ch === "\r" && body[i + 1] === "\n") i += 1;
      finish();
      line += 1;
      recordLine = line;
    } else cell += ch;
  }
  if (inQuotes) throw new UploadRefused((opts.t ?? translatorFor())("refusals.unclosedQuote", { line: String(recordLine) }));
  if (cell !== "" || row.length > 0) finish();
  return { records };
}

/** Decodes CSV bytes as UTF-8, refusing other encodings rather than guessing and garbling notes. */
export function decodeCsv(bytes: Uint8Array, t: Translator = translatorFor()): string {
  try {
    return new TextDecoder("utf-8", { fatal: true }).decode(bytes);
  } catch {
    throw new UploadRefused(t("refusals.notUtf8"));
  }
}
