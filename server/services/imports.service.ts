/**
 * Uploads of leases, coasts and closure zones: read (shared/geometry), reproject, check,
 * stage in PostGIS (validity, repair, areas), then confirm into leases / coasts / zones.
 * Every write runs in one transaction: an upload is stored whole or not at all.
 */
import { createHash } from 'node:crypto';
import { sql } from 'drizzle-orm';
import type { Feature, Geometry } from 'geojson';
import { coordinateCheck } from '#shared/geometry/check-coordinates';
import { type CrsCatalogue, crsDefinition, identifyCrs } from '#shared/geometry/crs-catalogue';
import { guessAttributeMapping, normaliseStatus } from '#shared/geometry/guess-attribute-mapping';
import { loadCrsCatalogue } from '../lib/crs-catalogue';
import {
  type LayerSummary,
  layerChunks,
  layerFeatureCount,
  layerGeometryTypes,
  type ParsedUpload,
  readUpload,
  type UploadKind,
  type UploadLimits,
} from '#shared/geometry/read-upload';
import { layerReprojector } from '#shared/geometry/reproject';
import { isUploadError } from '#shared/geometry/upload-error';
import type { Database } from '../db/client';
import {
  findEmptyAfterRepair,
  finishImportFeatures,
  flagOnLand,
  type ImportOverview,
  insertImportFeatureRows,
  summariseImportFeatures,
  summariseImportOverview,
} from '../db/repositories/import-features.repo';
import type { CurrentUser } from '../http/route';
import { AppError, ConflictError, ForbiddenError, NotFoundError, UnprocessableError, ValidationError } from '../lib/errors';
import { openSqlite } from '../lib/sqlite';
import { recordAudit } from './audit.service';
import { assignLeasesToRegions } from './regions.service';
import { forgetUser } from '../auth/current-user';

/** Who may upload what: growers and advisers their leases; regulators zones; all three coastlines. */
export const UPLOAD_ROLES: Record<UploadKind, readonly string[]> = {
  lease: ['grower', 'adviser', 'regulator'],
  coast: ['grower', 'adviser', 'regulator'],
  zone: ['regulator'],
};

interface ImportRow {
  id: string;
  kind: UploadKind;
  owner_id: string;
  jurisdiction_id: string | null;
  file_name: string;
  status: 'needs-crs' | 'ready' | 'confirmed';
  crs: { found: boolean; epsg?: number; wkt?: string; name?: string };
  summary: {
    featureCount: number;
    geometryTypes: string[];
    fields: string[];
    warnings: string[];
    format: string;
    /** Every layer of a file with several, for the user to pick one. */
    layers?: LayerSummary[];
    /** The picked layer (null or absent: every usable layer). */
    layer?: string | null;
    /** GPX tracks confirmed as areas. */
    tracksAsPolygons?: boolean;
  };
  [key: string]: unknown;
}

/** A staged feature as the preview shows it. */
function featureView(f: Awaited<ReturnType<typeof summariseImportFeatures>>[number]) {
  return {
    index: f.index,
    properties: f.properties,
    areaM2: f.areaM2,
    bbox: f.bbox,
    repaired: f.repaired,
    invalidReason: f.invalidReason,
    onLand: f.onLand,
  };
}

function toAppError(err: unknown): never {
  if (isUploadError(err)) throw new AppError(err.status, err.code, err.message, err.details);
  throw err;
}

function geometryTypesOf(parsed: ParsedUpload): string[] {
  return [...new Set(parsed.layers.flatMap((l) => layerGeometryTypes(l)))].sort();
}
function fieldsOf(parsed: ParsedUpload): string[] {
  return [...new Set(parsed.layers.flatMap((l) => l.fields))];
}

/** Every column of an import but the file itself: the file is read only when it must be parsed again. */
const IMPORT_COLUMNS = sql.raw('id, kind, owner_id, jurisdiction_id, file_name, status, crs, summary');

/** Features reprojected, checked and stored at a time: bounds the memory staging takes (see stage). */
const STAGE_CHUNK = 2_000;
/** Features the preview carries itself (the file's first); GET /imports/:id/features pages through the rest. */
export const PREVIEW_FEATURES = 200;
/** Staged features read back at a time when an upload is confirmed: its memory does not grow with the file. */
const CONFIRM_PAGE = 5_000;
const NO_OVERVIEW: ImportOverview = {
  bbox: null,
  areaM2: null,
  repaired: { count: 0, indexes: [] },
  onLand: { count: 0, indexes: [] },
  hasPolygons: false,
};

export function createImportsService(deps: {
  db: Database;
  limits?: Partial<UploadLimits>;
  onLeasesChanged?: (ids: string[]) => Promise<void>;
}) {
  const { db } = deps;
  let catalogue: CrsCatalogue | null = null;
  const crsCatalogue = () => {
    catalogue ??= loadCrsCatalogue();
    return catalogue;
  };

  async function loadImport(user: CurrentUser, id: string): Promise<ImportRow> {
    const res = await db.execute<ImportRow>(sql`SELECT ${IMPORT_COLUMNS} FROM imports WHERE id = ${id}::uuid`);
    const row = res.rows[0];
    // Someone else's upload answers 404, as if it did not exist.
    if (!row || row.owner_id !== user.id) throw new NotFoundError('No upload with this id belongs to you. Upload the file again.');
    return row;
  }

  /**
   * Reprojects, checks and stages every feature; throws (and the transaction rolls back) on a hard problem.
   * A layer goes through in chunks of {@link STAGE_CHUNK} features (reproject, check, insert, drop), so the
   * memory this takes does not grow with the file; the coordinate checks judge the whole layer all the same
   * (coordinateCheck accumulates across chunks and decides after the last one). The errors come in the order
   * they did when each step ran over the whole layer: a position the CRS cannot convert anywhere in a layer
   * before that layer's coordinate verdict, and layer by layer.
   */
  async function stage(
    tx: Parameters<Parameters<Database['transaction']>[0]>[0],
    row: Pick<ImportRow, 'id' | 'kind' | 'owner_id' | 'jurisdiction_id'>,
    parsed: ParsedUpload,
    choice?: { epsg: number },
  ) {
    const warnings: string[] = [];
    await tx.execute(sql`DELETE FROM import_features WHERE import_id = ${row.id}::uuid`);
    let index = 0;
    for (const layer of parsed.layers) {
      const source = choice ? { epsg: choice.epsg } : { wkt: layer.crs.wkt, epsg: layer.crs.epsg };
      const check = coordinateCheck({ layerName: parsed.layers.length > 1 ? layer.name : undefined });
      let reproject: ReturnType<typeof layerReprojector>;
      try {
        reproject = layerReprojector(layer.name, source, crsCatalogue());
      } catch (err) {
        toAppError(err);
      }
      let at = 0;
      // A streamed layer (shapefile, GeoJSON) builds each chunk's features here, from the file's bytes: they never all exist at once.
      for (const source of layerChunks(layer, STAGE_CHUNK)) {
        let chunk: Feature<Geometry>[];
        try {
          chunk = reproject(source, at);
        } catch (err) {
          toAppError(err);
        }
        check.add(chunk, at);
        // Once a position is out of range the layer is refused at its verdict: store nothing more of it.
        if (!check.failing) {
          const first = index + at;
          await insertImportFeatureRows(
            tx,
            row.id,
            row.kind,
            chunk.map((feature, k) => ({ index: first + k, layer: layer.name, feature })),
          );
        }
        at += source.length;
      }
      try {
        warnings.push(...check.finish());
      } catch (err) {
        toAppError(err);
      }
      index += layerFeatureCount(layer);
    }
    await finishImportFeatures(tx, row.id);
    const empty = await findEmptyAfterRepair(tx, row.id);
    if (empty.length) {
      throw new UnprocessableError(
        `Feature${empty.length > 1 ? 's' : ''} ${empty.map((e) => e.index + 1).join(', ')} could not be repaired (${empty[0].reason ?? 'invalid outline'}). Fix the outline in your mapping program and upload again.`,
        { features: empty },
      );
    }
    if (row.kind !== 'coast') {
      const onLand = await flagOnLand(tx, row.id, row.owner_id, row.jurisdiction_id);
      if (onLand)
        warnings.push(
          `${onLand} feature${onLand > 1 ? 's lie' : ' lies'} wholly on land according to the coastline; check the file or its coordinate system.`,
        );
    }
    return warnings;
  }

  async function describe(id: string) {
    const res = await db.execute<ImportRow>(sql`SELECT ${IMPORT_COLUMNS} FROM imports WHERE id = ${id}::uuid`);
    const row = res.rows[0];
    const staged = row.status !== 'needs-crs';
    // The first features and figures over all of them: a 50 000-feature preview is as small as a 500-feature one.
    const features = staged ? await summariseImportFeatures(db, id, { offset: 0, limit: PREVIEW_FEATURES }) : [];
    const { hasPolygons: _polygons, ...overview } = staged ? await summariseImportOverview(db, id) : NO_OVERVIEW;
    return {
      id: row.id,
      kind: row.kind,
      status: row.status,
      fileName: row.file_name,
      format: row.summary.format,
      layers: row.summary.layers ?? [],
      selectedLayer: row.summary.layer ?? null,
      tracksAsPolygons: row.summary.tracksAsPolygons ?? false,
      crs: row.crs,
      featureCount: row.summary.featureCount,
      geometryTypes: row.summary.geometryTypes,
      fields: row.summary.fields,
      warnings: row.summary.warnings,
      suggestedMapping: guessAttributeMapping(row.summary.fields),
      overview,
      featurePage: { offset: 0, limit: PREVIEW_FEATURES, total: staged ? row.summary.featureCount : 0 },
      features: features.map(featureView),
    };
  }

  /** A page of an upload's staged features, in file order (for a preview longer than its first page). */
  async function listFeatures(user: CurrentUser, id: string, page: { offset: number; limit: number }) {
    const row = await loadImport(user, id);
    if (row.status === 'needs-crs')
      throw new ConflictError('This upload is not read yet: choose its coordinate system first (POST /imports/:id/crs).');
    const items = await summariseImportFeatures(db, id, page);
    return { offset: page.offset, limit: page.limit, total: row.summary.featureCount, items: items.map(featureView) };
  }

  /** Reads an upload's bytes with the user's choices (layer, GPX tracks as areas). */
  async function read(
    bytes: Uint8Array,
    fileName: string,
    kind: UploadKind,
    choices: { layer?: string | null; tracksAsPolygons?: boolean },
    stream = false,
  ) {
    try {
      return await readUpload(bytes, fileName, kind, deps.limits, {
        identifyEpsg: (wkt) => identifyCrs(crsCatalogue(), wkt),
        openSqlite,
        ...(stream ? { stream: true } : {}),
        ...(choices.layer ? { layer: choices.layer } : {}),
        ...(choices.tracksAsPolygons ? { tracksAsPolygons: true } : {}),
      });
    } catch (err) {
      toAppError(err);
    }
  }

  async function create(
    user: CurrentUser,
    kind: UploadKind,
    file: { buffer: Buffer; originalname: string },
    choices: { layer?: string; tracksAsPolygons?: boolean } = {},
  ) {
    if (!UPLOAD_ROLES[kind].includes(user.role)) {
      throw new ForbiddenError(
        `Your role (${user.role}) cannot upload ${kind === 'zone' ? 'closure zones' : `${kind}s`}. It is for: ${UPLOAD_ROLES[kind].join(', ')}.`,
      );
    }
    // The parsed features are reachable only inside readAndStage: they can be collected before the preview
    // (every staged feature's summary, read back from PostGIS) is built.
    return describe(await readAndStage(user, kind, file, choices));
  }

  async function readAndStage(
    user: CurrentUser,
    kind: UploadKind,
    file: { buffer: Buffer; originalname: string },
    choices: { layer?: string; tracksAsPolygons?: boolean },
  ): Promise<string> {
    const bytes = new Uint8Array(file.buffer.buffer, file.buffer.byteOffset, file.buffer.byteLength);
    // Streamed where the format allows (features built chunk by chunk while staging). An upload whose coordinate system
    // must be chosen keeps only the file: the choice reads it again (setCrs), so no parse is stored.
    const parsed = await read(bytes, file.originalname, kind, choices, true);
    const crsFound = parsed.layers.every((l) => l.crs.found);
    const firstCrs = parsed.layers[0].crs;
    const summary = {
      featureCount: parsed.layers.reduce((n, l) => n + layerFeatureCount(l), 0),
      geometryTypes: geometryTypesOf(parsed),
      fields: fieldsOf(parsed),
      warnings: [...parsed.warnings],
      format: parsed.format,
      layers: parsed.layerSummaries ?? [],
      layer: parsed.selectedLayer ?? null,
      tracksAsPolygons: choices.tracksAsPolygons ?? false,
    };
    const sha = createHash('sha256').update(file.buffer).digest('hex');
    return db.transaction(async (tx) => {
      const inserted = await tx.execute<{ id: string }>(sql`
        INSERT INTO imports (kind, owner_id, jurisdiction_id, file_name, file_sha256, file_bytes, status, crs, summary)
        VALUES (${kind}, ${user.id}, ${user.jurisdictionId}::uuid, ${file.originalname}, ${sha}, ${file.buffer},
                ${crsFound ? 'ready' : 'needs-crs'}, ${JSON.stringify(crsFound ? firstCrs : { ...firstCrs, found: false })}::jsonb,
                ${JSON.stringify(summary)}::jsonb)
        RETURNING id`);
      const importId = inserted.rows[0].id;
      if (crsFound) {
        const warnings = await stage(tx, { id: importId, kind, owner_id: user.id, jurisdiction_id: user.jurisdictionId }, parsed);
        summary.warnings.push(...warnings);
        await tx.execute(sql`UPDATE imports SET summary = ${JSON.stringify(summary)}::jsonb WHERE id = ${importId}::uuid`);
      } else {
        const unknown = parsed.layers.find((l) => !l.crs.found);
        summary.warnings.push(
          unknown?.crs.wkt
            ? `The .prj of “${unknown.name}” describes a coordinate system Brackline cannot read. Choose its EPSG code.`
            : `“${unknown?.name}” has no .prj file, so its coordinate system is unknown. Choose its EPSG code.`,
        );
        await tx.execute(sql`UPDATE imports SET summary = ${JSON.stringify(summary)}::jsonb WHERE id = ${importId}::uuid`);
      }
      return importId;
    });
  }

  async function setCrs(user: CurrentUser, id: string, epsg: number) {
    const row = await loadImport(user, id);
    if (row.status === 'confirmed')
      throw new ConflictError('This upload is already saved. Upload the file again to read it with another coordinate system.');
    const definition = crsDefinition(crsCatalogue(), epsg);
    if (!definition)
      throw new ValidationError(`epsg: EPSG:${epsg} is not a coordinate system Brackline knows. Search by name to find the right code.`);
    // The kept original read again (streamed where the format allows), with the user's earlier choices.
    const file = await db.execute<{ file_bytes: Buffer }>(sql`SELECT file_bytes FROM imports WHERE id = ${id}::uuid`);
    const parsed = await read(
      new Uint8Array(file.rows[0].file_bytes),
      row.file_name,
      row.kind,
      { layer: row.summary.layer, tracksAsPolygons: row.summary.tracksAsPolygons },
      true,
    );
    const summary = { ...row.summary, warnings: row.summary.warnings.filter((w) => !/coordinate system/.test(w)) };
    await db.transaction(async (tx) => {
      const warnings = await stage(tx, row, parsed, { epsg });
      summary.warnings.push(...warnings);
      await tx.execute(sql`
        UPDATE imports SET status = 'ready', crs = ${JSON.stringify({ found: true, epsg, name: definition.name })}::jsonb,
               summary = ${JSON.stringify(summary)}::jsonb
         WHERE id = ${id}::uuid`);
    });
    return describe(id);
  }

  /**
   * Reads the kept file again with one layer (or, with null, every usable layer) and stages it afresh: the
   * preview of a KML with folders, a GeoPackage with tables or a zip with several shapefiles.
   */
  async function pickLayer(user: CurrentUser, id: string, layer: string | null) {
    const row = await loadImport(user, id);
    if (row.status === 'confirmed') throw new ConflictError('This upload is already saved. Upload the file again to pick another layer.');
    const file = await db.execute<{ file_bytes: Buffer }>(sql`SELECT file_bytes FROM imports WHERE id = ${id}::uuid`);
    const parsed = await read(
      new Uint8Array(file.rows[0].file_bytes),
      row.file_name,
      row.kind,
      { layer, tracksAsPolygons: row.summary.tracksAsPolygons },
      true,
    );
    const chosenEpsg = row.status === 'ready' && !parsed.layers.every((l) => l.crs.found) && row.crs.found ? row.crs.epsg : undefined;
    const crsFound = parsed.layers.every((l) => l.crs.found) || chosenEpsg !== undefined;
    const summary = {
      ...row.summary,
      featureCount: parsed.layers.reduce((n, l) => n + layerFeatureCount(l), 0),
      geometryTypes: geometryTypesOf(parsed),
      fields: fieldsOf(parsed),
      warnings: [...parsed.warnings],
      layer,
    };
    await db.transaction(async (tx) => {
      if (crsFound) {
        summary.warnings.push(...(await stage(tx, row, parsed, chosenEpsg !== undefined ? { epsg: chosenEpsg } : undefined)));
      } else {
        await tx.execute(sql`DELETE FROM import_features WHERE import_id = ${id}::uuid`);
        summary.warnings.push(
          `“${parsed.layers.find((l) => !l.crs.found)?.name}” does not say its coordinate system. Choose its EPSG code.`,
        );
      }
      await tx.execute(sql`
        UPDATE imports SET summary = ${JSON.stringify(summary)}::jsonb, status = ${crsFound ? 'ready' : 'needs-crs'},
               crs = ${JSON.stringify(chosenEpsg !== undefined ? row.crs : crsFound ? parsed.layers[0].crs : { ...parsed.layers[0].crs, found: false })}::jsonb
         WHERE id = ${id}::uuid`);
    });
    return describe(id);
  }

  async function get(user: CurrentUser, id: string) {
    await loadImport(user, id);
    return describe(id);
  }

  async function confirm(
    user: CurrentUser,
    id: string,
    body: { mapping: { leaseId?: string; holder?: string; species?: string; status?: string }; onDuplicate?: 'replace' | 'keep' },
  ) {
    const row = await loadImport(user, id);
    if (row.status === 'needs-crs') throw new ConflictError('Choose the coordinate system first (POST /imports/:id/crs), then confirm.');
    if (row.status === 'confirmed') throw new ConflictError('This upload is already saved. Upload the file again to add it once more.');
    for (const [role, field] of Object.entries(body.mapping)) {
      if (field && !row.summary.fields.includes(field)) {
        throw new ValidationError(
          `mapping.${role}: the file has no field "${field}". Its fields are: ${row.summary.fields.join(', ') || '(none)'}.`,
        );
      }
    }
    const base = row.file_name.replace(/\.(zip|geojson|json|kml|kmz|gpx|gpkg)$/i, '');
    const text = (v: unknown) => (v === null || v === undefined || v === '' ? null : String(v).trim());
    const value = (field: string | undefined) => (field ? sql`properties -> ${field}` : sql`NULL::jsonb`);

    const result = await db.transaction(async (tx) => {
      const ids: string[] = [];
      let created = 0;
      let updated = 0;
      // What each feature becomes (its code or name, holder, species, status), worked out a page of staged features at
      // a time and kept in a temporary table: the writes below are then set-based, and the memory this takes is one page's.
      await tx.execute(sql`
        CREATE TEMPORARY TABLE confirm_rows (idx int PRIMARY KEY, code text NOT NULL, holder text, species text, status text, replace_id uuid)
        ON COMMIT DROP`);
      for (let after = -1; row.kind !== 'coast'; ) {
        const page = await tx.execute<{ idx: number; code: unknown; holder: unknown; species: unknown; status: unknown }>(sql`
          SELECT feature_index AS idx, ${value(body.mapping.leaseId)} AS code, ${value(body.mapping.holder)} AS holder,
                 ${value(body.mapping.species)} AS species, ${value(body.mapping.status)} AS status
            FROM import_features WHERE import_id = ${id}::uuid AND feature_index > ${after}
           ORDER BY feature_index LIMIT ${CONFIRM_PAGE}`);
        if (page.rows.length === 0) break;
        const rows = page.rows.map((f) => ({
          idx: f.idx,
          code: text(f.code) ?? (row.kind === 'zone' ? `${base} zone ${f.idx + 1}` : `${base}-${f.idx + 1}`),
          holder: text(f.holder),
          species: text(f.species),
          status: body.mapping.status ? (normaliseStatus(f.status) ?? 'candidate') : 'candidate',
        }));
        await tx.execute(sql`
          INSERT INTO confirm_rows (idx, code, holder, species, status)
          SELECT * FROM jsonb_to_recordset(${JSON.stringify(rows)}::jsonb) AS r(idx int, code text, holder text, species text, status text)`);
        after = page.rows[page.rows.length - 1].idx;
      }
      if (row.kind === 'lease') {
        const existing = await tx.execute<{ lease_code: string }>(sql`
          SELECT DISTINCT l.lease_code FROM leases l JOIN confirm_rows c ON c.code = l.lease_code
           WHERE l.owner_id = ${user.id} ORDER BY l.lease_code`);
        const duplicates = existing.rows.map((r) => r.lease_code);
        if (duplicates.length && !body.onDuplicate) {
          throw new ConflictError(
            `${duplicates.length} lease id${duplicates.length > 1 ? 's' : ''} already exist among your leases (${duplicates.slice(0, 10).join(', ')}${duplicates.length > 10 ? ', …' : ''}). Confirm again with onDuplicate "replace" to update them with the new boundaries, or "keep" to add the new ones beside them.`,
            { duplicates },
          );
        }
        // Set-based writes: one UPDATE for the replaced leases and one INSERT … SELECT for the new ones, joined to the
        // staged features by index, so a 40 000-lease file costs a few statements instead of 40 000 round trips.
        if (duplicates.length && body.onDuplicate === 'replace') {
          await tx.execute(sql`
            UPDATE confirm_rows c SET replace_id = t.id
              FROM (SELECT DISTINCT ON (lease_code) lease_code, id FROM leases WHERE owner_id = ${user.id} ORDER BY lease_code, created_at DESC, id) t
             WHERE t.lease_code = c.code`);
          // Two features with the same code: the later one wins, as when they were written one after the other.
          await tx.execute(sql`
            UPDATE leases l SET geom = f.geom, area_m2 = f.area_m2, on_land = f.on_land, import_id = ${id}::uuid,
                   holder = r.holder, species = r.species, status = r.status::lease_status, source_properties = f.properties, updated_at = now()
              FROM (SELECT DISTINCT ON (replace_id) * FROM confirm_rows WHERE replace_id IS NOT NULL ORDER BY replace_id, idx DESC) r
              JOIN import_features f ON f.import_id = ${id}::uuid AND f.feature_index = r.idx
             WHERE l.id = r.replace_id`);
          const replaced = await tx.execute<{ id: string }>(sql`SELECT replace_id AS id FROM confirm_rows WHERE replace_id IS NOT NULL ORDER BY idx`);
          for (const r of replaced.rows) ids.push(r.id);
          updated = replaced.rows.length;
        }
        const res = await tx.execute<{ id: string }>(sql`
          INSERT INTO leases (lease_code, holder, species, status, owner_id, organisation_id, jurisdiction_id, import_id, source_properties, geom, area_m2, on_land)
          SELECT r.code, r.holder, r.species, r.status::lease_status,
                 ${user.id}, ${user.organisationId}::uuid, ${user.jurisdictionId}::uuid, ${id}::uuid, f.properties, f.geom, f.area_m2, f.on_land
            FROM confirm_rows r JOIN import_features f ON f.import_id = ${id}::uuid AND f.feature_index = r.idx
           WHERE r.replace_id IS NULL
           ORDER BY r.idx
          RETURNING id`);
        for (const r of res.rows) ids.push(r.id);
        created = res.rows.length;
        // A lease inside a region's area belongs to that region (and brings a grower of no region into it).
        await assignLeasesToRegions(tx, user, ids);
      } else if (row.kind === 'zone') {
        if (!user.jurisdictionId)
          throw new ValidationError('Your account has no jurisdiction, so closure zones cannot be saved. Ask an administrator to set it.');
        const res = await tx.execute<{ id: string }>(sql`
          INSERT INTO closure_zones (name, jurisdiction_id, import_id, source_properties, geom, area_m2)
          SELECT r.code, ${user.jurisdictionId}::uuid, ${id}::uuid, f.properties, f.geom, f.area_m2
            FROM confirm_rows r JOIN import_features f ON f.import_id = ${id}::uuid AND f.feature_index = r.idx
           ORDER BY r.idx
          RETURNING id`);
        for (const r of res.rows) ids.push(r.id);
        created = res.rows.length;
      } else {
        // A coastline is stored as one geometry: lines merged, or land polygons unioned.
        const { hasPolygons } = await summariseImportOverview(tx, id);
        const res = await tx.execute<{ id: string }>(sql`
          INSERT INTO coasts (name, form, owner_id, jurisdiction_id, shared, import_id, geom)
          SELECT ${base}, ${hasPolygons ? 'land' : 'line'}, ${user.id}, ${user.jurisdictionId}::uuid, ${user.role === 'regulator'}, ${id}::uuid,
                 ${hasPolygons ? sql`ST_Multi(ST_Union(ST_CollectionExtract(geom, 3)))` : sql`ST_Multi(ST_LineMerge(ST_Union(ST_CollectionExtract(geom, 2))))`}
            FROM import_features WHERE import_id = ${id}::uuid
          RETURNING id`);
        ids.push(res.rows[0].id);
        created = 1;
      }
      await tx.execute(sql`UPDATE imports SET status = 'confirmed', confirmed_at = now() WHERE id = ${id}::uuid`);
      await recordAudit(tx, {
        actorId: user.id,
        action: `${row.kind}.import`,
        subjectType: 'import',
        subjectId: id,
        jurisdictionId: user.jurisdictionId,
        after: { created, updated, fileName: row.file_name, mapping: body.mapping, onDuplicate: body.onDuplicate ?? null },
      });
      return { created, updated, ids };
    });
    // Saving a lease may have brought its holder into a region: their cached users row is stale from now on.
    if (row.kind === 'lease') forgetUser(user.id);
    if (row.kind === 'lease' && result.ids.length) await deps.onLeasesChanged?.(result.ids);
    return result;
  }

  function searchCrsCatalogue() {
    return crsCatalogue();
  }

  return { create, setCrs, pickLayer, get, listFeatures, confirm, crsCatalogue: searchCrsCatalogue };
}

export type ImportsService = ReturnType<typeof createImportsService>;
