/**
 * An incremental CSV reader (RFC 4180 plus the usual variants): text goes in chunk by chunk, whole
 * records come out, so a large file never has to be held at once. Quoted values may hold the
 * delimiter, quotes ("") and line breaks. The delimiter (comma, semicolon or tab) is taken from the
 * first line. Pure: the caller does the reading.
 */
export class CsvFormatError extends Error {
  constructor(message: string) {
    super(message);
    this.name = "CsvFormatError";
  }
}

const CANDIDATES = [",", ";", "\t"] as const;

/** The delimiter that splits the heading line the most (outside quotes); comma when none does. */
export function detectCsvDelimiter(firstLine: string): string {
  let best: string = ",";
  let bestCount = 0;
  for (const d of CANDIDATES) {
    let count = 0;
    let quoted = false;
    for (const ch of firstLine) {
      if (ch === '"') quoted = !quoted;
      else if (!quoted && ch === d) count++;
    }
    if (count > bestCount) {
      best = d;
      bestCount = count;
    }
  }
  return best;
}

export class CsvRowReader {
  private delimiter: string | null = null;
  private pending = "";
  private field = "";
  private record: string[] = [];
  private quoted = false;
  /** The previous character closed a quoted section (a following quote is an escaped quote). */
  private afterQuote = false;
  private started = false;
  private line = 1;
  private quoteStartLine = 0;
  private sawCr = false;

  constructor(delimiter?: string) {
    if (delimiter) this.delimiter = delimiter;
  }

  /** Feeds more text; returns the records completed by it. */
  push(chunk: string): string[][] {
    if (!this.started) {
      this.started = true;
      if (chunk.charCodeAt(0) === 0xfeff) chunk = chunk.slice(1);
    }
    if (this.delimiter === null) {
      this.pending += chunk;
      const nl = this.pending.search(/[\r\n]/);
      if (nl < 0 && this.pending.length < 1_000_000) return [];
      this.delimiter = detectCsvDelimiter(nl < 0 ? this.pending : this.pending.slice(0, nl));
      chunk = this.pending;
      this.pending = "";
    }
    return this.consume(chunk);
  }

  /** Ends the input; returns the last record. Throws CsvFormatError if a quoted value is never closed. */
  end(): string[][] {
    const out: string[][] = [];
    if (this.delimiter === null) {
      this.delimiter = detectCsvDelimiter(this.pending.split(/\r?\n/)[0] ?? "");
      out.push(...this.consume(this.pending));
      this.pending = "";
    }
    if (this.quoted) throw new CsvFormatError(`A quoted value that starts on line ${this.quoteStartLine} is never closed`);
    if (this.field !== "" || this.record.length > 0) {
      this.record.push(this.field);
      out.push(this.record);
    }
    this.field = "";
    this.record = [];
    return out;
  }

  private consume(text: string): string[][] {
    const out: string[][] = [];
    const d = this.delimiter!;
    for (let i = 0; i < text.length; i++) {
      const ch = text[i]!;
      if (this.sawCr) {
        this.sawCr = false;
        if (ch === "\n") continue; // the \n of a \r\n already ended the record
      }
      if (this.quoted) {
        if (ch === '"') {
          this.quoted = false;
          this.afterQuote = true;
        } else {
          if (ch === "\n") this.line++;
          this.field += ch;
        }
        continue;
      }
      if (ch === '"') {
        if (this.afterQuote) {
          // "" inside a quoted value: a literal quote, and the value goes on being quoted.
          this.field += '"';
          this.quoted = true;
          this.afterQuote = false;
        } else if (this.field === "") {
          this.quoted = true;
          this.quoteStartLine = this.line;
        } else {
          this.field += ch; // a stray quote inside an unquoted value is kept as text
        }
        continue;
      }
      this.afterQuote = false;
      if (ch === d) {
        this.record.push(this.field);
        this.field = "";
      } else if (ch === "\n" || ch === "\r") {
        if (ch === "\r") this.sawCr = true;
        this.line++;
        this.record.push(this.field);
        out.push(this.record);
        this.record = [];
        this.field = "";
      } else {
        this.field += ch;
      }
    }
    return out;
  }
}

/** Reads a whole CSV text at once (tests, small files). */
export function parseCsv(text: string): string[][] {
  const reader = new CsvRowReader();
  return [...reader.push(text), ...reader.end()];
}
