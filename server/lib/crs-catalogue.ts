/**
 * The EPSG catalogue (epsg-index all.json, about 8 MB, 8 112 entries) for the server, read once per process
 * on first use with JSON.parse. A static `import … with { type: 'json' }` of the same file costs about
 * 137 MB of peak RSS under tsx (the 8 MB object literal is compiled as code) against about 32 MB for
 * JSON.parse (measured with process.memoryUsage in bench/upload-child.ts's process), and it was paid by
 * every process that imported the imports service, whether or not it ever read a .prj.
 */
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import type { CrsCatalogue } from '#shared/geometry/crs-catalogue';

const require = createRequire(import.meta.url);
let catalogue: CrsCatalogue | null = null;

/** The catalogue (the same object on every call): code → { code, kind, name, proj4, wkt, bbox, area, … }. */
export function loadCrsCatalogue(): CrsCatalogue {
  catalogue ??= JSON.parse(readFileSync(require.resolve('epsg-index/all.json'), 'utf8')) as CrsCatalogue;
  return catalogue;
}
