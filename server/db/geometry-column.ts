import { customType } from 'drizzle-orm/pg-core';
import type { Geometry } from 'geojson';

/**
 * A PostGIS geometry column in EPSG:4326. Drizzle's built-in geometry() covers points only
 * (stack.md gotcha 9). Values are written from GeoJSON; read them back with ST_AsGeoJSON in SQL.
 */
export const geometryColumn = (name: string, type: 'MultiPolygon' | 'Geometry' | 'MultiLineString' | 'Point') =>
  customType<{ data: Geometry; driverData: string }>({
    dataType: () => `geometry(${type},4326)`,
    toDriver: (v) => JSON.stringify(v),
  })(name);
