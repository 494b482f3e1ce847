/**
 * Regions (issue #15): a jurisdiction's area, picked by a grower at sign-up or in the account
 * settings, and set by an admin or a regulator of the jurisdiction (uploaded GeoJSON or drawn).
 */
import { z } from 'zod';

type Position = number[];

/** Why a polygon's rings cannot be used, or null when each ring has 4+ positions and closes. */
export function ringProblem(polygons: Position[][][]): string | null {
  for (const [p, rings] of polygons.entries()) {
    if (!Array.isArray(rings) || rings.length === 0) return `polygon ${p + 1} has no rings. Give at least its outer ring.`;
    for (const [r, ring] of rings.entries()) {
      const where = `ring ${r + 1} of polygon ${p + 1}`;
      if (!Array.isArray(ring) || ring.length < 4) {
        return `${where} has ${Array.isArray(ring) ? ring.length : 0} positions; a closed ring needs at least 4 (three corners and the first again).`;
      }
      for (const pos of ring) {
        if (!Array.isArray(pos) || pos.length < 2 || !Number.isFinite(pos[0]) || !Number.isFinite(pos[1])) {
          return `${where} holds a position that is not [longitude, latitude].`;
        }
        if (Math.abs(pos[0]) > 180 || Math.abs(pos[1]) > 90) {
          return `${where} holds [${pos[0]}, ${pos[1]}], outside longitude −180…180 and latitude −90…90. Send WGS 84 (EPSG:4326) coordinates.`;
        }
      }
      const first = ring[0];
      const last = ring[ring.length - 1];
      if (first[0] !== last[0] || first[1] !== last[1]) {
        return `The region polygon does not close: ${where} starts at [${first[0]}, ${first[1]}] but ends at [${last[0]}, ${last[1]}]. Repeat the first position at the end.`;
      }
    }
  }
  return null;
}

const polygonGeometry = z.object({ type: z.literal('Polygon'), coordinates: z.array(z.array(z.array(z.number()))) });
const multiPolygonGeometry = z.object({ type: z.literal('MultiPolygon'), coordinates: z.array(z.array(z.array(z.array(z.number())))) });
const areaGeometry = z.discriminatedUnion('type', [polygonGeometry, multiPolygonGeometry]);

/** Reads a Polygon, a MultiPolygon, a Feature of one, or a FeatureCollection of them into one MultiPolygon, or says what is wrong. */
export function toRegionArea(value: unknown): { area: { type: 'MultiPolygon'; coordinates: Position[][][] } } | { problem: string } {
  const v = value as { type?: string; geometry?: unknown; features?: { geometry?: unknown }[] } | null;
  const geometries: unknown[] =
    v?.type === 'FeatureCollection' && Array.isArray(v.features) ? v.features.map((f) => f?.geometry) : v?.type === 'Feature' ? [v.geometry] : [v];
  if (geometries.length === 0) return { problem: 'area: the FeatureCollection has no features. Give one polygon.' };
  const polygons: Position[][][] = [];
  for (const g of geometries) {
    const parsed = areaGeometry.safeParse(g);
    if (!parsed.success) {
      return {
        problem: 'area: send GeoJSON in WGS 84 longitude/latitude: a Polygon or MultiPolygon geometry, a Feature of one, or a FeatureCollection of them.',
      };
    }
    if (parsed.data.type === 'Polygon') polygons.push(parsed.data.coordinates);
    else polygons.push(...parsed.data.coordinates);
  }
  const problem = ringProblem(polygons);
  if (problem) return { problem: `area: ${problem}` };
  return { area: { type: 'MultiPolygon', coordinates: polygons } };
}

export const regionAreaBodySchema = z.strictObject({
  area: z
    .looseObject({ type: z.enum(['Polygon', 'MultiPolygon', 'Feature', 'FeatureCollection'], { error: 'area.type must be Polygon, MultiPolygon, Feature or FeatureCollection' }) })
    .superRefine((value, ctx) => {
      const read = toRegionArea(value);
      if ('problem' in read) ctx.addIssue({ code: 'custom', message: read.problem });
    })
    .describe('GeoJSON (EPSG:4326): a Polygon or MultiPolygon, a Feature of one, or a FeatureCollection of them; every ring closed'),
});

export const regionSchema = z.object({
  id: z.string(),
  slug: z.string(),
  name: z.string(),
  /** The area as a GeoJSON MultiPolygon (simplified to about 10 m), or null when none is set yet. */
  area: z.object({ type: z.literal('MultiPolygon'), coordinates: z.array(z.array(z.array(z.array(z.number())))) }).nullable(),
});
export type Region = z.infer<typeof regionSchema>;
export const regionListSchema = z.object({ items: z.array(regionSchema) });

export const accountRegionSchema = z.strictObject({
  regionId: z.uuid({ error: 'regionId must be a region id (UUID) or null for none' }).nullable(),
});
export type AccountRegion = z.infer<typeof accountRegionSchema>;

/** The first-run path on a grower's Overview: the steps to an answer and which are done. */
export const firstRunSchema = z.object({
  region: z.object({ id: z.string(), name: z.string() }).nullable(),
  leases: z.number().int(),
  /** Rivers the grower may use: their own, their region's, and those whose plume reaches their leases. */
  rivers: z.number().int(),
  /** Of those rivers, how many have a flow record (so flood scenarios). */
  riversWithRecord: z.number().int(),
  /** Leases with at least one rating. */
  leasesRated: z.number().int(),
});
export type FirstRun = z.infer<typeof firstRunSchema>;
