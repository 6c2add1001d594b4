// Touchstone reader after the Touchstone File Format Specification, Version 2.0 (IBIS Open Forum, 2009), which also
// restates the Version 1.x rules; section names below are those of that document, recalled from memory.
import type { SData, Z0Vector } from "../types";
import { solveComplexInPlace } from "../linalg/solve";
import { TouchstoneError } from "./errors";
import { compareDecimal, parseDecimal, scaleDecimal } from "./numbers";
import { noiseRowsOf, type NoiseRows } from "./noise";

export type FrequencyUnit = "Hz" | "kHz" | "MHz" | "GHz";
export type DataFormat = "RI" | "MA" | "DB";

/** A Touchstone data set as read: S-parameters whatever the file held (Y and Z are converted to S). */
export type TouchstoneData = {
  version: "1.1" | "2.0";
  ports: number;
  /** Hz, strictly increasing */
  frequencies: Float64Array;
  /** S-parameters referenced to `z0` (power waves; the references are real, so all wave definitions agree) */
  s: SData;
  /** per-port reference impedance, Ω: from [Reference], else from R on the option line */
  z0: Z0Vector;
  parameter: "S";
  /** text after each "!" in the file, trimmed, empty ones left out */
  comments: string[];
  /** the file's number format and frequency unit (S converted from Y or Z keeps the file's values' format name) */
  sourceFormat: DataFormat;
  sourceUnit: FrequencyUnit;
  /** the parameter the file held before conversion */
  sourceParameter: "S" | "Y" | "Z";
  /** 2-port element order of the file: "21_12" is N11 N21 N12 N22 (always so in 1.1), "12_21" is N11 N12 N21 N22 */
  twoPortOrder?: "12_21" | "21_12";
  /** 2-port noise parameters as read (engine/touchstone/noise.ts turns them into noise data) */
  noise?: NoiseRows;
};

export type ParseOptions = {
  /** file name, used in messages; for a 1.1 file its extension .sNp gives the port count */
  name?: string;
  /** port count, for 1.1 data whose name carries none (a .ts 2.0 file states its own) */
  ports?: number;
  /** refuse files with more ports than this (default 64) */
  maxPorts?: number;
  /** refuse texts longer than this many UTF-8 bytes (default 20 MB) */
  maxBytes?: number;
};

// unit and its power of ten: frequencies are converted to hertz by shifting the decimal exponent of the text
// (scaleDecimal), never by a product, so "4.1" GHz is the double nearest 4.1e9 and matches a plan's 4.1e9.
const UNITS: Record<string, [FrequencyUnit, number]> = {
  hz: ["Hz", 0],
  khz: ["kHz", 3],
  mhz: ["MHz", 6],
  ghz: ["GHz", 9],
};

type Section = "header" | "network" | "noise" | "information" | "done";

/**
 * Reads Touchstone 1.1 (.sNp) or 2.0 text.
 *
 * Supported: the option line `# [unit] [parameter] [format] R [n]` with its fields in any order and the
 * defaults GHz, S, MA, R 50 (§ "Option Line"); "!" comments anywhere; Hz/kHz/MHz/GHz; RI/MA/DB; S data,
 * and Y or Z data converted to S (1.1: Y and Z are normalised to R; 2.0: they are in siemens and ohms —
 * both from memory of the specification, and read the same way by other public readers);
 * any port count (1.1: 1- and 2-port records on one line, 2-port order N11 N21 N12 N22; 3 or more ports
 * wrap, each frequency starting on a new line); 2.0 keywords [Version], [Number of Ports],
 * [Two-Port Data Order], [Number of Frequencies], [Number of Noise Frequencies], [Reference],
 * [Matrix Format] Full/Lower/Upper, [Begin Information]/[End Information], [Network Data], [Noise Data],
 * [End]. Noise data (1.1: the 2-port lines after the frequency first decreases; 2.0: [Noise Data]) is
 * checked and returned as `noise` (engine/touchstone/noise.ts). Refused with a TouchstoneError naming the line: G and H data, [Mixed-Mode Order],
 * non-increasing frequencies, malformed or non-finite numbers, short or long records, port counts above
 * `maxPorts`, binary content, a missing option line, a frequency count that differs from
 * [Number of Frequencies], and texts above `maxBytes`. Time is linear in the text length.
 *
 * @example
 * const t = parseTouchstone("# MHz S RI R 50\n100 0.5 0\n200 0.25 -0.25\n", { name: "load.s1p" });
 * t.frequencies; // Float64Array [1e8, 2e8]
 * t.s.data;      // Float64Array [0.5, 0, 0.25, -0.25]
 */
export function parseTouchstone(text: string, opts: ParseOptions = {}): TouchstoneData {
  return new Reader(text, opts).read();
}

class Reader {
  private readonly text: string;
  private readonly name: string;
  private readonly maxPorts: number;
  private readonly maxBytes: number;
  private readonly callerPorts: number | null;

  private version: "1.1" | "2.0" = "1.1";
  private versionSeen = false;
  private sawContent = false;
  private ports: number | null = null;
  private portsLine = 0;

  private optionLine: number | null = null;
  private unit: FrequencyUnit = "GHz";
  private unitExp = 9;
  private parameter: "S" | "Y" | "Z" = "S";
  private format: DataFormat = "MA";
  private resistance: number[] = [50];

  private twoPortOrder: "12_21" | "21_12" | null = null;
  private declaredFreqs: number | null = null;
  private declaredFreqsLine = 0;
  private reference: number[] | null = null;
  private referenceLine = 0;
  private matrixFormat: "full" | "lower" | "upper" = "full";

  private section: Section = "header";
  private readonly comments: string[] = [];

  // network data
  private recLen = 0;
  private recPos = 0;
  private values = new Float64Array(1024);
  private nValues = 0;
  /** frequencies in Hz, converted exactly from the text */
  private readonly freqs: number[] = [];
  private lastFreqText = "";
  private lastFreqValue = -Infinity;
  private readonly recLines: number[] = [];
  private lastDataLine = 0;
  private lastContentLine = 0;

  // noise data
  private noiseLastFreq = -Infinity;
  private noiseLastLine = 0;
  private readonly noiseValues: number[] = [];

  constructor(text: string, opts: ParseOptions) {
    this.text = text;
    this.name = opts.name ?? "touchstone";
    this.maxPorts = opts.maxPorts ?? 64;
    this.maxBytes = opts.maxBytes ?? 20 * 1024 * 1024;
    this.callerPorts = opts.ports ?? null;
  }

  private fail(line: number | null, message: string): never {
    throw new TouchstoneError(this.name, line, message);
  }

  read(): TouchstoneData {
    const text = this.text;
    if (utf8Length(text, this.maxBytes) > this.maxBytes) {
      this.fail(null, `the file is larger than the limit of ${this.maxBytes} bytes`);
    }
    this.ports = this.portsFromCaller();
    const len = text.length;
    let pos = text.charCodeAt(0) === 0xfeff ? 1 : 0;
    let lineNo = 0;
    while (pos <= len && this.section !== "done") {
      lineNo++;
      let end = pos;
      while (end < len) {
        const c = text.charCodeAt(end);
        if (c === 10 || c === 13) break;
        end++;
      }
      this.line(lineNo, pos, end);
      if (end >= len) break;
      pos = end + 1;
      if (text.charCodeAt(end) === 13 && text.charCodeAt(pos) === 10) pos++;
    }
    return this.finish(lineNo);
  }

  private portsFromCaller(): number | null {
    if (this.callerPorts !== null) return this.checkPorts(this.callerPorts, null, "the caller");
    const m = /\.s(\d{1,9})p$/i.exec(this.name);
    if (!m) return null;
    return this.checkPorts(Number(m[1]), null, `the file name "${this.name}"`);
  }

  private checkPorts(n: number, line: number | null, source: string): number {
    if (!Number.isInteger(n) || n < 1) this.fail(line, `${source} gives ${n} ports; expected a whole number of at least 1`);
    if (n > this.maxPorts) {
      this.fail(line, `${source} gives ${n} ports, more than the limit of ${this.maxPorts} ports (maxPorts)`);
    }
    return n;
  }

  private line(lineNo: number, start: number, end: number): void {
    const text = this.text;
    let bang = -1;
    for (let i = start; i < end; i++) {
      const c = text.charCodeAt(i);
      if (c === 33) {
        if (bang < 0) bang = i;
      } else if ((c < 32 && c !== 9 && c !== 11 && c !== 12) || c === 0x7f || c === 0xfffd) {
        this.fail(
          lineNo,
          `binary data (character U+${c.toString(16).toUpperCase().padStart(4, "0")} at column ${i - start + 1}): this is not a Touchstone text file`,
        );
      }
    }
    if (bang >= 0) {
      const comment = text.slice(bang + 1, end).trim();
      if (comment) this.comments.push(comment);
    }
    const content = text.slice(start, bang >= 0 ? bang : end).trim();
    if (content === "") return;
    this.lastContentLine = lineNo;
    if (this.section === "information") {
      if (/^\[\s*end\s+information\s*\]/i.test(content)) this.section = "header";
      return;
    }
    const first = content.charCodeAt(0);
    if (first === 91 /* [ */) this.keyword(lineNo, content);
    else if (first === 35 /* # */) this.option(lineNo, content);
    else this.data(lineNo, content);
    this.sawContent = true;
  }

  // ---------------------------------------------------------------------------------------------
  // Keywords (2.0 only)

  private keyword(lineNo: number, content: string): void {
    const close = content.indexOf("]");
    if (close < 0) this.fail(lineNo, `a keyword starts with "[" but has no closing "]"`);
    const kw = content.slice(1, close).trim().toLowerCase().replace(/\s+/g, " ");
    const arg = content.slice(close + 1).trim();
    if (this.refPending > 0) {
      this.fail(lineNo, `[Reference] on line ${this.referenceLine} needs ${this.ports} values, one per port, but [${kw}] came after ${this.reference!.length}`);
    }
    if (kw === "version") {
      if (this.versionSeen) this.fail(lineNo, `[Version] appears twice`);
      if (this.sawContent) this.fail(lineNo, `[Version] must be the first line that is not a comment (Touchstone 2.0, [Version])`);
      const v = parseDecimal(arg);
      if (!(v >= 2 && v < 3)) this.fail(lineNo, `unsupported version "${clip(arg)}": expected 2.0 (a file without [Version] is read as 1.1)`);
      this.version = "2.0";
      this.versionSeen = true;
      this.ports = null;
      return;
    }
    if (!this.versionSeen) {
      this.fail(lineNo, `keyword [${kw}] belongs to Touchstone 2.0, but the file has no "[Version] 2.0" line before it`);
    }
    const headerOnly = (): void => {
      if (this.section !== "header") this.fail(lineNo, `[${kw}] must come before [Network Data]`);
    };
    switch (kw) {
      case "number of ports": {
        headerOnly();
        if (this.portsLine) this.fail(lineNo, `[Number of Ports] appears twice (first on line ${this.portsLine})`);
        const n = this.integer(lineNo, arg, kw);
        this.checkPorts(n, lineNo, "[Number of Ports]");
        if (this.callerPorts !== null && this.callerPorts !== n) {
          this.fail(lineNo, `[Number of Ports] says ${n} but ${this.callerPorts} ports were expected`);
        }
        this.ports = n;
        this.portsLine = lineNo;
        return;
      }
      case "two-port data order": {
        headerOnly();
        this.needPorts(lineNo, kw);
        if (this.ports !== 2) this.fail(lineNo, `[Two-Port Data Order] is only allowed in 2-port files, this one has ${this.ports} ports`);
        if (arg === "12_21" || arg === "21_12") {
          this.twoPortOrder = arg;
          return;
        }
        return this.fail(lineNo, `[Two-Port Data Order] must be 12_21 or 21_12, got "${clip(arg)}"`);
      }
      case "number of frequencies": {
        headerOnly();
        const nf = this.integer(lineNo, arg, kw);
        if (nf < 1) this.fail(lineNo, `[Number of Frequencies] must be at least 1`);
        this.declaredFreqs = nf;
        this.declaredFreqsLine = lineNo;
        return;
      }
      case "number of noise frequencies": {
        headerOnly();
        this.integer(lineNo, arg, kw);
        return;
      }
      case "reference": {
        headerOnly();
        this.needPorts(lineNo, kw);
        this.reference = [];
        this.referenceLine = lineNo;
        this.refPending = this.ports!;
        if (arg) this.referenceValues(lineNo, arg);
        return;
      }
      case "matrix format": {
        headerOnly();
        const f = arg.toLowerCase();
        if (f === "full" || f === "lower" || f === "upper") {
          this.matrixFormat = f;
          return;
        }
        return this.fail(lineNo, `[Matrix Format] must be Full, Lower or Upper, got "${clip(arg)}"`);
      }
      case "mixed-mode order":
        return this.fail(lineNo, `mixed-mode data ([Mixed-Mode Order]) is not supported: convert it to single-ended S-parameters first`);
      case "begin information":
        headerOnly();
        this.section = "information";
        return;
      case "end information":
        return this.fail(lineNo, `[End Information] without [Begin Information]`);
      case "network data":
        headerOnly();
        this.startNetwork(lineNo);
        return;
      case "noise data":
        if (this.section !== "network") this.fail(lineNo, `[Noise Data] must follow the network data`);
        this.endNetwork(lineNo, "[Noise Data]");
        if (this.ports !== 2) this.fail(lineNo, `noise data is only defined for 2-port files`);
        this.section = "noise";
        return;
      case "end":
        if (this.section === "header") this.fail(lineNo, `[End] before any [Network Data]`);
        if (this.section === "network") this.endNetwork(lineNo, "[End]");
        this.section = "done";
        return;
      default:
        return this.fail(lineNo, `unknown keyword [${clip(kw)}]`);
    }
  }

  private refPending = 0;

  private referenceValues(lineNo: number, content: string): void {
    for (const tok of content.split(/\s+/)) {
      const v = parseDecimal(tok);
      if (!(v > 0)) this.fail(lineNo, `[Reference] values must be positive numbers of ohms, got "${clip(tok)}"`);
      if (this.refPending === 0) this.fail(lineNo, `[Reference] has more than ${this.ports} values (one per port)`);
      this.reference!.push(v);
      this.refPending--;
    }
  }

  private needPorts(lineNo: number, kw: string): void {
    if (this.ports === null) this.fail(lineNo, `[${kw}] must come after [Number of Ports]`);
  }

  private integer(lineNo: number, arg: string, kw: string): number {
    if (!/^\d{1,12}$/.test(arg)) this.fail(lineNo, `[${kw}] needs a whole number, got "${clip(arg)}"`);
    return Number(arg);
  }

  // ---------------------------------------------------------------------------------------------
  // Option line

  private option(lineNo: number, content: string): void {
    if (this.optionLine !== null) {
      if (this.version === "2.0") this.fail(lineNo, `a second option line (the first is on line ${this.optionLine})`);
      return; // 1.1: only the first option line counts, later ones are ignored (§ "Option Line")
    }
    if (this.section !== "header") this.fail(lineNo, `the option line must come before the data`);
    const toks = content.slice(1).trim().split(/\s+/).filter((t) => t !== "");
    const seen = new Set<string>();
    const once = (what: string): void => {
      if (seen.has(what)) this.fail(lineNo, `the option line gives the ${what} twice`);
      seen.add(what);
    };
    for (let i = 0; i < toks.length; i++) {
      const t = toks[i].toLowerCase();
      if (t in UNITS) {
        once("frequency unit");
        [this.unit, this.unitExp] = UNITS[t];
      } else if (t === "s" || t === "y" || t === "z") {
        once("parameter");
        this.parameter = t.toUpperCase() as "S" | "Y" | "Z";
      } else if (t === "g" || t === "h") {
        this.fail(lineNo, `${t.toUpperCase()}-parameter data is not supported: only S, Y and Z data can be read`);
      } else if (t === "ri" || t === "ma" || t === "db") {
        once("format");
        this.format = t.toUpperCase() as DataFormat;
      } else if (t === "r") {
        // One value (1.1 and 2.0), or one per port in a 1.1 file: the Touchstone 2.1 specification shows that form
        // as Version 1.1 syntax in its examples (from a public reader's copy of those examples).
        once("reference resistance");
        const rs: number[] = [];
        while (i + 1 < toks.length) {
          const v = parseDecimal(toks[i + 1]);
          if (Number.isNaN(v)) break;
          if (!(v > 0)) this.fail(lineNo, `the reference resistance R must be positive, got ${toks[i + 1]}`);
          rs.push(v);
          i++;
        }
        if (rs.length === 0) this.fail(lineNo, `R on the option line must be followed by the reference resistance in ohms`);
        this.resistance = rs;
      } else {
        this.fail(
          lineNo,
          `unknown option "${clip(toks[i])}": expected a frequency unit (Hz, kHz, MHz, GHz), a parameter (S, Y, Z), ` +
            `a format (RI, MA, DB) or R followed by the reference resistance`,
        );
      }
    }
    this.optionLine = lineNo;
  }

  // ---------------------------------------------------------------------------------------------
  // Data

  private startNetwork(lineNo: number): void {
    if (this.optionLine === null) {
      this.fail(lineNo, `missing option line: expected "# <unit> <parameter> <format> R <ohms>" (for example "# GHz S MA R 50") before the data`);
    }
    if (this.ports === null) {
      if (this.version === "2.0") this.fail(lineNo, `[Number of Ports] is required before [Network Data]`);
      this.fail(lineNo, `cannot tell the port count: name the file with its .sNp extension (for example "part.s2p") or state the number of ports`);
    }
    const n = this.ports;
    if (this.version === "2.0") {
      if (n === 2 && this.twoPortOrder === null && this.matrixFormat === "full") {
        this.fail(lineNo, `a 2-port Touchstone 2.0 file needs [Two-Port Data Order] 12_21 or 21_12 before [Network Data]`);
      }
      if (this.declaredFreqs === null) this.fail(lineNo, `[Number of Frequencies] is required before [Network Data]`);
    } else if (this.resistance.length !== 1 && this.resistance.length !== n) {
      this.fail(this.optionLine, `R gives ${this.resistance.length} values; expected one, or one per port (${n})`);
    }
    if (this.version === "2.0" && this.resistance.length !== 1) {
      this.fail(this.optionLine, `R takes a single value in Touchstone 2.0; per-port values belong in [Reference]`);
    }
    const m = this.matrixFormat === "full" ? n * n : (n * (n + 1)) / 2;
    this.recLen = 1 + 2 * m;
    this.section = "network";
  }

  private data(lineNo: number, content: string): void {
    if (this.refPending > 0) {
      this.referenceValues(lineNo, content);
      return;
    }
    if (this.section === "header") {
      if (this.version === "2.0") this.fail(lineNo, `data found before [Network Data]`);
      this.startNetwork(lineNo);
    }
    const toks = content.split(/\s+/);
    const firstPos = this.recPos;
    if (this.section === "noise") {
      this.noiseLine(lineNo, toks);
      return;
    }
    const n = this.ports!;
    const recLen = this.recLen;
    const oneLine = this.version === "1.1" && n <= 2;
    for (let t = 0; t < toks.length; t++) {
      const tok = toks[t];
      const v = parseDecimal(tok);
      if (Number.isNaN(v)) this.fail(lineNo, `"${clip(tok)}" is not a finite number (value ${t + 1} on the line)`);
      if (this.recPos === 0) {
        if (this.startRecord(lineNo, toks, t, tok, v)) return;
      } else if (this.format === "DB" && this.recPos % 2 === 1 && !Number.isFinite(Math.pow(10, v / 20))) {
        this.fail(lineNo, `magnitude ${clip(tok)} dB is too large: 10^(${clip(tok)}/20) overflows (value ${t + 1} on the line)`);
      }
      this.push(v);
      this.recPos++;
      if (this.recPos === recLen) this.recPos = 0;
    }
    if (this.version === "1.1" && !oneLine) {
      const startsRecord = this.recLines[this.recLines.length - 1] === lineNo;
      const pairs = toks.length - (startsRecord ? 1 : 0);
      if (pairs % 2 !== 0) {
        this.fail(lineNo, `${pairs} values ${startsRecord ? "after the frequency" : "on the line"}: values come in pairs (RI, MA or DB)`);
      }
      this.checkRowStarts(lineNo, firstPos === 0 ? 1 : firstPos, this.recPos === 0 ? recLen : this.recPos);
    }
    this.lastDataLine = lineNo;
  }

  /**
   * 1.1 files of 3 or more ports: each row of the matrix starts on a new line (§ "Network Data", 3-port and larger),
   * wrapped at four pairs per line. A line may hold several whole rows, but no row may start in its middle
   * unless the line both starts and ends on a row boundary: otherwise a short row followed by a long one would
   * keep the value count right and be silently read into the wrong elements.
   * `from` and `to` are the record positions (1 = first value after the frequency) the line covered.
   */
  private checkRowStarts(lineNo: number, from: number, to: number): void {
    const rowLen = 2 * this.ports!;
    const firstInside = from + (rowLen - ((from - 1) % rowLen)); // next row start after `from`
    if (firstInside >= to) return; // the line stays within one row
    if ((from - 1) % rowLen === 0 && (to - 1) % rowLen === 0) return; // whole rows
    const row = (firstInside - 1) / rowLen + 1;
    const startLine = this.recLines[this.recLines.length - 1];
    this.fail(
      lineNo,
      `row ${row} of the matrix of the frequency on line ${startLine} starts in the middle of this line: in a 1.1 file of ` +
        `${this.ports} ports each matrix row (${this.ports} pairs, at most four per line) starts on a new line, so a row before ` +
        `it is short or this line is long`,
    );
  }

  /**
   * The first value of a record: its frequency, checked (position on the line, order, overflow, distinct once in
   * hertz) and converted exactly to hertz. Returns true when the line turned out to start 1.1 noise data instead.
   * Kept out of data()'s loop so that the loop over the values stays small.
   */
  private startRecord(lineNo: number, toks: string[], t: number, tok: string, v: number): boolean {
    const n = this.ports!;
    const recLen = this.recLen;
    const oneLine = this.version === "1.1" && n <= 2;
    if (t !== 0) {
      const startLine = this.recLines[this.recLines.length - 1];
      this.fail(
        lineNo,
        `the data of the frequency on line ${startLine} ended in the middle of this line: each frequency needs ` +
          `${recLen} values (the frequency, then ${plural((recLen - 1) / 2, "complex value")} as pairs) and starts on a new line, ` +
          `so a line from ${startLine} to ${lineNo} has values missing or extra`,
      );
    }
    const prev = this.freqs.length > 0 ? this.freqs[this.freqs.length - 1] : -Infinity;
    // a larger double is a larger decimal; only ties (or a step back) need the exact comparison of the texts
    const increases = this.freqs.length === 0 || v > this.lastFreqValue || compareDecimal(tok, this.lastFreqText) > 0;
    if (this.version === "1.1" && n === 2 && !increases) {
      // 1.1, 2-port: the first frequency that does not increase starts the noise parameters (§ "Noise Parameter Data").
      this.section = "noise";
      this.noiseLine(lineNo, toks);
      return true;
    }
    if (oneLine && toks.length !== recLen) {
      this.fail(
        lineNo,
        `a ${n}-port data line needs ${recLen} values (the frequency, then ${plural((recLen - 1) / 2, "complex value")} as pairs); found ${toks.length}`,
      );
    }
    if (v < 0) this.fail(lineNo, `negative frequency ${tok}`);
    const hz = scaleDecimal(tok, this.unitExp);
    if (!Number.isFinite(hz)) {
      this.fail(lineNo, `frequency ${clip(tok)} ${this.unit} is too large: it overflows when converted to hertz`);
    }
    const prevLine = this.recLines[this.recLines.length - 1];
    if (!increases) {
      this.fail(lineNo, `frequency ${tok} ${this.unit} does not increase on the previous one (line ${prevLine}); frequencies must be in increasing order`);
    }
    if (!(hz > prev)) {
      this.fail(
        lineNo,
        `frequency ${clip(tok)} ${this.unit} and ${clip(this.lastFreqText)} ${this.unit} (line ${prevLine}) are different texts but the same ` +
          `frequency once converted to hertz (${hz} Hz): they are closer than double precision can tell apart`,
      );
    }
    if (this.declaredFreqs !== null && this.freqs.length === this.declaredFreqs) {
      this.fail(lineNo, `more frequencies than the ${this.declaredFreqs} announced by [Number of Frequencies] on line ${this.declaredFreqsLine}`);
    }
    this.freqs.push(hz);
    this.lastFreqText = tok;
    this.lastFreqValue = v;
    this.recLines.push(lineNo);
    return false;
  }

  private push(v: number): void {
    if (this.nValues === this.values.length) {
      const bigger = new Float64Array(this.values.length * 2);
      bigger.set(this.values);
      this.values = bigger;
    }
    this.values[this.nValues++] = v;
  }

  private noiseLine(lineNo: number, toks: string[]): void {
    for (const tok of toks) {
      if (Number.isNaN(parseDecimal(tok))) this.fail(lineNo, `"${clip(tok)}" in the noise data is not a finite number`);
    }
    if (toks.length !== 5) {
      this.fail(
        lineNo,
        `a noise data line needs 5 values (frequency, minimum noise figure in dB, |Γopt|, angle of Γopt, normalised Rn); found ${toks.length}` +
          (this.version === "1.1" ? ` (in a 1.1 2-port file, lines after the frequency first decreases are noise data)` : ""),
      );
    }
    const f = parseDecimal(toks[0]);
    if (!(f > this.noiseLastFreq)) {
      this.fail(lineNo, `noise frequency ${toks[0]} does not increase on the previous one (line ${this.noiseLastLine})`);
    }
    this.noiseLastFreq = f;
    this.noiseLastLine = lineNo;
    for (const tok of toks) this.noiseValues.push(parseDecimal(tok));
  }

  private endNetwork(lineNo: number, what: string): void {
    if (this.recPos !== 0) {
      const startLine = this.recLines[this.recLines.length - 1];
      this.fail(
        this.lastDataLine || lineNo,
        `${what === "end of file" ? "the file ends" : `${what} comes`} in the middle of the data of the frequency on line ${startLine}: ` +
          `${this.recPos} of ${this.recLen} values (the file is truncated or a line is short)`,
      );
    }
    if (this.freqs.length === 0) this.fail(lineNo, `no network data`);
    if (this.declaredFreqs !== null && this.freqs.length !== this.declaredFreqs) {
      this.fail(
        lineNo,
        `[Number of Frequencies] on line ${this.declaredFreqsLine} announces ${this.declaredFreqs} frequencies, but ${this.freqs.length} were found`,
      );
    }
  }

  // ---------------------------------------------------------------------------------------------
  // Result

  private finish(lineCount: number): TouchstoneData {
    const lastLine = this.lastContentLine || lineCount;
    if (this.refPending > 0) {
      this.fail(this.referenceLine, `[Reference] needs ${this.ports} values, one per port; found ${this.reference!.length}`);
    }
    if (this.section === "information") this.fail(lastLine, `[Begin Information] without [End Information]`);
    if (this.section === "header") {
      if (this.optionLine === null && this.version === "1.1") {
        this.fail(lastLine, `missing option line and no data: this does not look like a Touchstone file`);
      }
      this.fail(lastLine, this.version === "2.0" ? `no [Network Data] section` : `no network data`);
    }
    if (this.section === "network") this.endNetwork(lastLine, "end of file");
    const n = this.ports!;
    const nf = this.freqs.length;
    const frequencies = new Float64Array(nf);
    for (let k = 0; k < nf; k++) frequencies[k] = this.freqs[k];

    const z0 = new Float64Array(2 * n);
    for (let i = 0; i < n; i++) {
      z0[2 * i] = this.reference ? this.reference[i] : this.resistance.length === 1 ? this.resistance[0] : this.resistance[i];
    }

    const order: "12_21" | "21_12" = this.version === "1.1" ? "21_12" : (this.twoPortOrder ?? "12_21");
    const [rows, cols, mirror] = elementOrder(n, this.matrixFormat, order);
    const data = new Float64Array(2 * nf * n * n);
    const vals = this.values;
    const m = rows.length;
    const toRad = Math.PI / 180;
    for (let k = 0; k < nf; k++) {
      const base = k * this.recLen + 1;
      const o = k * 2 * n * n;
      for (let p = 0; p < m; p++) {
        const a = vals[base + 2 * p];
        const b = vals[base + 2 * p + 1];
        let re: number;
        let im: number;
        if (this.format === "RI") {
          re = a;
          im = b;
        } else {
          const mag = this.format === "MA" ? a : Math.pow(10, a / 20);
          const ang = b * toRad;
          re = mag * Math.cos(ang);
          im = mag * Math.sin(ang);
        }
        const q = o + 2 * (rows[p] * n + cols[p]);
        data[q] = re;
        data[q + 1] = im;
        if (mirror[p]) {
          const r = o + 2 * (cols[p] * n + rows[p]);
          data[r] = re;
          data[r + 1] = im;
        }
      }
    }
    if (this.parameter !== "S") this.toS(data, n, nf, z0);
    // every value is finite here by the checks above; this guards the promise against a path they missed
    for (let k = 0; k < nf; k++) {
      const o = k * 2 * n * n;
      for (let q = 0; q < 2 * n * n; q++) {
        if (!Number.isFinite(data[o + q])) this.fail(this.recLines[k], `the data of this frequency gives a value that is not finite once converted to S`);
      }
    }

    return {
      version: this.version,
      ports: n,
      frequencies,
      s: { n, nf, data },
      z0,
      parameter: "S",
      comments: this.comments,
      sourceFormat: this.format,
      sourceUnit: this.unit,
      sourceParameter: this.parameter,
      ...(n === 2 ? { twoPortOrder: order } : {}),
      ...(this.noiseValues.length > 0 ? { noise: noiseRowsOf(this.noiseValues, 10 ** this.unitExp, z0[0]) } : {}),
    };
  }

  /**
   * Z or Y to S for real references: S = (Zn + I)⁻¹(Zn − I), S = (I + Yn)⁻¹(I − Yn), with Zn = R^(−1/2) Z R^(−1/2)
   * and Yn = R^(1/2) Y R^(1/2) (Pozar, Microwave Engineering, 4th ed., §4.3, eq. 4.44 in normalised form).
   * In 1.1 files the values are already normalised to R; in 2.0 files they are in ohms or siemens.
   */
  private toS(data: Float64Array, n: number, nf: number, z0: Float64Array): void {
    if (this.version === "1.1" && this.resistance.length > 1) {
      this.fail(this.optionLine, `${this.parameter} data with one R per port is ambiguous in a 1.1 file: give a single R`);
    }
    const isZ = this.parameter === "Z";
    const a = new Float64Array(2 * n * n);
    const b = new Float64Array(2 * n * n);
    const sq = new Float64Array(n);
    for (let i = 0; i < n; i++) sq[i] = Math.sqrt(z0[2 * i]);
    for (let k = 0; k < nf; k++) {
      const o = k * 2 * n * n;
      for (let i = 0; i < n; i++) {
        for (let j = 0; j < n; j++) {
          const q = 2 * (i * n + j);
          let scale = 1;
          if (this.version === "2.0") scale = isZ ? 1 / (sq[i] * sq[j]) : sq[i] * sq[j];
          const xr = data[o + q] * scale;
          const xi = data[o + q + 1] * scale;
          const d = i === j ? 1 : 0;
          // Z: A = Zn + I, B = Zn − I.  Y: A = I + Yn, B = I − Yn.
          a[q] = xr + d;
          a[q + 1] = xi;
          b[q] = isZ ? xr - d : d - xr;
          b[q + 1] = isZ ? xi : -xi;
        }
      }
      if (!solveComplexInPlace(a, b, n, n)) {
        this.fail(this.recLines[k], `the ${this.parameter} data at this frequency cannot be converted to S: ${isZ ? "Z + Z0" : "Y + 1/Z0"} is singular`);
      }
      data.set(b, o);
    }
  }
}

/** Row, column and mirror flag of each stored pair, in file order. */
function elementOrder(n: number, format: "full" | "lower" | "upper", order: "12_21" | "21_12"): [Int32Array, Int32Array, Uint8Array] {
  const m = format === "full" ? n * n : (n * (n + 1)) / 2;
  const rows = new Int32Array(m);
  const cols = new Int32Array(m);
  const mirror = new Uint8Array(m);
  let p = 0;
  for (let i = 0; i < n; i++) {
    const j0 = format === "upper" ? i : 0;
    const j1 = format === "lower" ? i : n - 1;
    for (let j = j0; j <= j1; j++) {
      // 2-port "21_12" (and every 1.1 2-port file) lists N11 N21 N12 N22: column by column.
      const swap = format === "full" && n === 2 && order === "21_12";
      rows[p] = swap ? j : i;
      cols[p] = swap ? i : j;
      mirror[p] = format !== "full" && i !== j ? 1 : 0;
      p++;
    }
  }
  return [rows, cols, mirror];
}

/** UTF-8 length of `text`, counting no further than `limit` + 1. */
function utf8Length(text: string, limit: number): number {
  if (text.length > limit) return text.length;
  if (text.length * 3 <= limit) return text.length;
  let bytes = 0;
  for (let i = 0; i < text.length && bytes <= limit; i++) {
    const c = text.charCodeAt(i);
    bytes += c < 0x80 ? 1 : c < 0x800 ? 2 : c >= 0xd800 && c < 0xe000 ? 2 : 3;
  }
  return bytes;
}

function clip(s: string): string {
  return s.length > 24 ? `${s.slice(0, 24)}…` : s;
}

function plural(k: number, word: string): string {
  return `${k} ${word}${k === 1 ? "" : "s"}`;
}
