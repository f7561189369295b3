import { CoreError } from '../../errors.ts';
import { parseUnit, splitNameAndUnit } from './units.ts';

/**
 * Oscilloscope CSV exports, read into SI base units.
 *
 * Scope vendors all write "some metadata, maybe a header, then rows of
 * numbers", with variations in the separator, the decimal mark, where units
 * go and how metadata sits. The reader therefore learns the layout from the
 * data itself rather than from a vendor list:
 *  1. the last non-blank lines (always data) give the separator (tab, then
 *     semicolon, then comma, the first present on every one of them) and the
 *     columns that hold numbers;
 *  2. the first line whose data columns all parse as numbers starts the data;
 *     the lines before it are metadata ("key,value[,unit]") and up to two
 *     header rows right above the data: column names, then optionally a row
 *     of unit words ("second,Volt,Volt");
 *  3. data rows are parsed straight into growing Float64Arrays.
 * Decimal commas are accepted when the separator is not a comma. Units in the
 * header ("Time (us)", "CH1 [mV]") or units row are converted to s and V.
 */
export interface CaptureChannel {
  name: string;
  /** Base unit after conversion ('V', 'A'), or the label as written when unknown. */
  unit?: string;
  values: Float64Array;
}

export interface ParsedCapture {
  /** From metadata ("Sample Interval", "Sample Rate"...), s. */
  sampleIntervalS?: number;
  /** The time column, s, when the file has one. */
  timeS?: Float64Array;
  channels: CaptureChannel[];
  /** What the reader noticed and assumed, one sentence each. */
  notes: string[];
}

export interface ParseCaptureCsvOptions {
  /**
   * Largest share of data lines that may fail to parse and be dropped
   * (default 0.001). Only with a time column: without one a dropped row would
   * shift every later sample. Lines after the last good row (a footer, a
   * truncated last line) are always dropped with a note.
   */
  maxBadLineFraction?: number;
}

type Separator = '\t' | ';' | ',' | null;

const NUMBER_PATTERN = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;
const TAIL_SAMPLE_LINES = 32;
const TIME_NAME_PATTERN = /^(time|t|x|x-axis|xaxis|sec|secs|seconds?|horizontal)$/i;
const INTERVAL_KEY_PATTERN =
  /^(sample[\s_-]*interval|sampling[\s_-]*interval|sample[\s_-]*period|sampling[\s_-]*period|x[\s_-]*increment|horizontal[\s_-]*resolution|time[\s_-]*per[\s_-]*(point|sample)|dt|delta[\s_-]*t|time[\s_-]*step)\b/i;
const RATE_KEY_PATTERN = /^(sample[\s_-]*rate|sampling[\s_-]*rate|sampling[\s_-]*frequency)\b/i;

function badCapture(message: string, details: Record<string, unknown>): CoreError {
  return new CoreError('bad-capture', message, undefined, details);
}

function cleanField(raw: string): string {
  let f = raw.trim();
  if (f.length >= 2 && f[0] === '"' && f[f.length - 1] === '"') f = f.slice(1, -1).trim();
  return f;
}

function splitFields(line: string, sep: Separator): string[] {
  if (sep === null) return [cleanField(line)];
  const parts = line.split(sep);
  for (let j = 0; j < parts.length; j++) parts[j] = cleanField(parts[j]);
  return parts;
}

function makeNumberParser(decimalComma: boolean): (field: string) => number {
  return decimalComma
    ? (f) => {
        const g = f.indexOf(',') >= 0 ? f.replace(',', '.') : f;
        return NUMBER_PATTERN.test(g) ? Number(g) : NaN;
      }
    : (f) => (NUMBER_PATTERN.test(f) ? Number(f) : NaN);
}

/** Characters a data row may hold: digits, signs, exponents, decimal marks, separators, quotes, blanks. */
const PURE_DATA_LINE = /^[\d\s.,;eE+\-"']+$/;
/** How many non-blank lines from the end are searched for pure data rows. */
const TAIL_SEARCH_LINES = 512;

/**
 * Up to `max` of the last lines that hold nothing but numbers and separators
 * (in file order). Metadata, header and footer lines carry letters and are
 * left out, so the layout is learnt from data alone. When no such line exists
 * (every row carries text), the last non-blank lines are returned instead.
 */
function tailLines(text: string, max: number): string[] {
  const pure: string[] = [];
  const any: string[] = [];
  let end = text.length;
  let seen = 0;
  while (end > 0 && pure.length < max && seen < TAIL_SEARCH_LINES) {
    const nl = text.lastIndexOf('\n', end - 1);
    const line = text.slice(nl + 1, end).replace(/\r$/, '');
    if (line.trim() !== '') {
      seen++;
      if (PURE_DATA_LINE.test(line)) pure.push(line);
      else if (any.length < max) any.push(line);
    }
    end = nl < 0 ? 0 : nl;
  }
  return (pure.length > 0 ? pure : any).reverse();
}

function detectSeparator(sample: readonly string[]): Separator {
  for (const sep of ['\t', ';', ','] as const) {
    if (sample.every((l) => l.includes(sep))) return sep;
  }
  return null;
}

class GrowingColumn {
  values: Float64Array;
  length = 0;
  constructor(capacity: number) {
    this.values = new Float64Array(Math.max(16, capacity));
  }
  push(v: number): void {
    if (this.length === this.values.length) {
      const next = new Float64Array(this.values.length * 2);
      next.set(this.values);
      this.values = next;
    }
    this.values[this.length++] = v;
  }
  finish(): Float64Array {
    return this.values.length === this.length ? this.values : this.values.slice(0, this.length);
  }
}

interface Metadata {
  key: string;
  value: number;
  unitLabel?: string;
}

/** "key, value[, unit]" among `fields[from..to)`: first text cell, then the next numeric cell. */
function readMetadata(fields: readonly string[], from: number, to: number, num: (f: string) => number): Metadata | undefined {
  let j = from;
  while (j < to && fields[j] === '') j++;
  if (j >= to || !Number.isNaN(num(fields[j]))) return undefined;
  const key = fields[j];
  let k = j + 1;
  while (k < to && fields[k] === '') k++;
  if (k >= to) return undefined;
  const value = num(fields[k]);
  if (Number.isNaN(value)) return undefined;
  const unitCell = k + 1 < to ? fields[k + 1] : '';
  return unitCell !== '' && parseUnit(unitCell) !== undefined ? { key, value, unitLabel: unitCell } : { key, value };
}

/** Sample interval implied by one metadata entry, s, or undefined. */
function intervalFromMetadata(m: Metadata): number | undefined {
  const { name, unitLabel: inKey } = splitNameAndUnit(m.key);
  const label = m.unitLabel ?? inKey;
  const unit = label === undefined ? undefined : parseUnit(label);
  if (INTERVAL_KEY_PATTERN.test(name)) {
    if (unit !== undefined && unit.base !== 's') return undefined;
    const s = m.value * (unit?.scale ?? 1);
    return s > 0 ? s : undefined;
  }
  if (RATE_KEY_PATTERN.test(name)) {
    if (unit !== undefined && unit.base !== 'Hz') return undefined;
    const hz = m.value * (unit?.scale ?? 1);
    return hz > 0 ? 1 / hz : undefined;
  }
  return undefined;
}

interface BadLine {
  lineNo: number;
  reason: string;
}

export function parseCaptureCsv(text: string, options: ParseCaptureCsvOptions = {}): ParsedCapture {
  const maxBadFraction = options.maxBadLineFraction ?? 0.001;
  const notes: string[] = [];
  const src = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;

  const tail = tailLines(src, TAIL_SAMPLE_LINES);
  if (tail.length === 0) throw badCapture('the CSV is empty', { reason: 'empty' });
  const sep = detectSeparator(tail);
  const tailFields = tail.map((l) => splitFields(l, sep));
  const decimalComma = sep !== ',' && tailFields.some((fs) => fs.some((f) => /^[+-]?\d*,\d+(?:[eE][+-]?\d+)?$/.test(f)));
  const num = makeNumberParser(decimalComma);
  notes.push(
    `separator: ${sep === null ? 'none (one column)' : sep === '\t' ? 'tab' : `'${sep}'`}${decimalComma ? ', decimal comma' : ''}`,
  );

  // Data columns: numeric on at least 3/4 of the tail lines (a footer line may spoil the rest).
  const width = Math.max(...tailFields.map((fs) => fs.length));
  const dataCols: number[] = [];
  for (let j = 0; j < width; j++) {
    let numeric = 0;
    for (const fs of tailFields) if (j < fs.length && !Number.isNaN(num(fs[j]))) numeric++;
    if (numeric >= 0.75 * tailFields.length) dataCols.push(j);
  }
  if (dataCols.length === 0) {
    throw badCapture(`no column of numbers found; last line reads "${tail[tail.length - 1].slice(0, 80)}"`, { reason: 'no-numeric-data' });
  }
  const firstDataCol = dataCols[0];
  const neededFields = dataCols[dataCols.length - 1] + 1;

  // Forward pass.
  const preamble: { lineNo: number; fields: string[] }[] = [];
  const bad: BadLine[] = [];
  let columns: GrowingColumn[] | undefined;
  let dataLineCount = 0;
  let lastGoodLineNo = 0;
  let metadataInRows = 0;
  let sampleIntervalS: number | undefined;
  const metadataNotes: string[] = [];
  const takeMetadata = (m: Metadata, lineNo: number): void => {
    metadataNotes.push(`line ${lineNo}: ${m.key} = ${m.value}${m.unitLabel ? ` ${m.unitLabel}` : ''}`);
    const dt = intervalFromMetadata(m);
    if (dt !== undefined && sampleIntervalS === undefined) sampleIntervalS = dt;
  };
  const estimatedRows = Math.ceil(src.length / Math.max(8, tail.reduce((a, l) => a + l.length + 1, 0) / tail.length)) + 16;

  let pos = 0;
  let lineNo = 0;
  const row = new Float64Array(dataCols.length);
  while (pos <= src.length) {
    let nl = src.indexOf('\n', pos);
    if (nl < 0) nl = src.length;
    let line = src.slice(pos, nl);
    pos = nl + 1;
    lineNo++;
    if (line.endsWith('\r')) line = line.slice(0, -1);
    if (line.trim() === '') {
      if (nl >= src.length) break;
      continue;
    }
    const fields = splitFields(line, sep);
    let reason: string | undefined;
    if (fields.length < neededFields) {
      reason = `expected at least ${neededFields} fields, found ${fields.length}`;
    } else {
      for (let c = 0; c < dataCols.length; c++) {
        const f = fields[dataCols[c]];
        const v = num(f);
        if (Number.isNaN(v)) {
          reason = f === '' ? `field ${dataCols[c] + 1} is empty` : `field ${dataCols[c] + 1} "${f.slice(0, 40)}" is not a number`;
          break;
        }
        row[c] = v;
      }
    }
    if (columns === undefined) {
      if (reason !== undefined) {
        // One-column data still comes with "key,value" metadata: split those lines on their own separator.
        preamble.push({ lineNo, fields: sep === null ? splitFields(line, detectSeparator([line])) : fields });
        if (nl >= src.length) break;
        continue;
      }
      columns = dataCols.map(() => new GrowingColumn(estimatedRows));
    }
    dataLineCount++;
    if (reason !== undefined) {
      bad.push({ lineNo, reason });
    } else {
      for (let c = 0; c < dataCols.length; c++) columns[c].push(row[c]);
      lastGoodLineNo = lineNo;
      // Some exports carry their metadata in the leading columns of the data rows.
      if (firstDataCol > 0 && fields[0] !== '') {
        const m = readMetadata(fields, 0, firstDataCol, num);
        if (m !== undefined) {
          takeMetadata(m, lineNo);
          metadataInRows++;
        }
      }
    }
    if (nl >= src.length) break;
  }
  if (columns === undefined) throw badCapture('no data rows found', { reason: 'no-numeric-data' });
  if (metadataInRows > 0) notes.push(`${metadataInRows} metadata entries read from the leading columns of data rows`);

  // Header rows: the lines right above the data.
  let p = preamble.length - 1;
  let unitRow: string[] | undefined;
  let nameRow: string[] | undefined;
  const cellsAt = (fs: readonly string[]): string[] => dataCols.map((j) => (j < fs.length ? fs[j] : ''));
  if (p >= 0) {
    const cells = cellsAt(preamble[p].fields);
    if (cells.every((c) => c !== '' && parseUnit(c) !== undefined)) {
      unitRow = cells;
      p--;
    }
  }
  if (p >= 0) {
    const fs = preamble[p].fields;
    const cells = cellsAt(fs);
    const looksLikeKeyValue =
      readMetadata(fs, 0, fs.length, num) !== undefined && cells.slice(1).every((c) => !Number.isNaN(num(c))) && Number.isNaN(num(cells[0]));
    const knownKey = looksLikeKeyValue && intervalFromMetadata(readMetadata(fs, 0, fs.length, num)!) !== undefined;
    if (cells.every((c) => c !== '') && !knownKey && (unitRow !== undefined || !looksLikeKeyValue)) {
      nameRow = cells;
      p--;
    }
  }
  for (let q = 0; q <= p; q++) {
    const { lineNo: ln, fields } = preamble[q];
    const m = readMetadata(fields, 0, fields.length, num);
    if (m !== undefined) takeMetadata(m, ln);
    else if (fields.some((f) => f !== '')) metadataNotes.push(`line ${ln}: "${fields.filter((f) => f !== '').join(' ').slice(0, 80)}" (kept as a note)`);
  }
  notes.push(...metadataNotes);

  // Column names and units.
  const split = dataCols.map((_, c) => (nameRow === undefined ? { name: '' } : splitNameAndUnit(nameRow[c])));
  const unitLabels = dataCols.map((_, c) => unitRow?.[c] ?? split[c].unitLabel);
  let timeCol = -1;
  for (let c = 0; c < dataCols.length && timeCol < 0; c++) {
    const unit = unitLabels[c] === undefined ? undefined : parseUnit(unitLabels[c]!);
    if (unit?.base === 's' || (nameRow !== undefined && TIME_NAME_PATTERN.test(split[c].name)) || /^time\b/i.test(split[c].name)) timeCol = c;
  }
  const finished = columns.map((col) => col.finish());
  const rowCount = finished[0].length;
  if (timeCol < 0 && nameRow === undefined && dataCols.length >= 2 && looksLikeTimeColumn(finished[0])) {
    timeCol = 0;
    notes.push('no header: the first column increases evenly and is taken as time in seconds');
  }

  // Bad lines: a footer or a cut-off last line is dropped; rows in the middle only in small number, and only with a time column.
  const trailing = bad.filter((b) => b.lineNo > lastGoodLineNo);
  const inner = bad.filter((b) => b.lineNo <= lastGoodLineNo);
  if (inner.length > 0) {
    const allowed = timeCol >= 0 ? Math.floor(maxBadFraction * dataLineCount) : 0;
    if (inner.length > allowed) {
      const first = inner[0];
      const why =
        timeCol < 0
          ? 'the file has no time column, so dropping a row would shift every later sample'
          : `at most ${allowed} may be dropped`;
      throw badCapture(`line ${first.lineNo}: ${first.reason} (${inner.length} of ${dataLineCount} data lines cannot be read; ${why})`, {
        reason: 'unparseable-lines',
        line: first.lineNo,
        lineReason: first.reason,
        badLineCount: inner.length,
        dataLineCount,
      });
    }
    notes.push(`dropped ${inner.length} unreadable data line(s), first: line ${inner[0].lineNo}: ${inner[0].reason}`);
  }
  if (trailing.length > 0) notes.push(`ignored ${trailing.length} line(s) after the data, first: line ${trailing[0].lineNo}: ${trailing[0].reason}`);
  if (rowCount < 2) throw badCapture(`only ${rowCount} data row(s) found`, { reason: 'too-few-samples' });

  // Scale to base units.
  const result: ParsedCapture = { channels: [], notes };
  let channelNumber = 0;
  for (let c = 0; c < dataCols.length; c++) {
    const label = unitLabels[c];
    const unit = label === undefined ? undefined : parseUnit(label);
    const values = finished[c];
    if (unit !== undefined && unit.scale !== 1) {
      for (let i = 0; i < values.length; i++) values[i] *= unit.scale;
      notes.push(`column ${dataCols[c] + 1}: ${label} converted to ${unit.base}`);
    }
    if (c === timeCol) {
      // A time column whose unit is written but is not a time unit ("(furlongs)", "(Ts)") is refused, never read as seconds.
      const written = label ?? (nameRow === undefined ? undefined : /[([]\s*([^()[\]]+?)\s*[)\]]\s*$/.exec(nameRow[c])?.[1]);
      if (written !== undefined && unit?.base !== 's') {
        throw badCapture(`column ${dataCols[c] + 1} ("${nameRow?.[c] ?? written}") is the time column but its unit "${written}" is not a unit of time (s, ms, us, ns, ps)`, {
          reason: 'bad-time-unit',
          column: dataCols[c] + 1,
          unit: written,
        });
      }
      if (unit === undefined) notes.push(`column ${dataCols[c] + 1} has no unit: time taken as seconds`);
      result.timeS = values;
      continue;
    }
    channelNumber++;
    const name = split[c].name !== '' ? split[c].name : `CH${channelNumber}`;
    const channel: CaptureChannel = { name, values };
    if (unit !== undefined) channel.unit = unit.base;
    else if (label !== undefined) {
      channel.unit = label;
      notes.push(`column ${dataCols[c] + 1}: unit "${label}" not recognised, values kept as written`);
    }
    result.channels.push(channel);
  }
  const seen = new Map<string, number>();
  for (let k = 0; k < result.channels.length; k++) {
    const key = result.channels[k].name.toLowerCase();
    if (seen.has(key)) {
      throw badCapture(`two channel columns are both named "${result.channels[k].name}": rename one so the output and capacitor channels can be told apart`, {
        reason: 'duplicate-channel',
        channel: result.channels[k].name,
      });
    }
    seen.set(key, k);
  }
  if (sampleIntervalS !== undefined) result.sampleIntervalS = sampleIntervalS;
  if (result.channels.length === 0) throw badCapture('the CSV has a time column but no channel', { reason: 'no-channel' });
  return result;
}

/** Strictly increasing with steps within a factor 1.5 of each other (scope time bases are even). */
function looksLikeTimeColumn(col: Float64Array): boolean {
  if (col.length < 3) return false;
  let minStep = Infinity;
  let maxStep = -Infinity;
  for (let i = 1; i < col.length; i++) {
    const d = col[i] - col[i - 1];
    if (!(d > 0)) return false;
    if (d < minStep) minStep = d;
    if (d > maxStep) maxStep = d;
  }
  return maxStep <= 1.5 * minStep;
}
