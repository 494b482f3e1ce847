/**
 * PostGIS work for uploads: store reprojected features, check them with ST_IsValid, repair with
 * ST_MakeValid (keeping only the geometry type the kind needs), measure areas on the ellipsoid.
 */
import { sql } from 'drizzle-orm';
import type { Feature } from 'geojson';
import type { Database } from '../client';

type Tx = Parameters<Parameters<Database['transaction']>[0]>[0];

export interface StagedFeature {
  index: number;
  layer: string;
  feature: Feature;
}

/** 3 = polygons, 2 = lines: what ST_CollectionExtract keeps after a repair. */
function extractDimension(kind: 'lease' | 'coast' | 'zone', geometryType: string): 2 | 3 {
  if (kind !== 'coast') return 3;
  return geometryType.includes('Line') ? 2 : 3;
}

/**
 * Stores one chunk of reprojected features (the caller keeps chunks to about 2 000 features, so the JSON sent
 * stays bounded): validity checked, invalid ones repaired. Call {@link finishImportFeatures} after the last.
 */
export async function insertImportFeatureRows(tx: Tx, importId: string, kind: 'lease' | 'coast' | 'zone', features: StagedFeature[]): Promise<void> {
  if (features.length === 0) return;
  const rows = features.map((f) => ({
    idx: f.index,
    layer: f.layer,
    props: f.feature.properties ?? {},
    geom: f.feature.geometry,
    dim: extractDimension(kind, f.feature.geometry?.type ?? 'Polygon'),
  }));
  await tx.execute(sql`
    INSERT INTO import_features (import_id, feature_index, layer, properties, geom, repaired, invalid_reason, area_m2)
    SELECT ${importId}::uuid, f.idx, f.layer, f.props,
           CASE WHEN v.ok THEN v.g ELSE ST_CollectionExtract(ST_MakeValid(v.g), f.dim) END,
           NOT v.ok,
           CASE WHEN v.ok THEN NULL ELSE ST_IsValidReason(v.g) END,
           NULL
    FROM jsonb_to_recordset(${JSON.stringify(rows)}::jsonb) AS f(idx int, layer text, props jsonb, geom jsonb, dim int)
    CROSS JOIN LATERAL (SELECT g, ST_IsValid(g) AS ok
                        FROM (SELECT ST_SetSRID(ST_Force2D(ST_GeomFromGeoJSON(f.geom::text)), 4326) AS g) s) v
  `);
}

/**
 * After the last chunk, once every coordinate check has passed (the geography cast below refuses positions
 * outside ±180°/±90°): polygons become MultiPolygons; areas on the WGS84 ellipsoid (geography).
 */
export async function finishImportFeatures(tx: Tx, importId: string): Promise<void> {
  await tx.execute(sql`
    UPDATE import_features
       SET geom = ST_Multi(geom),
           area_m2 = CASE WHEN GeometryType(geom) IN ('POLYGON', 'MULTIPOLYGON') THEN ST_Area(geom::geography) END
     WHERE import_id = ${importId}::uuid
  `);
}

/** Features a repair left empty: they cannot be kept and the user must fix them at the source. */
export async function findEmptyAfterRepair(tx: Tx, importId: string): Promise<{ index: number; reason: string | null }[]> {
  const res = await tx.execute<{ index: number; reason: string | null }>(sql`
    SELECT feature_index AS index, invalid_reason AS reason FROM import_features
     WHERE import_id = ${importId}::uuid AND ST_IsEmpty(geom) ORDER BY feature_index`);
  return res.rows;
}

/** Flags leases or zones that lie wholly on land, where the owner can see a land-polygon coast. */
export async function flagOnLand(tx: Tx, importId: string, ownerId: string, jurisdictionId: string | null): Promise<number> {
  const res = await tx.execute(sql`
    WITH land AS MATERIALIZED (
      SELECT ST_Union(geom) AS g FROM coasts
       WHERE form = 'land' AND (owner_id = ${ownerId} OR (shared AND jurisdiction_id IS NOT DISTINCT FROM ${jurisdictionId}::uuid))
    )
    UPDATE import_features f SET on_land = true
      FROM land
     WHERE f.import_id = ${importId}::uuid AND land.g IS NOT NULL AND ST_CoveredBy(f.geom, land.g)`);
  return res.rowCount ?? 0;
}

export interface ImportFeatureSummary {
  index: number;
  properties: Record<string, unknown>;
  areaM2: number | null;
  bbox: [number, number, number, number];
  repaired: boolean;
  invalidReason: string | null;
  onLand: boolean;
  geometryType: string;
}

/**
 * A page of the staged features in upload order (offset/limit), so a preview of a 50 000-feature file does not
 * hold or send every feature; {@link summariseImportOverview} gives the figures over all of them.
 */
export async function summariseImportFeatures(
  db: Database | Tx,
  importId: string,
  page: { offset: number; limit: number },
): Promise<ImportFeatureSummary[]> {
  const res = await db.execute<{
    index: number;
    properties: Record<string, unknown>;
    area_m2: number | null;
    xmin: number;
    ymin: number;
    xmax: number;
    ymax: number;
    repaired: boolean;
    invalid_reason: string | null;
    on_land: boolean;
    gtype: string;
  }>(sql`
    SELECT feature_index AS index, properties, area_m2, ST_XMin(geom) AS xmin, ST_YMin(geom) AS ymin,
           ST_XMax(geom) AS xmax, ST_YMax(geom) AS ymax, repaired, invalid_reason, on_land, GeometryType(geom) AS gtype
      FROM import_features WHERE import_id = ${importId}::uuid AND feature_index >= ${page.offset}
     ORDER BY feature_index LIMIT ${page.limit}`);
  return res.rows.map((r) => ({
    index: r.index,
    properties: r.properties,
    areaM2: r.area_m2,
    bbox: [r.xmin, r.ymin, r.xmax, r.ymax],
    repaired: r.repaired,
    invalidReason: r.invalid_reason,
    onLand: r.on_land,
    geometryType: r.gtype,
  }));
}

/** Features listed by index in an overview's repaired and on-land lists, at most. */
export const OVERVIEW_INDEX_LIMIT = 100;

export interface ImportOverview {
  bbox: [number, number, number, number] | null;
  areaM2: { min: number; max: number; total: number } | null;
  repaired: { count: number; indexes: number[] };
  onLand: { count: number; indexes: number[] };
  /** Some staged feature is a polygon (a coast of land polygons rather than lines). */
  hasPolygons: boolean;
}

/** Figures over every staged feature of an upload, computed in PostGIS: its extent, areas, repairs and features on land. */
export async function summariseImportOverview(db: Database | Tx, importId: string): Promise<ImportOverview> {
  const res = await db.execute<{
    xmin: number | null;
    ymin: number | null;
    xmax: number | null;
    ymax: number | null;
    amin: number | null;
    amax: number | null;
    atotal: number | null;
    repaired: string;
    repaired_at: number[] | null;
    on_land: string;
    on_land_at: number[] | null;
    polygons: boolean | null;
  }>(sql`
    SELECT ST_XMin(e) AS xmin, ST_YMin(e) AS ymin, ST_XMax(e) AS xmax, ST_YMax(e) AS ymax, s.*
      FROM (SELECT ST_Extent(geom) AS e, min(area_m2) AS amin, max(area_m2) AS amax, sum(area_m2) AS atotal,
                   count(*) FILTER (WHERE repaired) AS repaired,
                   (array_agg(feature_index ORDER BY feature_index) FILTER (WHERE repaired))[1:${OVERVIEW_INDEX_LIMIT}] AS repaired_at,
                   count(*) FILTER (WHERE on_land) AS on_land,
                   (array_agg(feature_index ORDER BY feature_index) FILTER (WHERE on_land))[1:${OVERVIEW_INDEX_LIMIT}] AS on_land_at,
                   bool_or(GeometryType(geom) LIKE '%POLYGON') AS polygons
              FROM import_features WHERE import_id = ${importId}::uuid) s`);
  const r = res.rows[0];
  return {
    bbox: r.xmin === null ? null : [r.xmin, r.ymin!, r.xmax!, r.ymax!],
    areaM2: r.amin === null ? null : { min: r.amin, max: r.amax!, total: r.atotal! },
    repaired: { count: Number(r.repaired), indexes: r.repaired_at ?? [] },
    onLand: { count: Number(r.on_land), indexes: r.on_land_at ?? [] },
    hasPolygons: r.polygons ?? false,
  };
}

/** The staged features as GeoJSON for the preview map, simplified to about a metre. */
export async function previewImportFeatures(db: Database, importId: string) {
  const res = await db.execute<{ index: number; properties: Record<string, unknown>; geometry: string; repaired: boolean; on_land: boolean }>(sql`
    SELECT feature_index AS index, properties, ST_AsGeoJSON(ST_SimplifyPreserveTopology(geom, 0.00001), 6) AS geometry, repaired, on_land
      FROM import_features WHERE import_id = ${importId}::uuid ORDER BY feature_index LIMIT 20000`);
  return {
    type: 'FeatureCollection' as const,
    features: res.rows.map((r) => ({
      type: 'Feature' as const,
      id: r.index,
      properties: { ...r.properties, _index: r.index, _repaired: r.repaired, _onLand: r.on_land },
      geometry: JSON.parse(r.geometry),
    })),
  };
}
