/**
 * @module shared/hydrology/read-flow-source
 * Reads a gauge record as agencies publish it, then hands the chosen columns to parseFlowRecord (which checks
 * every row): a WaterML 2.0 time series (OGC 10-126r4, `wml2:MeasurementTimeseries`, units from the unit of
 * measure, quality and qualifier codes from the point or default metadata) or a CSV / tab-separated export with
 * comment lines (`#`), a header, several columns (the caller picks the date, discharge and quality columns; the
 * reader guesses them), a format line after the header (as in tab-separated agency exports), flows in m³/s or
 * ft³/s. Quality codes are kept per reading; provisional values can be left out. Sub-daily records (with time
 * zones or UTC offsets) are summarised per calendar day as written and can be turned into daily maxima or means.
 *
 * Pure and isomorphic (the XML is parsed with @xmldom/xmldom); throws FlowSourceError on a file that cannot be
 * read at all, otherwise reports row problems as parseFlowRecord does, with the file's own line numbers.
 */
import { DOMParser } from '@xmldom/xmldom';
import {
  CUBIC_METRES_PER_CUBIC_FOOT,
  type FlowReading,
  type FlowUnits,
  type ParsedFlowRecord,
  parseFlowRecord,
  pickDelimiter,
  splitFields,
} from './parse-flow-record';

/** A file that cannot be read as a gauge record at all (the caller answers 422 with the message). */
export class FlowSourceError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'FlowSourceError';
  }
}

/** Options of {@link readFlowSource}. */
export interface FlowSourceOptions {
  /** The discharge units: 'auto' reads them from the file (WaterML unit of measure, or the CSV header), else takes m³/s with a warning. */
  units: FlowUnits | 'auto';
  /** CSV: the date (or date-time) column, by its header name; guessed when absent. */
  dateColumn?: string;
  /** CSV: the discharge column; guessed when absent. */
  dischargeColumn?: string;
  /** CSV: the quality / approval code column; guessed when absent; '' for none. */
  qualityColumn?: string;
  /** Leave out readings whose code says provisional (P, provisional, unchecked…). */
  dropProvisional?: boolean;
  /** Turn a sub-daily record into one reading a day: the day's maximum or mean. */
  daily?: 'max' | 'mean';
}

/** A reading with its quality or approval code, when the file gives one. */
export interface FlowSourceReading extends FlowReading {
  quality?: string;
}

/** One day of a sub-daily record. */
export interface DailySummary {
  /** Calendar day as written in the file (the gauge's own day), 'YYYY-MM-DD'. */
  date: string;
  /** Highest reading of the day [m³/s]. */
  max: number;
  /** Mean of the day's readings [m³/s]. */
  mean: number;
  count: number;
}

/** What {@link readFlowSource} returns. */
export interface FlowSourceResult extends Omit<ParsedFlowRecord, 'readings'> {
  readings: FlowSourceReading[];
  format: 'csv' | 'waterml2';
  /** The units the discharge was read in (converted to m³/s). */
  units: FlowUnits;
  /** One sentence on the units: where they came from and the conversion. */
  unitsNote: string;
  /** CSV columns: every name, and those used (guessed or chosen). Null for WaterML. */
  columns: { names: string[]; date: string; discharge: string; quality: string | null; guessed: boolean } | null;
  /** Quality / approval codes with their counts, in order of first appearance. */
  qualityCodes: { code: string; count: number; provisional: boolean }[];
  /** Readings left out because they were provisional (dropProvisional). */
  droppedProvisional: number;
  /** Per calendar day, for a sub-daily record (null for a daily one). */
  daily: DailySummary[] | null;
  /** How a sub-daily record was turned into daily readings, if it was. */
  aggregated: 'max' | 'mean' | null;
  /** Things to know: other series left out, units that disagree with the choice… */
  warnings: string[];
}

/** Codes that mean "not yet approved" (common practice: P = provisional in agency exports; WaterML 2.0 'unchecked'). */
export function isProvisional(code: string): boolean {
  return /^p$/i.test(code.trim()) || /provisional|unchecked|unverified|unapproved/i.test(code);
}

/** m³/s or ft³/s from a unit text (UCUM codes such as 'm3/s' or '[ft_i]3/s', or header notes such as 'ft³/s', 'cfs'); undefined if neither. */
export function unitsOf(text: string): FlowUnits | undefined {
  const t = text.toLowerCase().replace(/\s+/g, '');
  if (/\[ft_i\]3|\[cft_i\]|ft3|ft³|ft\^3|cfs|cubicf(ee|oo)t|feet3|cusec/.test(t)) return 'cfs';
  if (/m3\/s|m³\/s|m\^3\/s|m3\.s-1|m3s-1|cumec|cubicmet(er|re)s?persecond|m3\/sec|\(m3s\)/.test(t)) return 'm3s';
  return undefined;
}

const UNIT_LABEL: Record<FlowUnits, string> = { m3s: 'm³/s', cfs: 'ft³/s' };

/** A source table: header names and data lines with their 1-based line numbers. */
interface Table {
  names: string[];
  rows: { line: number; fields: string[] }[];
  comments: string[];
}

/**
 * Reads a WaterML 2.0 or CSV gauge record.
 *
 * @param text - the file's text.
 * @param options - units, columns, provisional values, daily aggregation.
 * @returns the readings in m³/s (with quality codes), row problems (file line numbers), gaps, the columns and codes.
 * @throws FlowSourceError when the text is not a record (broken XML, no time series, no date or numeric column,
 *   a unit of measure neither m³/s nor ft³/s). With units 'auto' and no unit in the file, m³/s is assumed and said.
 * @example
 * const r = readFlowSource('# site 0042\ndate,flow (ft3/s),qual\n2021-01-01,100,A\n', { units: 'auto' });
 * r.readings[0].discharge // 2.8316846592 (100 ft³/s × 0.028316846592)
 * r.readings[0].quality // 'A'
 */
export function readFlowSource(text: string, options: FlowSourceOptions): FlowSourceResult {
  const body = text.replace(/^\uFEFF/, '');
  const warnings: string[] = [];
  let table: Table;
  let format: FlowSourceResult['format'];
  let fileUnits: { units: FlowUnits; from: string } | undefined;
  let columns: FlowSourceResult['columns'] = null;
  let dateIdx: number;
  let timeIdx = -1;
  let qIdx: number;
  let qualIdx: number;
  if (body.trimStart().startsWith('<')) {
    format = 'waterml2';
    const w = readWaterMl(body, warnings);
    table = w.table;
    fileUnits = w.units;
    [dateIdx, qIdx, qualIdx] = [0, 1, 2];
  } else {
    format = 'csv';
    table = readTable(body);
    const picked = pickColumns(table, options);
    ({ date: dateIdx, time: timeIdx, discharge: qIdx, quality: qualIdx } = picked);
    columns = {
      names: table.names,
      date: table.names[dateIdx],
      discharge: table.names[qIdx],
      quality: qualIdx >= 0 ? table.names[qualIdx] : null,
      guessed: picked.guessed,
    };
    const fromHeader = unitsOf(table.names[qIdx]);
    const fromComments = table.comments.map((c) => ({ c, u: unitsOf(c) })).find((x) => x.u);
    if (fromHeader) fileUnits = { units: fromHeader, from: `the column name “${table.names[qIdx]}”` };
    else if (fromComments?.u) fileUnits = { units: fromComments.u, from: `the comment “${fromComments.c.trim().slice(0, 80)}”` };
  }

  let units: FlowUnits;
  let unitsNote: string;
  if (options.units === 'auto') {
    if (fileUnits) {
      units = fileUnits.units;
      unitsNote = `Flows read in ${UNIT_LABEL[units]} (from ${fileUnits.from})`;
    } else {
      // Common practice: a record that names no unit is in SI units; said plainly so a ft³/s file is caught.
      units = 'm3s';
      unitsNote = 'Flows taken as m³/s: the file does not name its units (choose ft³/s if they are cubic feet per second)';
      warnings.push(
        `The file does not say whether the flows are in m³/s or ft³/s${columns ? ` (the column “${columns.discharge}” names no unit)` : ''}; they were taken as m³/s. If they are ft³/s, choose that unit and upload again.`,
      );
    }
  } else {
    units = options.units;
    unitsNote = `Flows read in ${UNIT_LABEL[units]} (as chosen)`;
    if (fileUnits && fileUnits.units !== units) {
      if (format === 'waterml2') {
        // WaterML states its unit of measure: the file is right.
        units = fileUnits.units;
        unitsNote = `Flows read in ${UNIT_LABEL[units]} (from ${fileUnits.from})`;
        warnings.push(`You chose ${UNIT_LABEL[options.units]}, but the time series says ${UNIT_LABEL[units]}; the file's unit of measure was used.`);
      } else {
        warnings.push(`You chose ${UNIT_LABEL[units]}, but ${fileUnits.from} suggests ${UNIT_LABEL[fileUnits.units]}. Check the units: a wrong choice scales every flow by 35.3.`);
      }
    }
  }
  unitsNote += units === 'cfs' ? ` and converted to m³/s (1 ft³ = ${CUBIC_METRES_PER_CUBIC_FOOT} m³, exact by the international foot).` : '.';

  // The rows handed to parseFlowRecord keep the file's line numbers: other lines become '#' comments.
  const lineCount = Math.max(0, ...table.rows.map((r) => r.line));
  const lines: string[] = new Array(lineCount).fill('#');
  const quality = new Map<number, string>();
  const counts = new Map<string, number>();
  let droppedProvisional = 0;
  const dataLines: number[] = [];
  for (const r of table.rows) {
    const code = qualIdx >= 0 ? (r.fields[qualIdx] ?? '').trim() : '';
    if (code) counts.set(code, (counts.get(code) ?? 0) + 1);
    if (code && options.dropProvisional && isProvisional(code)) {
      droppedProvisional++;
      continue;
    }
    const when = timeIdx >= 0 ? `${r.fields[dateIdx] ?? ''}T${r.fields[timeIdx] ?? ''}` : (r.fields[dateIdx] ?? '');
    const value = (r.fields[qIdx] ?? '').replace(/,/g, '§'); // a comma inside a number is reported, not split
    lines[r.line - 1] = `${csvSafe(when)},${csvSafe(value).replace(/§/g, ',')}`;
    if (code) quality.set(r.line, code);
    dataLines.push(r.line);
  }
  const parsed = parseFlowRecord(lines.join('\n'), { units });
  const problemRows = new Set(parsed.problems.map((p) => p.row));
  const accepted = dataLines.filter((l) => !problemRows.has(l));
  let readings: FlowSourceReading[] = parsed.readings.map((r, i) => {
    const code = quality.get(accepted[i]);
    return code ? { ...r, quality: code } : r;
  });

  let daily: DailySummary[] | null = null;
  let aggregated: FlowSourceResult['aggregated'] = null;
  let interval = parsed.interval;
  if (parsed.interval === 'sub-daily') {
    const byDay = new Map<string, FlowSourceReading[]>();
    for (const r of readings) {
      if (!byDay.has(r.date)) byDay.set(r.date, []);
      byDay.get(r.date)!.push(r);
    }
    daily = [...byDay].map(([date, rs]) => ({
      date,
      max: Math.max(...rs.map((r) => r.discharge)),
      mean: rs.reduce((s, r) => s + r.discharge, 0) / rs.length,
      count: rs.length,
    }));
    if (options.daily) {
      aggregated = options.daily;
      readings = daily.map((d) => {
        const codes = [...new Set(byDay.get(d.date)!.map((r) => r.quality).filter((c): c is string => Boolean(c)))];
        return {
          time: `${d.date}T00:00:00.000Z`,
          date: d.date,
          discharge: options.daily === 'max' ? d.max : d.mean,
          ...(codes.length ? { quality: codes.join('/') } : {}),
        };
      });
      interval = 'daily';
    }
  }
  return {
    ...parsed,
    interval,
    readings,
    format,
    units,
    unitsNote,
    columns,
    qualityCodes: [...counts].map(([code, count]) => ({ code, count, provisional: isProvisional(code) })),
    droppedProvisional,
    daily,
    aggregated,
    warnings,
  };
}

const csvSafe = (s: string) => s.replace(/[\r\n]/g, ' ').trim();

/** Comment lines, the header, an optional format line, and the data lines of a delimited text. */
function readTable(text: string): Table {
  const all = text.split(/\r\n|\n|\r/);
  const comments: string[] = [];
  let delimiter: string | null = null;
  let names: string[] | null = null;
  const rows: Table['rows'] = [];
  for (let i = 0; i < all.length; i++) {
    const line = all[i];
    const trimmed = line.trim();
    if (trimmed === '') continue;
    if (trimmed.startsWith('#')) {
      comments.push(trimmed.slice(1));
      continue;
    }
    if (delimiter === null) {
      delimiter = pickDelimiter(line);
      const fields = splitFields(line, delimiter);
      if (looksLikeHeader(fields)) {
        names = fields.map((f, k) => f || `column ${k + 1}`);
        continue;
      }
      names = fields.map((_, k) => `column ${k + 1}`);
    }
    const fields = splitFields(line, delimiter);
    // A format line under the header (e.g. "20d 6s 14n 10s" in tab-separated agency exports) is not data.
    if (rows.length === 0 && fields.every((f) => /^\d+[sdnt]$/.test(f))) continue;
    rows.push({ line: i + 1, fields });
  }
  if (!names || rows.length === 0) throw new FlowSourceError('The file holds no data rows: it needs a date column and a flow column, one reading per line.');
  return { names, rows, comments };
}

/** A first line is a header when none of its fields is a date or a number. */
function looksLikeHeader(fields: string[]): boolean {
  return fields.every((f) => !/^\d{4}-\d{2}-\d{2}/.test(f) && !/^[+-]?\d+(\.\d*)?$/.test(f));
}

const DATE_NAME = /^(date|datetime|date[ _-]?time|time[ _-]?stamp|timestamp|time|datum|dt|obs(ervation)?[ _-]?(date|time))\b/i;
const QUALITY_NAME = /qual|approv|grade|flag|status|qualifier|code|_cd$/i;
const DISCHARGE_NAME = /discharge|flow|débit|debit|^q\b|^q[ _(]|cfs|cumec|m3\/s|m³\/s|ft3\/s|ft³\/s|value/i;

/** The date, time, discharge and quality columns: the chosen ones, or guessed from names and the first rows. */
function pickColumns(table: Table, options: FlowSourceOptions): { date: number; time: number; discharge: number; quality: number; guessed: boolean } {
  const { names, rows } = table;
  const find = (name: string | undefined, role: string) => {
    if (name === undefined) return undefined;
    const i = names.indexOf(name);
    if (i < 0) throw new FlowSourceError(`The file has no column “${name}” for the ${role}. Its columns are: ${names.map((n) => `“${n}”`).join(', ')}.`);
    return i;
  };
  const sample = rows.slice(0, 20);
  const isDateCol = (k: number) => sample.some((r) => /^\d{4}-\d{2}-\d{2}/.test(r.fields[k] ?? ''));
  const isNumberCol = (k: number) => sample.filter((r) => /^[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$/.test(r.fields[k] ?? '')).length >= Math.max(1, sample.length / 2);
  const idx = names.map((_, k) => k);

  const chosenDate = find(options.dateColumn, 'date');
  const date = chosenDate ?? idx.find((k) => DATE_NAME.test(names[k]) && isDateCol(k)) ?? idx.find(isDateCol);
  if (date === undefined) {
    throw new FlowSourceError(`No column holds dates written YYYY-MM-DD (columns: ${names.map((n) => `“${n}”`).join(', ')}). Choose the date column, or write dates as YYYY-MM-DD.`);
  }
  // A separate time column beside a date-only column.
  const timeCol = idx.find((k) => k !== date && /^time$/i.test(names[k]) && sample.some((r) => /^\d{1,2}:\d{2}/.test(r.fields[k] ?? '')));
  const time = timeCol !== undefined && /^date$/i.test(names[date]) ? timeCol : -1;
  const chosenQ = find(options.dischargeColumn, 'flow');
  const discharge =
    chosenQ ??
    idx.find((k) => k !== date && k !== time && DISCHARGE_NAME.test(names[k]) && !QUALITY_NAME.test(names[k]) && isNumberCol(k)) ??
    idx.find((k) => k !== date && k !== time && isNumberCol(k) && !/^(agency|site|station|id|no)/i.test(names[k]));
  if (discharge === undefined) {
    throw new FlowSourceError(`No column holds flows as numbers (columns: ${names.map((n) => `“${n}”`).join(', ')}). Choose the flow column.`);
  }
  let quality = -1;
  if (options.qualityColumn === '') quality = -1;
  else if (options.qualityColumn !== undefined) quality = find(options.qualityColumn, 'quality code')!;
  else {
    quality =
      idx.find((k) => k !== date && k !== discharge && k !== time && QUALITY_NAME.test(names[k]) && !/^(agency|site|station|tz)/i.test(names[k]) && !isNumberCol(k)) ??
      // The column right after the flow, when it holds short letter codes (A, P, e…).
      (discharge + 1 < names.length && sample.every((r) => /^[A-Za-z:<>*]{0,6}$/.test(r.fields[discharge + 1] ?? '')) && sample.some((r) => (r.fields[discharge + 1] ?? '') !== '')
        ? discharge + 1
        : -1);
  }
  return { date, time, discharge, quality, guessed: chosenDate === undefined || chosenQ === undefined };
}

/** WaterML 2.0: the first MeasurementTimeseries as a table (time, value, quality), and its unit of measure. */
function readWaterMl(text: string, warnings: string[]): { table: Table; units?: { units: FlowUnits; from: string } } {
  let doc: ReturnType<DOMParser['parseFromString']>;
  try {
    doc = new DOMParser({
      onError: (level, message) => {
        if (level !== 'warning') throw new Error(message);
      },
    }).parseFromString(text, 'text/xml');
  } catch (err) {
    throw new FlowSourceError(
      `The file starts like XML but is not well-formed (${(err instanceof Error ? err.message : String(err)).split('\n')[0]}). Download the WaterML 2.0 file again.`,
    );
  }
  const byName = (el: { getElementsByTagNameNS(ns: string, n: string): ArrayLike<Element1> }, name: string): Element1[] => Array.from(el.getElementsByTagNameNS('*', name));
  const series = byName(doc as never, 'MeasurementTimeseries');
  if (series.length === 0) {
    throw new FlowSourceError(
      'The XML holds no WaterML 2.0 time series (wml2:MeasurementTimeseries). Download the record as WaterML 2.0, or as CSV with a date and a flow column.',
    );
  }
  if (series.length > 1) warnings.push(`The file holds ${series.length} time series; the first (${series[0].getAttribute('gml:id') ?? 'unnamed'}) was read.`);
  const ts = series[0];
  const defaults = byName(ts, 'DefaultTVPMeasurementMetadata')[0];
  const codeOf = (meta: Element1 | undefined) => {
    if (!meta) return '';
    const parts: string[] = [];
    for (const tag of ['quality', 'qualifier']) {
      for (const q of byName(meta, tag)) {
        const v = q.getAttribute('xlink:title') || (q.getAttribute('xlink:href') ?? '').split('/').pop() || q.textContent?.trim() || '';
        if (v) parts.push(v);
      }
    }
    return parts.join(' ');
  };
  const defaultCode = codeOf(defaults);
  const uomEl = defaults ? byName(defaults, 'uom')[0] : undefined;
  const uom = uomEl?.getAttribute('code') || uomEl?.getAttribute('xlink:title') || '';
  let units: { units: FlowUnits; from: string } | undefined;
  if (uom) {
    const u = unitsOf(uom);
    if (!u) throw new FlowSourceError(`The time series' unit of measure is “${uom}”; Brackline reads flows in m³/s or ft³/s. Download the record in one of those.`);
    units = { units: u, from: `the unit of measure “${uom}”` };
  }
  const rows: Table['rows'] = [];
  byName(ts, 'MeasurementTVP').forEach((tvp, i) => {
    const time = byName(tvp, 'time')[0]?.textContent?.trim() ?? '';
    const valueEl = byName(tvp, 'value')[0];
    const nil = valueEl?.getAttribute('xsi:nil') === 'true';
    const value = nil ? '' : (valueEl?.textContent?.trim() ?? '');
    const code = codeOf(byName(tvp, 'TVPMeasurementMetadata')[0]) || defaultCode;
    // Line numbers count points: point 1 is "row 2", as if a header came first.
    rows.push({ line: i + 2, fields: [time, value, code] });
  });
  if (rows.length === 0) throw new FlowSourceError('The WaterML time series holds no points (wml2:MeasurementTVP).');
  return { table: { names: ['time', 'value', 'quality'], rows, comments: [] }, units };
}

/** The DOM element API used here (xmldom's Element). */
interface Element1 {
  getAttribute(name: string): string | null;
  getElementsByTagNameNS(ns: string, name: string): ArrayLike<Element1>;
  textContent: string | null;
}
