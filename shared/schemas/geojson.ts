/**
 * GeoJSON (RFC 7946) as zod schemas, for the API's response contracts: maps, previews, footprints
 * and downloads. Coordinates are longitude, latitude in degrees (EPSG:4326), as PostGIS's
 * ST_AsGeoJSON writes them. Source: RFC 7946 §3 (published).
 */
import { z } from 'zod';

/** [longitude, latitude] or [longitude, latitude, elevation] (RFC 7946 §3.1.1). */
export const positionSchema = z.array(z.number()).min(2).max(3).meta({ id: 'GeoJsonPosition', description: '[longitude, latitude] in degrees (EPSG:4326)' });

export const pointSchema = z.object({ type: z.literal('Point'), coordinates: positionSchema }).meta({ id: 'GeoJsonPoint' });
export const multiPointSchema = z.object({ type: z.literal('MultiPoint'), coordinates: z.array(positionSchema) }).meta({ id: 'GeoJsonMultiPoint' });
export const lineStringSchema = z.object({ type: z.literal('LineString'), coordinates: z.array(positionSchema) }).meta({ id: 'GeoJsonLineString' });
export const multiLineStringSchema = z
  .object({ type: z.literal('MultiLineString'), coordinates: z.array(z.array(positionSchema)) })
  .meta({ id: 'GeoJsonMultiLineString' });
export const polygonSchema = z
  .object({
    type: z.literal('Polygon'),
    coordinates: z.array(z.array(positionSchema)).describe('Linear rings: the outer ring first, then holes'),
  })
  .meta({ id: 'GeoJsonPolygon' });
export const multiPolygonSchema = z
  .object({ type: z.literal('MultiPolygon'), coordinates: z.array(z.array(z.array(positionSchema))) })
  .meta({ id: 'GeoJsonMultiPolygon' });

const simpleGeometries = [pointSchema, multiPointSchema, lineStringSchema, multiLineStringSchema, polygonSchema, multiPolygonSchema] as const;

/** A collection of simple geometries (ST_MakeValid can produce one from a broken polygon). */
export const geometryCollectionSchema = z
  .object({
    type: z.literal('GeometryCollection'),
    geometries: z.array(z.discriminatedUnion('type', [...simpleGeometries])),
  })
  .meta({ id: 'GeoJsonGeometryCollection' });

/** Any GeoJSON geometry (RFC 7946 §3.1). */
export const geometrySchema = z
  .discriminatedUnion('type', [...simpleGeometries, geometryCollectionSchema])
  .meta({ id: 'GeoJsonGeometry', description: 'A GeoJSON geometry (RFC 7946)' });
export type Geometry = z.infer<typeof geometrySchema>;

/** An area: a Polygon or MultiPolygon. */
export const areaGeometrySchema = z.discriminatedUnion('type', [polygonSchema, multiPolygonSchema]);

/** A Feature with the given properties (RFC 7946 §3.2). */
export function featureSchema<P extends z.ZodType, G extends z.ZodType = typeof geometrySchema>(properties: P, geometry?: G) {
  return z.object({
    type: z.literal('Feature'),
    id: z.union([z.string(), z.number()]).optional(),
    properties,
    geometry: (geometry ?? geometrySchema) as G,
  });
}

/** A FeatureCollection of the given features (RFC 7946 §3.3). */
export function featureCollectionSchema<F extends z.ZodType>(feature: F) {
  return z.object({ type: z.literal('FeatureCollection'), features: z.array(feature) });
}
