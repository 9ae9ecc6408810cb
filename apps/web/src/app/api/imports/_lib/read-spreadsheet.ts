import "server-only";
import { Readable, Transform } from "node:stream";
import ExcelJS from "exceljs";
import { fileTypeFromBuffer } from "file-type";
import { GetObjectCommand } from "@aws-sdk/client-s3";
import { CsvFormatError, CsvRowReader, IMPORT_MAX_BYTES } from "@coldtrail/core";
import { ImportFileError, type RowSource, type SheetRow } from "@coldtrail/db";
import { env } from "@/lib/env";
import { s3 } from "@/lib/server/storage";

/**
 * Spreadsheets for imports: what a file is (by its name's extension AND its bytes), its headings
 * and first rows at upload, and all its rows later, streamed from object storage (XLSX through
 * exceljs's streaming reader, CSV through the core's incremental reader) so a large file is never
 * held at once.
 */

export type SpreadsheetFormat = "xlsx" | "csv";

/** The file is not a spreadsheet we can read; the message is shown beside the file input. */
export class SpreadsheetRejected extends Error {}

const ZIP_SIGNATURE = [0x50, 0x4b, 0x03, 0x04];
const MAX_COLUMNS = 500;
const SAMPLE_ROWS = 5;

/**
 * Says which kind of spreadsheet the bytes are, or refuses them. The extension says what the file
 * claims to be; the bytes must agree: an XLSX is a zip archive (file-type only says "zip" for files
 * written by streaming writers), a CSV is text with no binary signature.
 */
export async function identifySpreadsheet(fileName: string, bytes: Uint8Array): Promise<{ format: SpreadsheetFormat; bytes: Uint8Array }> {
  if (bytes.byteLength === 0) throw new SpreadsheetRejected("The file is empty");
  if (bytes.byteLength > IMPORT_MAX_BYTES)
    throw new SpreadsheetRejected(`The file is larger than ${IMPORT_MAX_BYTES / 1024 / 1024} MB; split it into smaller files`);
  const ext = /\.([a-z0-9]+)$/i.exec(fileName.trim())?.[1]?.toLowerCase();
  if (ext === "xlsx") {
    if (!ZIP_SIGNATURE.every((b, i) => bytes[i] === b))
      throw new SpreadsheetRejected("This file is named .xlsx but is not an Excel workbook; it may be damaged");
    return { format: "xlsx", bytes };
  }
  if (ext === "csv" || ext === "txt") {
    const sniffed = await fileTypeFromBuffer(bytes);
    if (sniffed)
      throw new SpreadsheetRejected(`This file is named .${ext} but holds ${sniffed.ext.toUpperCase()} data, not comma-separated text`);
    const head = bytes.subarray(0, 65536);
    if (head.includes(0)) throw new SpreadsheetRejected("This file is not text; save the spreadsheet as CSV or XLSX");
    // Stored as UTF-8: text saved in the older Windows encoding is converted once, here.
    try {
      new TextDecoder("utf-8", { fatal: true }).decode(bytes);
      return { format: "csv", bytes };
    } catch {
      const text = new TextDecoder("windows-1252").decode(bytes);
      return { format: "csv", bytes: new TextEncoder().encode(text) };
    }
  }
  if (ext === "xls") throw new SpreadsheetRejected("Old .xls workbooks cannot be read; save it as .xlsx or .csv");
  throw new SpreadsheetRejected("Choose an Excel workbook (.xlsx) or a CSV file (.csv)");
}

/** A cell as plain text: dates as ISO dates, formulas by their result, rich text joined. */
export function cellText(value: unknown): string {
  if (value === null || value === undefined) return "";
  if (value instanceof Date) {
    if (Number.isNaN(value.getTime())) return "";
    const iso = value.toISOString();
    return iso.endsWith("T00:00:00.000Z") ? iso.slice(0, 10) : iso;
  }
  if (typeof value === "number") return Number.isFinite(value) ? String(value) : "";
  if (typeof value === "boolean") return value ? "yes" : "no";
  if (typeof value === "string") return value;
  if (typeof value === "object") {
    const v = value as Record<string, unknown>;
    if (Array.isArray(v.richText)) return (v.richText as Array<{ text?: string }>).map((p) => p.text ?? "").join("");
    if ("result" in v) return cellText(v.result);
    if ("text" in v) return cellText(v.text);
    if ("error" in v) return String(v.error);
    if ("sharedFormula" in v || "formula" in v) return "";
  }
  return String(value);
}

/** Every row of the first worksheet (or of the CSV), headings included, with the spreadsheet's row numbers. */
export async function* sheetRows(format: SpreadsheetFormat, input: Readable): AsyncGenerator<SheetRow> {
  try {
    if (format === "xlsx") {
      const reader = new ExcelJS.stream.xlsx.WorkbookReader(input, {
        sharedStrings: "cache",
        styles: "cache",
        hyperlinks: "ignore",
        worksheets: "emit",
        entries: "emit",
      });
      let sheets = 0;
      for await (const sheet of reader) {
        sheets++;
        for await (const row of sheet) {
          const values = Array.isArray(row.values) ? (row.values as unknown[]).slice(1) : [];
          yield { rowNumber: row.number, cells: values.slice(0, MAX_COLUMNS).map(cellText) };
        }
        break; // only the first worksheet is imported
      }
      if (sheets === 0) throw new ImportFileError("The workbook has no worksheet");
      return;
    }
    const csv = new CsvRowReader();
    const decoder = new TextDecoder("utf-8");
    let rowNumber = 0;
    for await (const chunk of input) {
      for (const cells of csv.push(decoder.decode(chunk as Uint8Array, { stream: true })))
        yield { rowNumber: ++rowNumber, cells: cells.slice(0, MAX_COLUMNS) };
    }
    for (const cells of [...csv.push(decoder.decode()), ...csv.end()]) yield { rowNumber: ++rowNumber, cells: cells.slice(0, MAX_COLUMNS) };
  } catch (err) {
    if (err instanceof ImportFileError) throw err;
    if (err instanceof CsvFormatError)
      throw new ImportFileError(`The CSV file is broken: ${err.message.charAt(0).toLowerCase()}${err.message.slice(1)}`);
    throw new ImportFileError(
      format === "xlsx" ? "The workbook could not be read; it may be damaged or not an Excel file" : "The CSV file could not be read",
    );
  }
}

const isBlank = (cells: string[]) => cells.every((c) => c.trim() === "");

/** The headings (the first row that holds anything) and the first rows after them, read at upload. */
export async function readHeadings(
  format: SpreadsheetFormat,
  bytes: Uint8Array,
): Promise<{ headings: string[]; headingRow: number; sample: string[][] }> {
  let headings: string[] | null = null;
  let headingRow = 0;
  const sample: string[][] = [];
  try {
    for await (const row of sheetRows(format, Readable.from(Buffer.from(bytes)))) {
      if (isBlank(row.cells)) continue;
      if (!headings) {
        headings = row.cells.map((c) => c.trim());
        headingRow = row.rowNumber;
        continue;
      }
      sample.push(row.cells);
      if (sample.length >= SAMPLE_ROWS) break;
    }
  } catch (err) {
    if (err instanceof ImportFileError) throw new SpreadsheetRejected(err.message);
    throw err;
  }
  if (!headings) throw new SpreadsheetRejected("The file is empty: the first row must hold the column headings");
  while (headings.length > 0 && headings[headings.length - 1] === "") headings.pop();
  if (headings.length === 0) throw new SpreadsheetRejected("The first row must hold the column headings");
  if (sample.length === 0) throw new SpreadsheetRejected("The file has headings but no rows to import");
  return { headings: headings.map((h, i) => h || `Column ${i + 1}`), headingRow, sample: sample.map((r) => r.slice(0, headings.length)) };
}

/** The rows after the headings of a stored file, streamed from object storage, with how much has been read. */
export async function storedRows(file: { key: string; format: SpreadsheetFormat; size: number }): Promise<RowSource> {
  const res = await s3().send(new GetObjectCommand({ Bucket: env.S3_BUCKET, Key: file.key }));
  if (!res.Body) throw new ImportFileError("The stored file is missing");
  let read = 0;
  const counted = (res.Body as Readable).pipe(
    new Transform({
      transform(chunk: Buffer, _enc, done) {
        read += chunk.length;
        done(null, chunk);
      },
    }),
  );
  async function* dataRows(): AsyncGenerator<SheetRow> {
    let seenHeadings = false;
    for await (const row of sheetRows(file.format, counted)) {
      if (!seenHeadings) {
        if (isBlank(row.cells)) continue;
        seenHeadings = true;
        continue;
      }
      yield row;
    }
  }
  return { rows: dataRows(), fraction: () => (file.size > 0 ? Math.min(1, read / file.size) : 0) };
}
