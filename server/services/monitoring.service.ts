/**
 * Monitoring stations and samples, the comparison of a river's plume with them, and the
 * calibrations that fit and apply the river's mixing length, T90 (and optionally alongshore share
 * and near-field fraction).
 *
 * Who sees what: a station is seen by its uploader, and a regulator's stations by everyone in
 * the regulator's jurisdiction (the authority's monitoring programme); admins see all. Samples go
 * with their station; only the station's uploader adds samples to it. A calibration is seen by
 * whoever ran it and by those who may change the river (its creator, a regulator of its
 * jurisdiction, an admin), who alone may apply or roll it back. Uploads, applies and rollbacks
 * are single transactions with their audit entry.
 */
import { type SQL, sql } from 'drizzle-orm';
import type { Feature, Geometry, Position } from 'geojson';
import {
  type CalibrationObservation,
  compareObservations,
  observationResidual,
  type ObservedValue,
} from '#shared/calibration/fit-parameters';
import { readSamplesCsv, readStationsCsv, type RowProblem } from '#shared/calibration/monitoring-csv';
import {
  type CalibratedValues,
  type CalibrationRiverSettings,
  calibratedValuesOf,
  calibrationCautions,
  fitRiver,
  type PlacedSample,
  predictSample,
  settingsPatchFor,
} from '#shared/calibration/river-calibration';
import { loadCrsCatalogue } from '../lib/crs-catalogue';
import { readGeoPackage } from '#shared/geometry/read-geopackage';
import { readKmlOrGpx } from '#shared/geometry/read-kml-gpx';
import { detectFormat, isKmz } from '#shared/geometry/read-upload';
import { readGeoJson } from '#shared/geometry/read-geojson';
import { readShapefileZip } from '#shared/geometry/read-shapefile-zip';
import { reprojectLayer, toWgs84 } from '#shared/geometry/reproject';
import { isUploadError } from '#shared/geometry/upload-error';
import { resolveUploadLimits } from '#shared/geometry/upload-limits';
import type {
  Calibration,
  CalibrationCreate,
  Comparison,
  ComparisonPoint,
  SampleUploadResult,
  Station,
  StationUploadResult,
} from '#shared/schemas/monitoring';
import { applyRiverDefaults, DEFAULTABLE_FIELDS, type RiverCreate, type RiverSettings } from '#shared/schemas/river';
import type { Database } from '../db/client';
import type { CurrentUser } from '../http/route';
import { AppError, ConflictError, ForbiddenError, NotFoundError, UnprocessableError } from '../lib/errors';
import { openSqlite } from '../lib/sqlite';
import { recordAudit } from './audit.service';
import { type FrameSettings, footprintCoastFrame, placePoints } from './coast-positions';
import { visibleRivers } from './rivers.service';

type Tx = Parameters<Parameters<Database['transaction']>[0]>[0];

/** Stations a user may see (alias st). */
function visibleStations(user: CurrentUser, alias = 'st'): SQL {
  const a = sql.raw(alias);
  if (user.role === 'admin') return sql`true`;
  return sql`(${a}.owner_id = ${user.id} OR (${a}.jurisdiction_id IS NOT NULL AND ${a}.jurisdiction_id = ${user.jurisdictionId}::uuid
             AND EXISTS (SELECT 1 FROM users su WHERE su.id = ${a}.owner_id AND su.role = 'regulator')))`;
}

function uploadProblems(what: string, total: number, problems: RowProblem[]): never {
  const n = new Set(problems.map((p) => p.row)).size;
  throw new UnprocessableError(
    `${n} of ${total} ${what} ${n === 1 ? 'has' : 'have'} problems; nothing was saved. Fix the rows listed and upload the file again.`,
    { problems },
  );
}

type StationRow = {
  id: string;
  code: string;
  name: string | null;
  lon: number;
  lat: number;
  samples: number;
  first_sample: Date | null;
  last_sample: Date | null;
  owner_id: string | null;
};

function toStation(r: StationRow, user: CurrentUser): Station {
  return {
    id: r.id,
    code: r.code,
    name: r.name,
    longitude: Number(r.lon),
    latitude: Number(r.lat),
    samples: Number(r.samples),
    firstSample: r.first_sample ? new Date(r.first_sample).toISOString() : null,
    lastSample: r.last_sample ? new Date(r.last_sample).toISOString() : null,
    mine: r.owner_id === user.id,
  };
}

type RiverRow = {
  id: string;
  name: string;
  jurisdiction_id: string | null;
  owner_id: string | null;
  settings: RiverSettings;
  defaults_used: string[];
};

type MatchedRow = {
  sample_id: string;
  code: string;
  name: string | null;
  sampled_at: Date;
  salinity: number | null;
  indicator: number | null;
  indicator_censored: 'below' | 'above' | null;
  s: number | null;
  x: number | null;
  d: number | null;
  lon: number;
  lat: number;
  flow: number | null;
};

type CalibrationRow = {
  id: string;
  river_id: string;
  created_by: string | null;
  created_at: Date;
  options: Calibration['options'];
  start_values: CalibratedValues;
  fitted_values: CalibratedValues;
  result: {
    fittedNames: string[];
    settingsPatch: Record<string, number>;
    before: Calibration['before'];
    after: Calibration['after'];
    samples: number;
    years: number;
    flowRange: { min: number; max: number };
    converged: boolean;
    cautions: string[];
  };
  status: Calibration['status'];
  previous_values: Record<string, number> | null;
  applied_at: Date | null;
  rolled_back_at: Date | null;
};

/** The observed values of a sample for the calibration core; a zero count becomes "< 1" (c). */
function observationOf(r: Pick<MatchedRow, 'salinity' | 'indicator' | 'indicator_censored'>): CalibrationObservation {
  const salinity: ObservedValue | undefined = r.salinity === null ? undefined : { value: r.salinity };
  let indicator: ObservedValue | undefined;
  if (r.indicator !== null) {
    indicator =
      r.indicator > 0
        ? { value: r.indicator, ...(r.indicator_censored ? { censored: r.indicator_censored } : {}) }
        : { value: 1, censored: 'below' };
  }
  return { ...(salinity ? { salinity } : {}), ...(indicator ? { indicator } : {}) };
}

export function createMonitoringService(deps: { db: Database; onRiverChanged?: (riverId: string) => Promise<void> | void }) {
  const { db } = deps;
  let catalogue: ReturnType<typeof loadCrsCatalogue> | null = null;
  const crsCatalogue = () => {
    catalogue ??= loadCrsCatalogue();
    return catalogue;
  };

  async function listStations(user: CurrentUser, where: SQL = sql`true`): Promise<Station[]> {
    const res = await db.execute<StationRow>(sql`
      SELECT st.id, st.code, st.name, ST_X(st.geom) AS lon, ST_Y(st.geom) AS lat, st.owner_id,
             (SELECT count(*) FROM samples sm WHERE sm.station_id = st.id)::int AS samples,
             (SELECT min(sampled_at) FROM samples sm WHERE sm.station_id = st.id) AS first_sample,
             (SELECT max(sampled_at) FROM samples sm WHERE sm.station_id = st.id) AS last_sample
        FROM stations st WHERE ${visibleStations(user)} AND ${where} ORDER BY st.code, st.created_at`);
    return res.rows.map((r) => toStation(r, user));
  }

  /** Points (code, name, lon, lat) of a shapefile zip or GeoJSON, with problems per feature. */
  function pointsOfFeatures(features: Feature<Geometry>[], problems: RowProblem[]) {
    const out: { row: number; code: string; name: string | null; feature: Feature<Geometry> }[] = [];
    const seen = new Map<string, number>();
    features.forEach((f, i) => {
      const row = i + 1;
      const props = (f.properties ?? {}) as Record<string, unknown>;
      const key = Object.keys(props).find((k) =>
        ['station_id', 'station', 'station_code', 'code', 'site', 'site_id', 'id'].includes(k.toLowerCase()),
      );
      const nameKey = Object.keys(props).find((k) => ['name', 'station_name', 'site_name'].includes(k.toLowerCase()));
      // A KML placemark or GPX waypoint carries its code as its name when it has no code attribute.
      const code = key ? String(props[key] ?? '').trim() : nameKey ? String(props[nameKey] ?? '').trim() : '';
      const g = f.geometry;
      const point =
        g?.type === 'Point'
          ? g
          : g?.type === 'MultiPoint' && g.coordinates.length === 1
            ? { type: 'Point' as const, coordinates: g.coordinates[0] }
            : null;
      if (!point) {
        problems.push({ row, message: `Feature ${row} is a ${g?.type ?? 'feature without geometry'}; stations must be points.` });
        return;
      }
      if (!code) {
        problems.push({ row, message: `Feature ${row} has no station code; give each point a STATION_ID (or code) attribute.` });
        return;
      }
      if (seen.has(code)) {
        problems.push({ row, message: `Station ${code} appears twice (also feature ${seen.get(code)}). Keep one point per station.` });
        return;
      }
      seen.set(code, row);
      out.push({ row, code, name: nameKey ? String(props[nameKey] ?? '').trim() || null : null, feature: { ...f, geometry: point } });
    });
    return out;
  }

  async function uploadStations(
    user: CurrentUser,
    file: { buffer: Buffer; originalname: string },
    epsg?: number,
  ): Promise<StationUploadResult> {
    const bytes = new Uint8Array(file.buffer);
    const limits = resolveUploadLimits();
    const problems: RowProblem[] = [];
    const warnings: string[] = [];
    let stations: { row: number; code: string; name: string | null; lon: number; lat: number }[] = [];
    let format: StationUploadResult['format'];
    let total = 0;
    let kind: ReturnType<typeof detectFormat> | 'csv';
    try {
      kind = /\.csv$/i.test(file.originalname) ? 'csv' : detectFormat(bytes, file.originalname);
    } catch (err) {
      if (isUploadError(err) && bytes.length > 0 && !bytes.slice(0, 512).some((b) => b === 0)) kind = 'csv';
      else if (isUploadError(err))
        throw new AppError(
          err.status,
          err.code,
          `${err.message} Stations may also be a CSV with a station code and longitude/latitude columns.`,
          err.details,
        );
      else throw err;
    }
    try {
      if (kind === 'csv') {
        format = 'csv';
        const csv = readStationsCsv(new TextDecoder().decode(bytes));
        problems.push(...csv.problems);
        total = csv.rows.length + new Set(csv.problems.map((p) => p.row)).size;
        if (csv.projected && epsg === undefined) {
          throw new UnprocessableError(
            `The file gives x/y (${csv.columns.x}, ${csv.columns.y}), not longitude/latitude: choose its coordinate system's EPSG code (epsg) and upload again.`,
          );
        }
        const convert = toWgs84({ epsg: epsg ?? 4326 }, crsCatalogue(), file.originalname);
        for (const r of csv.rows) {
          const [lon, lat] = convert([r.x, r.y]);
          if (!(Number.isFinite(lon) && Number.isFinite(lat) && Math.abs(lon) <= 180 && Math.abs(lat) <= 90)) {
            problems.push({
              row: r.row,
              message: `(${r.x}, ${r.y}) does not convert to a longitude and latitude with EPSG:${epsg ?? 4326}.`,
            });
            continue;
          }
          stations.push({ row: r.row, code: r.code, name: r.name, lon, lat });
        }
      } else {
        let layers: { name: string; crs: { found: boolean; wkt?: string; epsg?: number }; features: Feature<Geometry | null>[] }[];
        if (kind === 'sqlite') {
          format = 'geopackage';
          const gpkg = await readGeoPackage(bytes, file.originalname, openSqlite, limits);
          warnings.push(...gpkg.warnings);
          layers = gpkg.layers;
        } else if (kind === 'xml' || (kind === 'zip' && isKmz(bytes, file.originalname))) {
          // Stations are points: GPX waypoints and KML pins; tracks are not confirmed into areas here.
          const xml = readKmlOrGpx(bytes, file.originalname, 'coast', limits, kind === 'zip');
          format = xml.format;
          warnings.push(...xml.warnings);
          layers = xml.layers;
        } else {
          format = kind === 'zip' ? 'shapefile' : 'geojson';
          layers = kind === 'zip' ? readShapefileZip(bytes, limits).layers : [readGeoJson(bytes, file.originalname, limits).layer];
        }
        const withPoints = layers.filter((l) => l.features.some((f) => f.geometry?.type === 'Point' || f.geometry?.type === 'MultiPoint'));
        const layer = withPoints[0] ?? layers.find((l) => l.features.length > 0) ?? layers[0];
        if (layers.filter((l) => l.features.length > 0).length > 1)
          warnings.push(`The file holds several layers; only “${layer.name}” was read.`);
        total = layer.features.length;
        const points = pointsOfFeatures(layer.features as Feature<Geometry>[], problems);
        if (!layer.crs.found && epsg === undefined) {
          throw new UnprocessableError(
            `${file.originalname} does not say its coordinate system (no usable .prj): choose its EPSG code (epsg) and upload again.`,
          );
        }
        const source = epsg !== undefined ? { epsg } : { wkt: layer.crs.wkt, epsg: layer.crs.epsg };
        const projected = reprojectLayer({ name: layer.name, features: points.map((p) => p.feature) }, source, crsCatalogue());
        stations = points.map((p, i) => {
          const [lon, lat] = (projected[i].geometry as { coordinates: Position }).coordinates;
          return { row: p.row, code: p.code, name: p.name, lon, lat };
        });
        for (const s of stations) {
          if (!(Math.abs(s.lon) <= 180 && Math.abs(s.lat) <= 90))
            problems.push({
              row: s.row,
              message: `Station ${s.code} is at (${s.lon}, ${s.lat}), not a longitude and latitude: check the coordinate system.`,
            });
        }
      }
    } catch (err) {
      if (isUploadError(err)) throw new AppError(err.status, err.code, err.message, err.details);
      throw err;
    }
    if (problems.length) uploadProblems(kind === 'csv' ? 'rows' : 'features', total, problems);
    if (!stations.length) throw new UnprocessableError('The file holds no stations. Add at least one point with a station code.');
    const result = await db.transaction(async (tx) => {
      const res = await tx.execute<{ inserted: boolean }>(sql`
        INSERT INTO stations (code, name, jurisdiction_id, owner_id, geom)
        SELECT x.code, x.name, ${user.jurisdictionId}::uuid, ${user.id}, ST_SetSRID(ST_MakePoint(x.lon, x.lat), 4326)
          FROM jsonb_to_recordset(${JSON.stringify(stations)}::jsonb) AS x(code text, name text, lon double precision, lat double precision)
        ON CONFLICT (owner_id, code) DO UPDATE SET name = COALESCE(EXCLUDED.name, stations.name), geom = EXCLUDED.geom, jurisdiction_id = EXCLUDED.jurisdiction_id
        RETURNING (xmax = 0) AS inserted`);
      const created = res.rows.filter((r) => r.inserted).length;
      await recordAudit(tx, {
        actorId: user.id,
        action: 'stations.upload',
        subjectType: 'station',
        jurisdictionId: user.jurisdictionId,
        after: { file: file.originalname, format, created, updated: res.rows.length - created, codes: stations.map((s) => s.code) },
      });
      return { created, updated: res.rows.length - created };
    });
    const items = await listStations(
      user,
      sql`st.owner_id = ${user.id} AND st.code IN (SELECT jsonb_array_elements_text(${JSON.stringify(stations.map((s) => s.code))}::jsonb))`,
    );
    return { ...result, format, warnings, items };
  }

  async function uploadSamples(user: CurrentUser, file: { buffer: Buffer; originalname: string }): Promise<SampleUploadResult> {
    const bytes = new Uint8Array(file.buffer);
    if (bytes.length === 0) throw new UnprocessableError('The file is empty. Export the samples as CSV and upload again.');
    if (bytes[0] === 0x50 && bytes[1] === 0x4b)
      throw new AppError(
        415,
        'unsupported_media_type',
        'Samples are read from a CSV file (station, date-time, salinity, indicator, method…), not a zip. Export them as CSV.',
      );
    const text = new TextDecoder().decode(bytes);
    const csv = readSamplesCsv(text);
    const problems = [...csv.problems];
    const own = await db.execute<{ id: string; code: string }>(sql`SELECT id, code FROM stations WHERE owner_id = ${user.id}`);
    const byCode = new Map(own.rows.map((r) => [r.code, r.id]));
    for (const r of csv.rows) {
      if (!byCode.has(r.stationCode)) {
        problems.push({
          row: r.row,
          message: `Station ${r.stationCode} is not among your stations. Upload the stations first (or fix the code).`,
        });
      }
    }
    const total = csv.rows.length + new Set(csv.problems.map((p) => p.row)).size;
    if (problems.length)
      uploadProblems(
        'rows',
        total,
        problems.sort((a, b) => a.row - b.row),
      );
    if (!csv.rows.length) throw new UnprocessableError('The file holds no samples. Add rows under the header.');
    const rows = csv.rows.map((r) => ({ ...r, stationId: byCode.get(r.stationCode) }));
    const counts = await db.transaction(async (tx) => {
      const res = await tx.execute<{ inserted: boolean }>(sql`
        INSERT INTO samples (station_id, sampled_at, salinity, indicator, indicator_censored, indicator_name, indicator_unit, method, temperature)
        SELECT x."stationId"::uuid, x."sampledAt", x.salinity, x.indicator, x."indicatorCensored", x."indicatorName", x."indicatorUnit", x.method, x.temperature
          FROM jsonb_to_recordset(${JSON.stringify(rows)}::jsonb)
               AS x("stationId" text, "sampledAt" timestamptz, salinity double precision, indicator double precision, "indicatorCensored" text,
                    "indicatorName" text, "indicatorUnit" text, method text, temperature double precision)
        ON CONFLICT (station_id, sampled_at) DO UPDATE SET salinity = EXCLUDED.salinity, indicator = EXCLUDED.indicator,
          indicator_censored = EXCLUDED.indicator_censored, indicator_name = EXCLUDED.indicator_name, indicator_unit = EXCLUDED.indicator_unit,
          method = EXCLUDED.method, temperature = EXCLUDED.temperature
        RETURNING (xmax = 0) AS inserted`);
      const created = res.rows.filter((r) => r.inserted).length;
      await recordAudit(tx, {
        actorId: user.id,
        action: 'samples.upload',
        subjectType: 'sample',
        jurisdictionId: user.jurisdictionId,
        after: { file: file.originalname, created, updated: res.rows.length - created },
      });
      return { created, updated: res.rows.length - created };
    });
    const times = rows.map((r) => r.sampledAt).sort();
    return {
      ...counts,
      censored: rows.filter((r) => r.indicatorCensored).length,
      stations: new Set(rows.map((r) => r.stationCode)).size,
      firstSample: times[0] ?? null,
      lastSample: times[times.length - 1] ?? null,
      warnings: csv.warnings,
      columns: csv.columns,
    };
  }

  async function listSamples(user: CurrentUser, query: { stationId?: string; limit: number }) {
    const where = query.stationId ? sql`AND st.id = ${query.stationId}::uuid` : sql``;
    const res = await db.execute<Record<string, unknown>>(sql`
      SELECT sm.*, st.code, count(*) OVER ()::int AS total FROM samples sm JOIN stations st ON st.id = sm.station_id
       WHERE ${visibleStations(user)} ${where} ORDER BY sm.sampled_at DESC LIMIT ${query.limit}`);
    return {
      total: (res.rows[0]?.total as number | undefined) ?? 0,
      items: res.rows.map((r) => ({
        id: r.id as string,
        stationCode: r.code as string,
        sampledAt: new Date(r.sampled_at as string).toISOString(),
        salinity: r.salinity as number | null,
        indicator: r.indicator as number | null,
        indicatorCensored: r.indicator_censored as 'below' | 'above' | null,
        indicatorName: r.indicator_name as string,
        indicatorUnit: r.indicator_unit as string,
        method: r.method as string | null,
        temperature: r.temperature as number | null,
      })),
    };
  }

  // ---------------------------------------------------------------------------------------------
  // Matching and comparison

  async function loadRiver(user: CurrentUser, id: string, tx: Tx | Database = db, lock = false): Promise<RiverRow> {
    const visible = user.role === 'admin' ? sql`true` : visibleRivers(user);
    const res = await tx.execute<RiverRow>(
      sql`SELECT r.id, r.name, r.jurisdiction_id, r.owner_id, r.settings, r.defaults_used FROM rivers r WHERE r.id = ${id}::uuid AND ${visible} ${lock ? sql`FOR UPDATE` : sql``}`,
    );
    if (!res.rows[0]) throw new NotFoundError('No river with this id that you can see.');
    return res.rows[0];
  }

  function canEdit(user: CurrentUser, river: Pick<RiverRow, 'owner_id' | 'jurisdiction_id'>) {
    return (
      user.role === 'admin' ||
      river.owner_id === user.id ||
      (user.role === 'regulator' && river.jurisdiction_id !== null && river.jurisdiction_id === user.jurisdictionId)
    );
  }

  /** Samples placed relative to one river: flow over the lag window, alongshore/offshore place, distance from the mouth. */
  async function placeSamples(user: CurrentUser, river: RiverRow, riverId: string, lagDays: number): Promise<MatchedRow[] | null> {
    const fp = await db.execute<{ id: string }>(
      sql`SELECT id FROM footprints WHERE river_id = ${riverId}::uuid AND path IS NOT NULL ORDER BY discharge DESC, created_at DESC LIMIT 1`,
    );
    if (!fp.rows[0]) return null;
    const scope = river.jurisdiction_id
      ? sql`(st.jurisdiction_id = ${river.jurisdiction_id}::uuid OR st.owner_id = ${user.id})`
      : sql`st.owner_id = ${user.id}`;
    const res = await db.execute<MatchedRow>(sql`
      WITH place AS (
        SELECT st.id AS station_id, st.code, st.name,
               ST_LineLocatePoint(f.path, ST_ClosestPoint(f.path, st.geom)) * ST_Length(f.path::geography) AS s,
               ST_Distance(st.geom::geography, f.path::geography) AS x,
               ST_Distance(st.geom::geography, r.mouth::geography) AS d, ST_X(st.geom) AS lon, ST_Y(st.geom) AS lat
          FROM stations st, footprints f, rivers r
         WHERE f.id = ${fp.rows[0].id}::uuid AND r.id = ${riverId}::uuid AND ${visibleStations(user)} AND ${scope})
      SELECT sm.id AS sample_id, p.code, p.name, sm.sampled_at, sm.salinity, sm.indicator, sm.indicator_censored, p.s, p.x, p.d, p.lon, p.lat,
             (SELECT max(fr.discharge) FROM flow_readings fr JOIN flow_records rec ON rec.id = fr.record_id AND rec.active AND rec.river_id = ${riverId}::uuid
               WHERE fr.t >= (date_trunc('day', sm.sampled_at AT TIME ZONE 'UTC') AT TIME ZONE 'UTC') - make_interval(days => ${lagDays}::int)
                 AND fr.t <= sm.sampled_at) AS flow
        FROM samples sm JOIN place p ON p.station_id = sm.station_id
       ORDER BY sm.sampled_at, p.code`);
    // Signed positions: stations up-coast of the mouth keep their distance from it (the bulge's frame).
    const frame = await footprintCoastFrame(db, fp.rows[0].id, river.settings as unknown as FrameSettings);
    if (!frame) return res.rows;
    const placed = placePoints(frame, res.rows.map((r) => ({ lon: r.lon, lat: r.lat, s: r.s, x: r.x })));
    return res.rows.map((r, i) => ({ ...r, s: placed[i].s, x: placed[i].x }));
  }

  interface Matching {
    river: RiverRow;
    points: (ComparisonPoint & { observation: CalibrationObservation })[];
    outside: Comparison['outside'];
    otherRivers: number;
  }

  async function match(user: CurrentUser, riverId: string, lagDays: number): Promise<Matching> {
    const river = await loadRiver(user, riverId);
    const own = await placeSamples(user, river, riverId, lagDays);
    if (!own)
      throw new UnprocessableError(
        `${river.name} has not been screened yet, so its plume's path along the coast is not known. Upload its flow record (which screens it) and try again.`,
      );
    // The jurisdiction's other rivers compete for each sample: it goes to the plume with the most river water there.
    const others = river.jurisdiction_id
      ? (
          await db.execute<RiverRow>(
            sql`SELECT r.id, r.name, r.jurisdiction_id, r.owner_id, r.settings, r.defaults_used FROM rivers r WHERE r.jurisdiction_id = ${river.jurisdiction_id}::uuid AND r.id <> ${riverId}::uuid`,
          )
        ).rows
      : [];
    const otherPhi = new Map<string, number>();
    const otherInside = new Set<string>();
    for (const o of others) {
      const placed = await placeSamples(user, o, o.id, lagDays);
      for (const p of placed ?? []) {
        if (p.flow === null || p.flow <= 0 || p.s === null || p.x === null) continue;
        const phi = predictSample(o.settings as unknown as CalibrationRiverSettings, { flow: p.flow, along: p.s, offshore: p.x });
        otherPhi.set(p.sample_id, Math.max(otherPhi.get(p.sample_id) ?? 0, phi.freshwaterFraction));
        if (phi.inside) otherInside.add(p.sample_id);
      }
    }
    const settings = river.settings as unknown as CalibrationRiverSettings;
    const points: Matching['points'] = [];
    const outside: Comparison['outside'] = [];
    let otherRivers = 0;
    for (const r of own) {
      const base = {
        sampleId: r.sample_id,
        stationCode: r.code,
        stationName: r.name,
        sampledAt: new Date(r.sampled_at).toISOString(),
        observedSalinity: r.salinity,
        observedIndicator: r.indicator,
        indicatorCensored: r.indicator_censored,
      };
      if (r.flow === null || !(r.flow > 0)) {
        outside.push({ ...base, flow: null, reason: `No flow of ${river.name} on record for this date (with a ${lagDays}-day lag).` });
        continue;
      }
      const p = predictSample(settings, { flow: r.flow, along: r.s ?? 0, offshore: r.x ?? 0 });
      const other = otherPhi.get(r.sample_id) ?? 0;
      if (!p.inside && !otherInside.has(r.sample_id)) {
        outside.push({
          ...base,
          flow: r.flow,
          reason: `Outside every river's plume at the day's flow (${Math.round(r.flow)} m³/s of ${river.name}).`,
        });
        continue;
      }
      if (otherInside.has(r.sample_id) && (!p.inside || other > p.freshwaterFraction)) {
        otherRivers += 1;
        continue;
      }
      const observation = observationOf(r);
      points.push({
        ...base,
        flow: r.flow,
        along: r.s ?? 0,
        offshore: r.x ?? 0,
        distanceFromMouth: r.d ?? 0,
        predictedSalinity: p.salinity,
        predictedIndicator: p.indicator,
        freshwaterFraction: p.freshwaterFraction,
        salinityResidual: observation.salinity ? observationResidual(observation.salinity, p.salinity, 'salinity') : null,
        indicatorResidual: observation.indicator ? observationResidual(observation.indicator, p.indicator, 'indicator') : null,
        observation,
      });
    }
    return { river, points, outside, otherRivers };
  }

  function basisOf(points: Matching['points']) {
    const flows = points.map((p) => p.flow);
    return {
      samples: points.length,
      years: new Set(points.map((p) => p.sampledAt.slice(0, 4))).size,
      stations: new Set(points.map((p) => p.stationCode)).size,
      flowMin: flows.length ? Math.min(...flows) : 0,
      flowMax: flows.length ? Math.max(...flows) : 0,
      censored: points.filter((p) => p.indicatorCensored).length,
    };
  }

  async function scenarioFlows(riverId: string) {
    const res = await db.execute<{ name: string; discharge: number }>(
      sql`SELECT name, discharge FROM scenarios WHERE river_id = ${riverId}::uuid ORDER BY discharge`,
    );
    return res.rows;
  }

  async function comparison(user: CurrentUser, riverId: string, lagDays: number): Promise<Comparison> {
    const m = await match(user, riverId, lagDays);
    const settings = m.river.settings as unknown as CalibrationRiverSettings;
    const stats = m.points.length
      ? compareObservations(
          m.points.map((p) => p.observation),
          m.points.map((p) => ({ salinity: p.predictedSalinity, indicator: p.predictedIndicator })),
        )
      : { salinity: emptySkill(), indicator: emptySkill(), n: 0, censored: 0 };
    const basis = basisOf(m.points);
    const cautions = m.points.length
      ? calibrationCautions({ ...basis, scenarioFlows: await scenarioFlows(riverId) })
      : ['No sample lies in this river’s plume yet. Upload stations and samples from its coast to compare the plume with them.'];
    return {
      riverId,
      riverName: m.river.name,
      lagDays,
      values: calibratedValuesOf(settings),
      points: m.points.map(({ observation: _o, ...p }) => p),
      outside: m.outside,
      otherRivers: m.otherRivers,
      stats,
      flowRange: m.points.length ? { min: basis.flowMin, max: basis.flowMax } : null,
      years: basis.years,
      cautions,
    };
  }

  // ---------------------------------------------------------------------------------------------
  // Calibrations

  function toCalibration(r: CalibrationRow, user: CurrentUser, river: Pick<RiverRow, 'owner_id' | 'jurisdiction_id'>): Calibration {
    return {
      id: r.id,
      riverId: r.river_id,
      createdAt: new Date(r.created_at).toISOString(),
      createdBy: r.created_by,
      status: r.status,
      options: r.options,
      fittedNames: r.result.fittedNames,
      start: r.start_values,
      fitted: r.fitted_values,
      settingsPatch: r.result.settingsPatch,
      previous: r.previous_values,
      before: r.result.before,
      after: r.result.after,
      samples: r.result.samples,
      years: r.result.years,
      flowRange: r.result.flowRange,
      converged: r.result.converged,
      cautions: r.result.cautions,
      appliedAt: r.applied_at ? new Date(r.applied_at).toISOString() : null,
      rolledBackAt: r.rolled_back_at ? new Date(r.rolled_back_at).toISOString() : null,
      canApply: canEdit(user, river),
    };
  }

  async function fit(user: CurrentUser, riverId: string, body: CalibrationCreate): Promise<Calibration> {
    const m = await match(user, riverId, body.lagDays);
    if (m.points.length < 3) {
      throw new UnprocessableError(
        `Only ${m.points.length} sample${m.points.length === 1 ? '' : 's'} lie in ${m.river.name}'s plume; a fit needs at least 3 (and 30 to be trusted). Upload more samples.`,
      );
    }
    const settings = m.river.settings as unknown as CalibrationRiverSettings;
    const placed: PlacedSample[] = m.points.map((p) => ({ ...p.observation, flow: p.flow, along: p.along, offshore: p.offshore }));
    const result = fitRiver(settings, placed, {
      fitAlongshoreShare: body.fitAlongshoreShare,
      fitNearFieldFraction: body.fitNearFieldFraction,
      seed: 1,
    });
    const fittedSubset = Object.fromEntries(result.fittedNames.map((n) => [n, result.fitted[n]])) as Partial<CalibratedValues>;
    const settingsPatch = settingsPatchFor(settings, fittedSubset);
    const basis = basisOf(m.points);
    const cautions = calibrationCautions({ ...basis, scenarioFlows: await scenarioFlows(riverId), atBound: result.atBound });
    if (!result.converged) cautions.splice(1, 0, 'The search stopped before it settled: the fitted values may not be the best.');
    const stored = {
      fittedNames: result.fittedNames,
      settingsPatch,
      before: result.before,
      after: result.after,
      samples: basis.samples,
      years: basis.years,
      flowRange: { min: basis.flowMin, max: basis.flowMax },
      converged: result.converged,
      cautions,
    };
    const res = await db.execute<CalibrationRow>(sql`
      INSERT INTO calibrations (river_id, created_by, options, start_values, fitted_values, result)
      VALUES (${riverId}::uuid, ${user.id}, ${JSON.stringify(body)}::jsonb, ${JSON.stringify(result.start)}::jsonb, ${JSON.stringify(result.fitted)}::jsonb, ${JSON.stringify(stored)}::jsonb)
      RETURNING *`);
    return toCalibration(res.rows[0], user, m.river);
  }

  async function list(user: CurrentUser, riverId: string): Promise<Calibration[]> {
    const river = await loadRiver(user, riverId);
    const mineOnly = canEdit(user, river) ? sql`true` : sql`c.created_by = ${user.id}`;
    const res = await db.execute<CalibrationRow>(
      sql`SELECT c.* FROM calibrations c WHERE c.river_id = ${riverId}::uuid AND ${mineOnly} ORDER BY c.created_at DESC`,
    );
    return res.rows.map((r) => toCalibration(r, user, river));
  }

  /** A calibration and its river, for someone who may see it. */
  async function loadCalibration(user: CurrentUser, id: string, tx: Tx | Database = db) {
    const res = await tx.execute<CalibrationRow>(sql`SELECT * FROM calibrations WHERE id = ${id}::uuid`);
    const row = res.rows[0];
    const missing = new NotFoundError('No calibration with this id that you can see.');
    if (!row) throw missing;
    let river: RiverRow;
    try {
      river = await loadRiver(user, row.river_id, tx, true);
    } catch {
      throw missing;
    }
    if (row.created_by !== user.id && !canEdit(user, river)) throw missing;
    return { row, river };
  }

  function requireEditor(user: CurrentUser, river: RiverRow) {
    if (!canEdit(user, river)) {
      throw new ForbiddenError(
        `Only ${river.name}'s creator, a regulator of its jurisdiction or an admin may change its settings. Share the fit with them.`,
      );
    }
  }

  async function writeSettings(tx: Tx, river: RiverRow, patch: Record<string, number>) {
    const merged = { ...river.settings, ...patch } as unknown as RiverCreate;
    const { settings } = applyRiverDefaults(merged);
    const defaultsUsed = DEFAULTABLE_FIELDS.filter((f) => river.defaults_used.includes(f) && !(f in patch));
    await tx.execute(sql`
      UPDATE rivers SET settings = ${JSON.stringify(settings)}::jsonb, defaults_used = ${JSON.stringify(defaultsUsed)}::jsonb, version = version + 1, updated_at = now()
       WHERE id = ${river.id}::uuid`);
  }

  async function apply(user: CurrentUser, id: string): Promise<Calibration> {
    const out = await db.transaction(async (tx) => {
      const { row, river } = await loadCalibration(user, id, tx);
      requireEditor(user, river);
      if (row.status !== 'fitted') {
        throw new ConflictError(
          `This calibration was already ${row.status === 'applied' ? 'applied' : 'applied and rolled back'}. Run a new fit to apply again.`,
        );
      }
      const patch = row.result.settingsPatch;
      const current = river.settings as unknown as Record<string, number>;
      const previous = Object.fromEntries(
        Object.keys(patch).map((k) => [k, current[k] ?? (k === 'nearFieldFreshwaterFraction' ? 1 : null)]),
      ) as Record<string, number>;
      await writeSettings(tx, river, patch);
      const updated = await tx.execute<CalibrationRow>(sql`
        UPDATE calibrations SET status = 'applied', previous_values = ${JSON.stringify(previous)}::jsonb, applied_by = ${user.id}, applied_at = now()
         WHERE id = ${id}::uuid RETURNING *`);
      await recordAudit(tx, {
        actorId: user.id,
        action: 'calibration.apply',
        subjectType: 'river',
        subjectId: river.id,
        jurisdictionId: river.jurisdiction_id,
        before: previous,
        after: { ...patch, calibrationId: id },
      });
      return { row: updated.rows[0], river };
    });
    await deps.onRiverChanged?.(out.river.id);
    return toCalibration(out.row, user, out.river);
  }

  async function rollback(user: CurrentUser, id: string): Promise<Calibration> {
    const out = await db.transaction(async (tx) => {
      const { row, river } = await loadCalibration(user, id, tx);
      requireEditor(user, river);
      if (row.status !== 'applied' || !row.previous_values)
        throw new ConflictError('Only an applied calibration can be rolled back; this one is not applied.');
      const latest = await tx.execute<{ id: string }>(
        sql`SELECT id FROM calibrations WHERE river_id = ${river.id}::uuid AND status = 'applied' ORDER BY applied_at DESC LIMIT 1`,
      );
      if (latest.rows[0]?.id !== id) throw new ConflictError('A later calibration was applied after this one. Roll that one back first.');
      const current = river.settings as unknown as Record<string, number>;
      const changed = Object.entries(row.result.settingsPatch).filter(([k, v]) => current[k] !== v);
      if (changed.length) {
        throw new ConflictError(
          `${river.name}'s ${changed.map(([k]) => k).join(', ')} changed since this calibration was applied; rolling back would overwrite that change. Edit the river's settings instead.`,
        );
      }
      await writeSettings(tx, river, row.previous_values);
      const updated = await tx.execute<CalibrationRow>(sql`
        UPDATE calibrations SET status = 'rolled-back', rolled_back_by = ${user.id}, rolled_back_at = now() WHERE id = ${id}::uuid RETURNING *`);
      await recordAudit(tx, {
        actorId: user.id,
        action: 'calibration.rollback',
        subjectType: 'river',
        subjectId: river.id,
        jurisdictionId: river.jurisdiction_id,
        before: row.result.settingsPatch,
        after: { ...row.previous_values, calibrationId: id },
      });
      return { row: updated.rows[0], river };
    });
    await deps.onRiverChanged?.(out.river.id);
    return toCalibration(out.row, user, out.river);
  }

  return {
    listStations: (user: CurrentUser) => listStations(user),
    uploadStations,
    uploadSamples,
    listSamples,
    comparison,
    fit,
    list,
    apply,
    rollback,
  };
}

function emptySkill() {
  return { n: 0, censored: 0, censoredMet: 0, bias: null, rmse: null, skill: null, indexOfAgreement: null };
}

export type MonitoringService = ReturnType<typeof createMonitoringService>;
