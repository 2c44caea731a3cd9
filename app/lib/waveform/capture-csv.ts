/**
 * Reads an oscilloscope capture exported as CSV, a piece at a time, into typed
 * arrays: a time column and one or more channels.
 *
 * Scopes differ in what they write, so the reader accepts:
 * - header lines before the data (model, settings, channel names); the last one
 *   with as many fields as the data names the columns, a units row under it is
 *   recognised, and units written in the names ("CH1 (V)", "Time[s]") are read;
 * - comma, semicolon or tab delimiters (with semicolons, a decimal comma);
 * - scientific notation (1.25E-03), quoted fields, \r\n line ends, a byte-order mark.
 *
 * Text arrives in pieces and is read line by line, so a capture of any size streams
 * through in bounded memory; values land in growing Float64Arrays. Header lines and
 * quoted fields are split by papaparse; plain numeric rows take a fast path. Every
 * refusal names the line to fix. Pure: no I/O here; the caller feeds text.
 */
import Papa from "papaparse";

export class CaptureError extends Error {
  constructor(
    message: string,
    /** 1-based line of the file the message is about, when there is one. */
    readonly line?: number,
  ) {
    super(message);
    this.name = "CaptureError";
  }
}

export interface CaptureChannel {
  name: string;
  /** Unit as written in the header ("V", "A", "mV"…), or "" when none was given. */
  unit: string;
  values: Float64Array;
}

export interface Capture {
  timeName: string;
  timeUnit: string;
  /** Seconds; a time column in ms, µs or ns is converted. */
  firstTime: number;
  lastTime: number;
  sampleCount: number;
  channels: CaptureChannel[];
  /** The line the first sample came from. */
  firstDataLine: number;
}

/** Header lines allowed before the data: scopes write a dozen or two. */
const MAX_HEADER_LINES = 200;
const MAX_CHANNELS = 16;
const INITIAL_CAPACITY = 1 << 16;

const NUMBER = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;
const UNIT_IN_NAME = /^(.*?)\s*[([]\s*([^)\]]*)\s*[)\]]\s*$/;
const TIME_UNITS: Record<string, number> = { s: 1, sec: 1, second: 1, seconds: 1, ms: 1e-3, us: 1e-6, "µs": 1e-6, ns: 1e-9 };
/** Channel units read in SI: a capture in mV is analysed in V. */
const CHANNEL_UNITS: Record<string, { unit: string; scale: number }> = {
  V: { unit: "V", scale: 1 },
  mV: { unit: "V", scale: 1e-3 },
  kV: { unit: "V", scale: 1e3 },
  A: { unit: "A", scale: 1 },
  mA: { unit: "A", scale: 1e-3 },
};
const UNIT_WORDS = new Set(["s", "sec", "second", "seconds", "ms", "us", "µs", "ns", "v", "mv", "kv", "volt", "volts", "a", "ma", "amp", "amps", "ampere", "w", "%", "hz"]);

type Delimiter = "," | ";" | "\t";

export class CaptureReader {
  private pending = "";
  private lineNumber = 0;
  private delimiter: Delimiter | undefined;
  private headerLines: string[][] = [];
  private columnCount = 0;
  private timeScale = 1;
  private count = 0;
  private capacity = INITIAL_CAPACITY;
  private columns: Float64Array[] = [];
  private firstTime = 0;
  private previousTime = 0;
  private firstDataLine = 0;
  private blankAfterData = 0;
  private names: { name: string; unit: string }[] = [];

  /** Rows of data read so far, for progress reports. */
  get rowsRead(): number {
    return this.count;
  }

  /** Feeds the next piece of the file's text. Throws CaptureError on the first bad line. */
  write(text: string): void {
    const joined = this.pending + text;
    const cut = joined.lastIndexOf("\n");
    if (cut < 0) {
      this.pending = joined;
      return;
    }
    this.pending = joined.slice(cut + 1);
    this.readLines(joined.slice(0, cut + 1));
  }

  /** Ends the file and answers the capture. Throws CaptureError when it holds no usable data. */
  finish(): Capture {
    if (this.pending.length > 0) {
      const last = this.pending;
      this.pending = "";
      this.readLines(last);
    }
    if (this.lineNumber === 0 || (this.count === 0 && this.headerLines.length === 0)) {
      throw new CaptureError("The file is empty. Export the capture from the scope as CSV with a time column and at least one channel.");
    }
    if (this.count === 0) {
      throw new CaptureError(
        `No rows of numbers were found in ${this.lineNumber} line${this.lineNumber === 1 ? "" : "s"}. A capture needs rows like "0.000125,12.5" (time, then each channel).`,
      );
    }
    const channels = this.names.slice(1).map((column, index) => {
      const values = this.columns[index + 1]!.slice(0, this.count);
      const scaled = CHANNEL_UNITS[column.unit];
      if (scaled && scaled.scale !== 1) for (let i = 0; i < values.length; i++) values[i] = values[i]! * scaled.scale;
      return { name: column.name, unit: scaled?.unit ?? column.unit, values };
    });
    return {
      timeName: this.names[0]!.name,
      timeUnit: "s",
      firstTime: this.firstTime * this.timeScale,
      lastTime: this.previousTime * this.timeScale,
      sampleCount: this.count,
      channels,
      firstDataLine: this.firstDataLine,
    };
  }

  private readLines(text: string): void {
    if (this.lineNumber === 0 && text.charCodeAt(0) === 0xfeff) text = text.slice(1);
    this.delimiter ??= guessDelimiter(text);
    let start = 0;
    while (start < text.length) {
      let next = text.indexOf("\n", start);
      if (next < 0) next = text.length;
      const end = text.charCodeAt(next - 1) === 13 ? next - 1 : next;
      this.lineNumber++;
      // The bulk of a capture is plain numeric rows: read them in place (several times faster
      // than a general CSV parser; see `npm run bench:waveform`). Header lines, quoted fields
      // and any row the fast path doubts go through papaparse, and the refusals are worded there.
      const line = text.slice(start, end);
      const plain = this.count > 0 && !this.blankAfterData && !line.includes('"');
      if (!(plain && this.readPlainRow(line))) this.readRow(this.fieldsOf(line));
      start = next + 1;
    }
  }

  private fieldsOf(line: string): string[] {
    if (line.trim() === "") return [""];
    return Papa.parse<string[]>(line, { delimiter: this.delimiter }).data[0] ?? [""];
  }

  /** One plain row read straight into the columns; false (nothing counted) when it needs a closer look. */
  private readPlainRow(line: string): boolean {
    const end = line.length;
    if (end === 0) return false;
    if (this.count === this.capacity) this.grow();
    const delimiter = this.delimiter!;
    const row = this.count;
    let column = 0;
    let from = 0;
    for (;;) {
      let at = line.indexOf(delimiter, from);
      if (at < 0) at = end;
      if (column === this.columnCount) return false;
      let field = line.slice(from, at);
      if (delimiter === ";") field = field.replace(",", ".");
      const value = Number(field);
      // Number("") and Number("  ") are 0, and Number accepts "Infinity": none is a sample.
      if (!Number.isFinite(value) || (value === 0 && field.trim() === "")) return false;
      this.columns[column]![row] = value;
      column++;
      if (at === end) break;
      from = at + 1;
    }
    if (column !== this.columnCount) return false;
    const time = this.columns[0]![row]!;
    if (!(time > this.previousTime)) return false;
    this.previousTime = time;
    this.count++;
    return true;
  }

  private readRow(fields: string[]): void {
    const line = this.lineNumber;
    if (fields.length === 1 && fields[0]!.trim() === "") {
      if (this.count > 0) this.blankAfterData = this.blankAfterData || line;
      return;
    }
    // Trailing delimiters leave empty fields some scopes write at the end of every row.
    let width = fields.length;
    while (width > 1 && fields[width - 1]!.trim() === "") width--;
    if (this.count === 0) {
      if (!this.isNumericRow(fields, width)) {
        if (this.headerLines.length >= MAX_HEADER_LINES) {
          throw new CaptureError(
            `No row of numbers in the first ${MAX_HEADER_LINES} lines (line ${line} is "${preview(fields)}"). Rows of data hold a time and at least one channel value.`,
            line,
          );
        }
        this.headerLines.push(fields.slice(0, width).map((f) => f.trim()));
        return;
      }
      this.startData(width, line);
    } else if (this.blankAfterData) {
      throw new CaptureError(`Line ${this.blankAfterData} is empty, but data continues on line ${line}. Remove the empty line.`, this.blankAfterData);
    }
    if (width !== this.columnCount) {
      throw new CaptureError(
        `Line ${line} has ${width} value${width === 1 ? "" : "s"} where the data has ${this.columnCount} (time and ${this.columnCount - 1} channel${this.columnCount === 2 ? "" : "s"}). Fix or remove that line.`,
        line,
      );
    }
    if (this.count === this.capacity) this.grow();
    for (let c = 0; c < width; c++) {
      const value = this.toNumber(fields[c]!);
      if (Number.isNaN(value)) {
        throw new CaptureError(
          `Line ${line}, column ${c + 1} ("${this.names[c]?.name ?? c + 1}"): "${fields[c]!.trim().slice(0, 40)}" is not a number. Every row after the header must hold numbers only.`,
          line,
        );
      }
      this.columns[c]![this.count] = value;
    }
    const time = this.columns[0]![this.count]!;
    if (this.count === 0) {
      this.firstTime = time;
    } else if (!(time > this.previousTime)) {
      throw new CaptureError(
        `Line ${line}: time ${fields[0]!.trim()} is not after the previous sample's ${formatPlain(this.previousTime)}. The first column must be time, increasing on every row.`,
        line,
      );
    }
    this.previousTime = time;
    this.count++;
  }

  private startData(width: number, line: number): void {
    if (width < 2) {
      throw new CaptureError(
        `Line ${line} holds a single column. A capture needs a time column and at least one channel, separated by commas, semicolons or tabs.`,
        line,
      );
    }
    if (width > MAX_CHANNELS + 1) {
      throw new CaptureError(`Line ${line} has ${width} columns; at most ${MAX_CHANNELS} channels besides time are read. Export fewer channels.`, line);
    }
    this.columnCount = width;
    this.firstDataLine = line;
    this.columns = Array.from({ length: width }, () => new Float64Array(this.capacity));
    this.names = columnNames(this.headerLines, width);
    const timeUnit = this.names[0]!.unit.toLowerCase();
    this.timeScale = TIME_UNITS[timeUnit] ?? 1;
  }

  private grow(): void {
    this.capacity *= 2;
    this.columns = this.columns.map((column) => {
      const larger = new Float64Array(this.capacity);
      larger.set(column);
      return larger;
    });
  }

  private isNumericRow(fields: string[], width: number): boolean {
    for (let c = 0; c < width; c++) if (Number.isNaN(this.toNumber(fields[c]!))) return false;
    return true;
  }

  private toNumber(field: string): number {
    let text = field.trim();
    // With semicolons between fields, scopes set to a European locale write a decimal comma.
    if (this.delimiter === ";" && text.includes(",")) text = text.replace(",", ".");
    return NUMBER.test(text) ? Number(text) : Number.NaN;
  }
}

/** Parses a whole capture held in one string (tests, small files). */
export function readCapture(text: string): Capture {
  const reader = new CaptureReader();
  reader.write(text);
  return reader.finish();
}

function guessDelimiter(text: string): Delimiter {
  const sample = text.slice(0, 8192);
  const count = (character: string) => sample.split(character).length - 1;
  const semicolons = count(";");
  const tabs = count("\t");
  if (semicolons > 0 && semicolons >= tabs) return ";";
  if (tabs > 0) return "\t";
  return ",";
}

/** Names and units of the columns from the header lines (the last lines as wide as the data). */
function columnNames(headerLines: string[][], width: number): { name: string; unit: string }[] {
  const wide = headerLines.filter((fields) => fields.length >= width);
  let names = wide[wide.length - 1];
  let units: string[] | undefined;
  if (names && names.every((field) => UNIT_WORDS.has(field.toLowerCase()) || field === "") && wide.length >= 2) {
    units = names;
    names = wide[wide.length - 2];
  }
  return Array.from({ length: width }, (_, c) => {
    const raw = names?.[c]?.trim() || (c === 0 ? "Time" : `Channel ${c}`);
    const inName = UNIT_IN_NAME.exec(raw);
    const name = inName ? inName[1]!.trim() || raw : raw;
    const unit = (inName ? inName[2]!.trim() : "") || units?.[c]?.trim() || (c === 0 ? "s" : "");
    return { name, unit: normaliseUnit(unit) };
  });
}

function normaliseUnit(unit: string): string {
  const lower = unit.toLowerCase();
  if (["volt", "volts"].includes(lower)) return "V";
  if (["amp", "amps", "ampere"].includes(lower)) return "A";
  if (["sec", "second", "seconds"].includes(lower)) return "s";
  return unit;
}

function preview(fields: string[]): string {
  const text = fields.join(",");
  return text.length > 40 ? `${text.slice(0, 40)}…` : text;
}

function formatPlain(value: number): string {
  return String(Number(value.toPrecision(6)));
}
