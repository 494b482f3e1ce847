/**
 * @module shared/calibration/monitoring-csv
 * Reads monitoring uploads written as CSV: stations (code, name, longitude/latitude or
 * easting/northing) and samples (station, date-time, salinity, faecal indicator with its unit and
 * method, optional temperature). Every row problem is reported with its row number (the header is
 * row 1), so a user can fix the file. Detection limits ("<2", ">1600") stay censored values, not
 * numbers: the value is the limit and `censored` says on which side the true value lies.
 *
 * Pure and isomorphic (papaparse): text in, plain JSON out; no I/O, clock or randomness.
 */
import Papa from 'papaparse';

/** One problem of an uploaded file. */
export interface RowProblem {
  /** Row number in the file, the header being row 1. */
  readonly row: number;
  /** Column name as written in the file, when one column is at fault. */
  readonly column?: string;
  readonly message: string;
}

/** A station read from CSV, in the file's coordinates. */
export interface StationCsvRow {
  readonly row: number;
  readonly code: string;
  readonly name: string | null;
  /** Longitude or easting. */
  readonly x: number;
  /** Latitude or northing. */
  readonly y: number;
}

/** A sample read from CSV. */
export interface SampleCsvRow {
  readonly row: number;
  readonly stationCode: string;
  /** ISO 8601 instant (UTC). */
  readonly sampledAt: string;
  readonly salinity: number | null;
  /** Count per 100 mL, or the detection limit when censored. */
  readonly indicator: number | null;
  readonly indicatorCensored: 'below' | 'above' | null;
  readonly indicatorName: string;
  readonly indicatorUnit: string;
  readonly method: string | null;
  readonly temperature: number | null;
}

export interface CsvReading<T> {
  readonly rows: T[];
  readonly problems: RowProblem[];
  /** Things worth knowing that did not stop the upload. */
  readonly warnings: string[];
  /** Which column was read for what. */
  readonly columns: Record<string, string>;
}

const norm = (h: string) =>
  h
    .trim()
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '_')
    .replace(/^_|_$/g, '');

function findColumn(headers: string[], candidates: readonly string[]): string | undefined {
  for (const c of candidates) {
    const hit = headers.find((h) => norm(h) === c);
    if (hit !== undefined) return hit;
  }
  return undefined;
}

function parseTable(text: string): { headers: string[]; rows: Record<string, string>[]; problems: RowProblem[] } {
  const parsed = Papa.parse<Record<string, string>>(text.replace(/^\uFEFF/, ''), {
    header: true,
    skipEmptyLines: 'greedy',
    transform: (v) => v.trim(),
  });
  const problems: RowProblem[] = parsed.errors
    .filter((e) => e.code !== 'UndetectableDelimiter')
    .map((e) => ({ row: (e.row ?? 0) + 2, message: `The row could not be read as CSV (${e.message}). Check its quotes and commas.` }));
  return { headers: parsed.meta.fields ?? [], rows: parsed.data, problems };
}

/** A number, or null for an empty cell; undefined when the text is not a number. */
function numberCell(v: string | undefined): number | null | undefined {
  if (v === undefined || v === '') return null;
  const n = Number(v.replace(/,(?=\d{3}\b)/g, ''));
  return Number.isFinite(n) ? n : undefined;
}

const STATION_CODE = ['station_id', 'station', 'station_code', 'code', 'site', 'site_id', 'id'] as const;

/**
 * Reads a stations CSV: a code column (station_id, station, code, site…), an optional name, and
 * longitude/latitude (lon, lng, long, longitude / lat, latitude) or x/y (x, easting / y, northing).
 *
 * @param text - the CSV text
 * @returns rows, problems with row numbers, and which columns were used
 * @example
 * readStationsCsv('station_id,lon,lat\nA,-38.5,41.2').rows[0]; // => { row: 2, code: 'A', name: null, x: -38.5, y: 41.2 }
 * Source: (c) common practice.
 */
export function readStationsCsv(text: string): CsvReading<StationCsvRow> & { projected: boolean } {
  const { headers, rows: raw, problems } = parseTable(text);
  const code = findColumn(headers, STATION_CODE);
  const name = findColumn(headers, ['name', 'station_name', 'site_name', 'description']);
  const lon = findColumn(headers, ['lon', 'lng', 'long', 'longitude']);
  const lat = findColumn(headers, ['lat', 'latitude']);
  const east = findColumn(headers, ['x', 'easting', 'east']);
  const north = findColumn(headers, ['y', 'northing', 'north']);
  const xCol = lon ?? east;
  const yCol = lat ?? north;
  const projected = !lon && !!east;
  if (!code || !xCol || !yCol) {
    const missing = [
      !code && 'a station code (station_id)',
      !xCol && 'longitude (lon) or easting (x)',
      !yCol && 'latitude (lat) or northing (y)',
    ].filter(Boolean);
    return {
      rows: [],
      problems: [{ row: 1, message: `The header lacks ${missing.join(', ')}. Found the columns: ${headers.join(', ') || 'none'}.` }],
      warnings: [],
      columns: {},
      projected,
    };
  }
  const rows: StationCsvRow[] = [];
  const seen = new Map<string, number>();
  raw.forEach((r, i) => {
    const row = i + 2;
    const c = r[code] ?? '';
    if (!c) {
      problems.push({ row, column: code, message: 'The station code is empty.' });
      return;
    }
    if (seen.has(c)) {
      problems.push({ row, column: code, message: `Station ${c} appears twice (also row ${seen.get(c)}). Keep one row per station.` });
      return;
    }
    seen.set(c, row);
    const x = numberCell(r[xCol]);
    const y = numberCell(r[yCol]);
    if (x === undefined || x === null) {
      problems.push({ row, column: xCol, message: `${xCol} “${r[xCol] ?? ''}” is not a number.` });
      return;
    }
    if (y === undefined || y === null) {
      problems.push({ row, column: yCol, message: `${yCol} “${r[yCol] ?? ''}” is not a number.` });
      return;
    }
    if (!projected && (Math.abs(x) > 180 || Math.abs(y) > 90)) {
      problems.push({
        row,
        column: Math.abs(x) > 180 ? xCol : yCol,
        message: `(${x}, ${y}) is not a longitude and latitude; use columns x/y with the coordinate system's EPSG code for projected coordinates.`,
      });
      return;
    }
    rows.push({ row, code: c, name: name ? r[name] || null : null, x, y });
  });
  return { rows, problems, warnings: [], columns: { code, x: xCol, y: yCol, ...(name ? { name } : {}) }, projected };
}

/** Indicator columns, with the indicator each names. */
const INDICATOR_COLUMNS: readonly [string, string][] = [
  ['e_coli_per_100ml', 'E. coli'],
  ['e_coli', 'E. coli'],
  ['ecoli', 'E. coli'],
  ['faecal_coliforms_per_100ml', 'Faecal coliforms'],
  ['faecal_coliforms', 'Faecal coliforms'],
  ['fecal_coliforms', 'Faecal coliforms'],
  ['faecal_coliform', 'Faecal coliforms'],
  ['fecal_coliform', 'Faecal coliforms'],
  ['fc', 'Faecal coliforms'],
  ['enterococci', 'Enterococci'],
  ['indicator', 'E. coli'],
  ['indicator_value', 'E. coli'],
];

/** Normalised method names. */
function methodOf(v: string): string | null | undefined {
  const t = v.trim().toLowerCase();
  if (!t) return null;
  if (t === 'mpn' || t.includes('most probable')) return 'MPN';
  if (t === 'mf' || t.includes('membrane')) return 'MF';
  return undefined;
}

/** Parses an ISO date or date-time; a time without zone is taken as UTC (said in warnings). */
function instantOf(v: string): { iso: string; zoneless: boolean } | null {
  const m = /^(\d{4})-(\d{2})-(\d{2})(?:[T ](\d{2}):(\d{2})(?::(\d{2})(?:\.\d+)?)?)?\s*(Z|[+-]\d{2}:?\d{2})?$/i.exec(v.trim());
  if (!m) return null;
  const [, y, mo, d, h = '00', mi = '00', s = '00', zone] = m;
  const base = `${y}-${mo}-${d}T${h}:${mi}:${s}`;
  const zoned = zone
    ? `${base}${zone.toUpperCase() === 'Z' ? 'Z' : zone.length === 5 ? `${zone.slice(0, 3)}:${zone.slice(3)}` : zone}`
    : `${base}Z`;
  const t = Date.parse(zoned);
  if (!Number.isFinite(t)) return null;
  const back = new Date(Date.parse(`${y}-${mo}-${d}T00:00:00Z`));
  if (back.getUTCMonth() + 1 !== Number(mo) || back.getUTCDate() !== Number(d)) return null;
  return { iso: new Date(t).toISOString(), zoneless: !zone && m[4] !== undefined };
}

/**
 * Reads a samples CSV. Columns (names matched loosely): station (station_id, station, site…),
 * date-time (sampled_at, date_time, datetime, date), salinity, the indicator (e_coli_per_100ml,
 * e_coli, faecal_coliforms, fc, enterococci or indicator; the name comes from the column, or an
 * indicator_name column), optional unit (unit, indicator_unit), method (MPN or MF / membrane
 * filtration) and temperature (temperature, temperature_c, temp). A row needs a salinity or an
 * indicator. Indicator cells may be detection limits: "<2" is censored 'below', ">1600" 'above'.
 *
 * @param text - the CSV text
 * @returns rows, problems (row numbers, header = 1), warnings, the columns used
 * @example
 * readSamplesCsv('station_id,sampled_at,salinity,e_coli_per_100ml,method\nA,2024-01-02T10:00:00Z,31,<2,MPN').rows[0].indicatorCensored; // => 'below'
 * Source: (c) common practice; detection limits as censored values, (c).
 */
export function readSamplesCsv(text: string): CsvReading<SampleCsvRow> {
  const { headers, rows: raw, problems } = parseTable(text);
  const station = findColumn(headers, STATION_CODE);
  const when = findColumn(headers, ['sampled_at', 'date_time', 'datetime', 'sample_time', 'time', 'date']);
  const salinity = findColumn(headers, ['salinity', 'salinity_psu', 'sal']);
  let indicator: string | undefined;
  let indicatorDefault = 'E. coli';
  for (const [c, label] of INDICATOR_COLUMNS) {
    const hit = findColumn(headers, [c]);
    if (hit) {
      indicator = hit;
      indicatorDefault = label;
      break;
    }
  }
  const indicatorNameCol = findColumn(headers, ['indicator_name', 'organism', 'parameter']);
  const unit = findColumn(headers, ['unit', 'indicator_unit', 'units']);
  const method = findColumn(headers, ['method', 'analysis_method', 'test_method']);
  const temperature = findColumn(headers, ['temperature', 'temperature_c', 'temp', 'water_temperature']);
  if (!station || !when || (!salinity && !indicator)) {
    const missing = [
      !station && 'a station column (station_id)',
      !when && 'a date-time column (sampled_at)',
      !salinity && !indicator && 'salinity or an indicator column (e.g. e_coli_per_100ml)',
    ].filter(Boolean);
    return {
      rows: [],
      problems: [{ row: 1, message: `The header lacks ${missing.join(', ')}. Found the columns: ${headers.join(', ') || 'none'}.` }],
      warnings: [],
      columns: {},
    };
  }
  const rows: SampleCsvRow[] = [];
  const seen = new Map<string, number>();
  let zoneless = 0;
  raw.forEach((r, i) => {
    const row = i + 2;
    const before = problems.length;
    const code = r[station] ?? '';
    if (!code) problems.push({ row, column: station, message: 'The station is empty.' });
    const instant = instantOf(r[when] ?? '');
    if (!instant)
      problems.push({
        row,
        column: when,
        message: `“${r[when] ?? ''}” is not a date or date-time; write it as 2024-03-18T10:30:00Z (ISO 8601).`,
      });
    else if (instant.zoneless) zoneless += 1;
    const sal = salinity ? numberCell(r[salinity]) : null;
    if (sal === undefined) problems.push({ row, column: salinity, message: `Salinity “${r[salinity as string]}” is not a number.` });
    else if (sal !== null && (sal < 0 || sal > 45))
      problems.push({ row, column: salinity, message: `Salinity ${sal} is outside 0–45 psu.` });
    let value: number | null = null;
    let censored: 'below' | 'above' | null = null;
    if (indicator) {
      const cell = (r[indicator] ?? '').replace(/\s+/g, '');
      const m = /^(<=?|>=?)?(.*)$/.exec(cell) as RegExpExecArray;
      const n = numberCell(m[2]);
      if (cell === '') value = null;
      else if (n === undefined || n === null)
        problems.push({
          row,
          column: indicator,
          message: `The indicator “${r[indicator]}” is not a count; write a number, or a detection limit such as <2 or >1600.`,
        });
      else if (n < 0) problems.push({ row, column: indicator, message: `The indicator ${n} is negative.` });
      else if (m[1]?.startsWith('<') && n <= 0)
        problems.push({ row, column: indicator, message: `The detection limit ${cell} must be above 0.` });
      else {
        value = n;
        censored = m[1]?.startsWith('<') ? 'below' : m[1]?.startsWith('>') ? 'above' : null;
      }
    }
    if (sal === null && value === null && problems.length === before) {
      problems.push({ row, message: 'The row has neither a salinity nor an indicator value.' });
    }
    const meth = method ? methodOf(r[method] ?? '') : null;
    if (meth === undefined)
      problems.push({
        row,
        column: method,
        message: `Method “${r[method as string]}” is not known; write MPN (most probable number) or MF (membrane filtration).`,
      });
    const temp = temperature ? numberCell(r[temperature]) : null;
    if (temp === undefined)
      problems.push({ row, column: temperature, message: `Temperature “${r[temperature as string]}” is not a number.` });
    else if (temp !== null && (temp < -3 || temp > 45))
      problems.push({ row, column: temperature, message: `Temperature ${temp} °C is outside −3 to 45 °C.` });
    if (problems.length > before || !instant) return;
    const key = `${code}@${instant.iso}`;
    if (seen.has(key)) {
      problems.push({
        row,
        message: `Station ${code} at ${instant.iso} appears twice (also row ${seen.get(key)}). Keep one row per station and time.`,
      });
      return;
    }
    seen.set(key, row);
    const unitText = unit ? r[unit] || null : null;
    rows.push({
      row,
      stationCode: code,
      sampledAt: instant.iso,
      salinity: sal ?? null,
      indicator: value,
      indicatorCensored: censored,
      indicatorName: (indicatorNameCol && r[indicatorNameCol]) || indicatorDefault,
      indicatorUnit: unitText ?? (meth === 'MF' ? 'CFU/100 mL' : meth === 'MPN' ? 'MPN/100 mL' : 'per 100 mL'),
      method: meth ?? null,
      temperature: temp ?? null,
    });
  });
  const warnings = zoneless ? [`${zoneless} date-times had no time zone and were read as UTC.`] : [];
  const columns: Record<string, string> = { station, sampledAt: when };
  if (salinity) columns.salinity = salinity;
  if (indicator) columns.indicator = indicator;
  if (method) columns.method = method;
  if (temperature) columns.temperature = temperature;
  if (unit) columns.unit = unit;
  return { rows, problems: problems.sort((a, b) => a.row - b.row), warnings, columns };
}
