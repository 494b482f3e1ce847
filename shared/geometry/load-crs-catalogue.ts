/**
 * @module shared/geometry/load-crs-catalogue
 * Loads the EPSG catalogue (epsg-index all.json, about 8 MB, 8 112 entries) for crs-catalogue.ts, for tests
 * and scripts. The server reads it with JSON.parse instead (server/lib/crs-catalogue.ts): this static JSON
 * import costs about 100 MB more peak memory under tsx. Never import it from the browser.
 */
import catalogueJson from 'epsg-index/all.json' with { type: 'json' };
import type { CrsCatalogue } from './crs-catalogue';

/**
 * The EPSG catalogue (the same object on every call).
 *
 * @returns code → { code, kind, name, proj4, wkt, bbox, area, … }.
 * @example
 * crsDefinition(loadCrsCatalogue(), 2193)?.name // 'NZGD2000 / New Zealand Transverse Mercator 2000'
 */
export function loadCrsCatalogue(): CrsCatalogue {
  return catalogueJson as unknown as CrsCatalogue;
}
