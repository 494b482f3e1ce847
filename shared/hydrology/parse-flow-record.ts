/**
 * @module shared/hydrology/parse-flow-record
 * Reads a gauge record (CSV text: a date or date-time column and a discharge column) into
 * readings in m³/s, and reports every row it could not use, with its line number and a plain
 * fix. Nothing is dropped silently: every data row ends up either in `readings` or in
 * `problems`; the caller decides whether to go on.
 */

import { dateOfDayNumber, daysFromCivil, daysInMonth, splitDate, utcMs } from './calendar-days';

/** Units a gauge record can be declared in: cubic metres or cubic feet per second. */
export type FlowUnits = 'm3s' | 'cfs';

/** The accepted unit names. */
export const FLOW_UNITS: readonly FlowUnits[] = ['m3s', 'cfs'];

/**
 * Cubic metres in one cubic foot: 0.3048³ = 0.028316846592 exactly.
 * Source: (a) published: the international foot of 1959 (1 ft = 0.3048 m exactly).
 */
export const CUBIC_METRES_PER_CUBIC_FOOT = 0.028316846592;

/** One reading of a gauge record. */
export interface FlowReading {
  /** The instant, ISO 8601 in UTC, e.g. '2021-03-14T00:00:00.000Z'. */
  time: string;
  /** The calendar date as written in the file (the gauge's own day), 'YYYY-MM-DD'. */
  date: string;
  /** Discharge [m³/s], ≥ 0. */
  discharge: number;
}

/** A data row that could not be used. */
export interface FlowRecordProblem {
  /** 1-based line number in the file. */
  row: number;
  /** The raw text at fault (a field, or the whole line for a wrong column count). */
  value: string;
  /** What is wrong and how to fix it, in plain English. */
  reason: string;
}

/** A run of calendar days with no reading at all. */
export interface FlowRecordGap {
  /** First missing date, 'YYYY-MM-DD'. */
  from: string;
  /** Last missing date, 'YYYY-MM-DD'. */
  to: string;
  /** Number of missing days (≥ 1). */
  missingDays: number;
}

/** The result of {@link parseFlowRecord}. */
export interface ParsedFlowRecord {
  /** Data rows read (header, blank and '#' comment lines excluded). Always readings.length + problems.length. */
  rows: number;
  /** Usable readings, in time order, discharge in m³/s. */
  readings: FlowReading[];
  /** Rows that could not be used, in file order. */
  problems: FlowRecordProblem[];
  /** Whole calendar days with no reading between the first and last reading. */
  gaps: FlowRecordGap[];
  /** 'sub-daily' if any date holds more than one reading, otherwise 'daily'. */
  interval: 'daily' | 'sub-daily';
  /** The header row's column names, or null if the file has no header. */
  header: string[] | null;
}

/** Options of {@link parseFlowRecord}. */
export interface ParseFlowRecordOptions {
  /** Units the discharge column is written in: 'm3s' (m³/s) or 'cfs' (ft³/s, converted to m³/s). */
  units: FlowUnits;
}

const DATE_COLUMN_NAMES = ['datetime', 'timestamp', 'dateandtime', 'date', 'time'];
const DISCHARGE_COLUMN_NAMES = ['discharge', 'flow', 'q', 'streamflow', 'flowrate'];
const DATE_ONLY_PATTERN = /^\d{4}-\d{2}-\d{2}$/;
const NUMBER_PATTERN = /^[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?$/;
const DATE_TIME_PATTERN = /^(\d{4})-(\d{2})-(\d{2})(?:[Tt ](\d{2}):(\d{2})(?::(\d{2})(?:[.,](\d+))?)?\s*(Z|z|[+-]\d{2}(?::?\d{2})?)?)?$/;
const DATE_FORMAT_HINT = 'write dates as YYYY-MM-DD, or date-times as YYYY-MM-DDTHH:MM[:SS] with an optional zone (Z or ±HH:MM)';

/**
 * Parses a gauge record in CSV text.
 *
 * Format: one reading per line, comma-separated (tab or semicolon also accepted when the
 * first line uses them), fields optionally in double quotes. Columns: a date ('YYYY-MM-DD',
 * a daily value) or date-time (ISO 8601 'YYYY-MM-DDTHH:MM[:SS[.sss]]', a space may replace
 * the 'T', optional zone 'Z' or '±HH:MM'), then the discharge. A date-time **without a zone is
 * taken as UTC**; a date alone stands for 00:00 UTC of that day. A header row is optional and
 * recognised when it names a date column (date, datetime, time, timestamp) and a discharge
 * column (discharge, flow, q, streamflow), in any case, with any unit note in brackets
 * ('Discharge (m3/s)'); with a header the columns may be in any order, other columns are
 * ignored, and separate 'date' and 'time' columns are joined. Blank lines and lines starting
 * with '#' are not data rows and are skipped.
 *
 * Each data row is either accepted or reported, with its 1-based line number, when: the
 * column count is wrong, the date is unparseable or not a real date, the discharge is empty,
 * not a number or negative, the time repeats an earlier row (duplicate) or is earlier than
 * the row before it (out of order; rows must run oldest to newest). Whole missing calendar
 * days between readings are reported as `gaps`, not as row problems.
 *
 * Never throws on any text; throws only on bad `units`.
 *
 * @param text - the file's content (a leading byte-order mark is ignored)
 * @param options - { units: 'm3s' | 'cfs' } (ft³/s × 0.028316846592 = m³/s)
 * @returns { rows, readings, problems, gaps, interval, header }
 * @throws RangeError if units is not 'm3s' or 'cfs'
 * @example
 * const r = parseFlowRecord('date,discharge\n2021-01-01,12.5\n2021-01-02,abc\n2021-01-04,9', { units: 'm3s' });
 * // r.rows === 3; r.readings.length === 2
 * // r.problems[0] => { row: 3, value: 'abc', reason: "'abc' is not a number; ..." }
 * // r.gaps => [{ from: '2021-01-03', to: '2021-01-03', missingDays: 1 }]
 * Source: (c) common practice (ISO 8601 dates; CSV); the cubic-foot factor is (a) published:
 * international foot of 1959, 1 ft = 0.3048 m exactly.
 */
export function parseFlowRecord(text: string, options: ParseFlowRecordOptions): ParsedFlowRecord {
  const units = options?.units;
  if (units !== 'm3s' && units !== 'cfs') {
    throw new RangeError(`units must be 'm3s' (cubic metres per second) or 'cfs' (cubic feet per second) (got '${String(units)}')`);
  }
  if (typeof text !== 'string') {
    throw new TypeError(`text must be the CSV file's content as a string (got ${typeof text})`);
  }
  const factor = units === 'cfs' ? CUBIC_METRES_PER_CUBIC_FOOT : 1;
  const lines = text.replace(/^\uFEFF/, '').split(/\r\n|\n|\r/);

  let delimiter: string | null = null;
  let header: string[] | null = null;
  let layout: ColumnLayout = { count: 2, date: 0, time: -1, discharge: 1, names: ['date', 'discharge'] };
  let rows = 0;
  const readings: FlowReading[] = [];
  const readingDays: number[] = [];
  const problems: FlowRecordProblem[] = [];
  const acceptedMs: number[] = [];
  const acceptedRows: number[] = [];
  let lastMs = Number.NEGATIVE_INFINITY;
  let lastRow = 0;
  let lastTime = '';

  for (let i = 0; i < lines.length; i++) {
    const line = lines[i];
    const trimmed = line.trim();
    if (trimmed === '' || trimmed.startsWith('#')) continue;
    if (delimiter === null) {
      delimiter = pickDelimiter(line);
      const fields = splitFields(line, delimiter);
      const found = headerLayout(fields);
      if (found) {
        header = fields;
        layout = found;
        continue;
      }
    }
    const fields = splitFields(line, delimiter);
    if (fields.every((f) => f === '')) continue; // a row of bare separators is a blank line
    rows++;
    const row = i + 1;

    if (fields.length !== layout.count) {
      problems.push({
        row,
        value: line,
        reason:
          `expected ${layout.count} columns (${layout.names.join(', ')}) but found ${fields.length}; ` +
          'check for a missing or extra separator, and write numbers without thousands separators (1234, not 1,234)',
      });
      continue;
    }

    const dateText = layout.time >= 0 ? `${fields[layout.date]}T${fields[layout.time]}` : fields[layout.date];
    const when = parseWhen(dateText);
    if (typeof when === 'string') {
      const looksLikeHeader = rows === 1 && header === null && /[a-z]{2}/i.test(dateText);
      const hint = looksLikeHeader ? "; if this line is a header, name its columns 'date' (or 'datetime') and 'discharge' (or 'flow')" : '';
      problems.push({ row, value: dateText, reason: when + hint });
      continue;
    }

    const raw = fields[layout.discharge];
    if (raw === '') {
      problems.push({
        row,
        value: raw,
        reason:
          'the discharge is empty; fill it in, or delete the row if the gauge has no reading then ' + '(missing days are reported as gaps)',
      });
      continue;
    }
    if (!NUMBER_PATTERN.test(raw) || !Number.isFinite(Number(raw))) {
      problems.push({
        row,
        value: raw,
        reason:
          `'${raw}' is not a number; write the discharge as a plain number such as 12.5 ` +
          '(no units, no thousands separators; put quality flags in a separate column)',
      });
      continue;
    }
    const value = Number(raw);
    if (value < 0) {
      problems.push({
        row,
        value: raw,
        reason: `discharge ${raw} is negative; discharges must be 0 or more, so check the sign or the gauge's flag for this value`,
      });
      continue;
    }

    const earlier = when.ms <= lastMs ? findRow(acceptedMs, acceptedRows, when.ms) : undefined;
    if (earlier !== undefined) {
      problems.push({
        row,
        value: dateText,
        reason: `this time (${when.time}) already appears on row ${earlier}; keep one reading per time and delete the duplicate`,
      });
      continue;
    }
    if (when.ms < lastMs) {
      problems.push({
        row,
        value: dateText,
        reason:
          `this time (${when.time}) is earlier than row ${lastRow} (${lastTime}); ` +
          'rows must run from oldest to newest, so sort the file by date and upload it again',
      });
      continue;
    }

    acceptedMs.push(when.ms);
    acceptedRows.push(row);
    lastMs = when.ms;
    lastRow = row;
    lastTime = when.time;
    readings.push({ time: when.time, date: when.date, discharge: value === 0 ? 0 : value * factor });
    readingDays.push(when.day);
  }

  const { gaps, subDaily } = findGaps(readingDays);
  return { rows, readings, problems, gaps, interval: subDaily ? 'sub-daily' : 'daily', header };
}

/** @private Row of the accepted reading at `ms` (binary search; accepted times increase), or undefined. */
function findRow(times: number[], rows: number[], ms: number): number | undefined {
  let lo = 0;
  let hi = times.length - 1;
  while (lo <= hi) {
    const mid = (lo + hi) >> 1;
    if (times[mid] === ms) return rows[mid];
    if (times[mid] < ms) lo = mid + 1;
    else hi = mid - 1;
  }
  return undefined;
}

/** @private Where the date, time and discharge columns are. */
interface ColumnLayout {
  count: number;
  date: number;
  time: number;
  discharge: number;
  names: string[];
}

/** @private The layout named by a header row, or null if the row is not a recognised header. */
function headerLayout(fields: string[]): ColumnLayout | null {
  const normalised = fields.map((f) =>
    f
      .toLowerCase()
      .replace(/\(.*?\)|\[.*?\]/g, '')
      .replace(/[^a-z]/g, ''),
  );
  let date = -1;
  for (const name of DATE_COLUMN_NAMES) {
    date = normalised.indexOf(name);
    if (date >= 0) break;
  }
  const discharge = normalised.findIndex((n) => DISCHARGE_COLUMN_NAMES.includes(n));
  if (date < 0 || discharge < 0) return null;
  const time = normalised[date] === 'date' ? normalised.indexOf('time') : -1;
  return { count: fields.length, date, time, discharge, names: fields.map((f) => f || '(blank)') };
}

/**
 * Comma unless the line has none and uses tabs or semicolons instead.
 *
 * @example
 * pickDelimiter('date\tflow') // '\t'
 */
export function pickDelimiter(line: string): string {
  if (line.includes(',')) return ',';
  if (line.includes('\t')) return '\t';
  if (line.includes(';')) return ';';
  return ',';
}

/**
 * Splits a CSV line, honouring double quotes ("" inside quotes is a quote); fields trimmed.
 *
 * @example
 * splitFields('2021-01-01,"1 200",A', ',') // ['2021-01-01', '1 200', 'A']
 */
export function splitFields(line: string, delimiter: string): string[] {
  if (!line.includes('"')) return line.split(delimiter).map((f) => f.trim());
  const fields: string[] = [];
  let current = '';
  let quoted = false;
  for (let i = 0; i < line.length; i++) {
    const c = line[i];
    if (quoted) {
      if (c === '"') {
        if (line[i + 1] === '"') {
          current += '"';
          i++;
        } else {
          quoted = false;
        }
      } else {
        current += c;
      }
    } else if (c === '"' && current.trim() === '') {
      quoted = true;
      current = '';
    } else if (c === delimiter) {
      fields.push(current.trim());
      current = '';
    } else {
      current += c;
    }
  }
  fields.push(current.trim());
  return fields;
}

/** @private A parsed instant, or the reason it could not be parsed. */
function parseWhen(text: string): { ms: number; time: string; date: string; day: number } | string {
  if (text.length === 10 && DATE_ONLY_PATTERN.test(text)) {
    // Fast path for daily records: 'YYYY-MM-DD' at 00:00 UTC.
    const year = Number(text.slice(0, 4));
    const month = Number(text.slice(5, 7));
    const dayOfMonth = Number(text.slice(8, 10));
    if (year < 1 || month < 1 || month > 12 || dayOfMonth < 1 || dayOfMonth > daysInMonth(year, month)) {
      return `'${text}' is not a real calendar date (check the month and day); ${DATE_FORMAT_HINT}`;
    }
    const day = daysFromCivil(year, month, dayOfMonth);
    return { ms: day * 86_400_000, time: `${text}T00:00:00.000Z`, date: text, day };
  }
  const m = DATE_TIME_PATTERN.exec(text);
  if (!m) {
    return text === '' ? `the date is empty; ${DATE_FORMAT_HINT}` : `'${text}' is not a date; ${DATE_FORMAT_HINT}`;
  }
  const date = `${m[1]}-${m[2]}-${m[3]}`;
  const parts = splitDate(date);
  if (!parts) return `'${date}' is not a real calendar date (check the month and day); ${DATE_FORMAT_HINT}`;
  const hour = m[4] === undefined ? 0 : Number(m[4]);
  const minute = m[5] === undefined ? 0 : Number(m[5]);
  const second = m[6] === undefined ? 0 : Number(m[6]);
  const fraction = m[7] === undefined ? 0 : Number(`0.${m[7]}`);
  if (hour > 23 || minute > 59 || second > 59) {
    return `'${text}' has an impossible time of day (hours 00–23, minutes and seconds 00–59); ${DATE_FORMAT_HINT}`;
  }
  let offsetMinutes = 0;
  const zone = m[8];
  if (zone !== undefined && zone !== 'Z' && zone !== 'z') {
    const digits = zone.slice(1).replace(':', '');
    const oh = Number(digits.slice(0, 2));
    const om = digits.length > 2 ? Number(digits.slice(2, 4)) : 0;
    if (oh > 18 || om > 59) return `'${text}' has an impossible time-zone offset (at most ±18:00); ${DATE_FORMAT_HINT}`;
    offsetMinutes = (zone[0] === '-' ? -1 : 1) * (oh * 60 + om);
  }
  const ms =
    utcMs(parts.year, parts.month, parts.day, hour, minute, 0) + Math.floor((second + fraction) * 1000 + 1e-6) - offsetMinutes * 60_000;
  if (!Number.isFinite(ms)) return `'${text}' is outside the supported years 0001–9999; ${DATE_FORMAT_HINT}`;
  const iso = new Date(ms).toISOString();
  return { ms, time: iso, date, day: daysFromCivil(parts.year, parts.month, parts.day) };
}

/** @private Missing whole days between readings (given as day numbers), and whether any date has several readings. */
function findGaps(days: number[]): { gaps: FlowRecordGap[]; subDaily: boolean } {
  const gaps: FlowRecordGap[] = [];
  let subDaily = false;
  const seenDays = new Set<number>();
  for (const d of days) {
    if (seenDays.has(d)) subDaily = true;
    seenDays.add(d);
  }
  const distinct = [...seenDays].sort((a, b) => a - b);
  for (let i = 1; i < distinct.length; i++) {
    const missing = distinct[i] - distinct[i - 1] - 1;
    if (missing > 0) {
      gaps.push({ from: dateOfDayNumber(distinct[i - 1] + 1), to: dateOfDayNumber(distinct[i] - 1), missingDays: missing });
    }
  }
  return { gaps, subDaily };
}
