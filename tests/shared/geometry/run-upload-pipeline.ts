/**
 * The upload pipeline as the server runs it, for tests: readUpload → reprojectLayer (when the CRS is
 * known) → checkCoordinates. Returns the parsed upload, the reprojected layers and all warnings, or the
 * UploadError thrown at any step. With `stream`, the file is read as the first upload reads it (readUpload's
 * `stream` option) and a streamed layer's features are then gathered from its chunks, so both reads can be held to
 * the same expectations.
 */
import type { Feature, Geometry } from 'geojson';
import initSqlJs from 'sql.js';
import { checkCoordinates } from '../../../shared/geometry/check-coordinates';
import { identifyCrs } from '../../../shared/geometry/crs-catalogue';
import { loadCrsCatalogue } from '../../../shared/geometry/load-crs-catalogue';
import { layerChunks, type ParsedUpload, type UploadKind } from '../../../shared/geometry/parsed-upload';
import { type OpenSqlite, readUpload, type UploadLimits } from '../../../shared/geometry/read-upload';
import { reprojectLayer } from '../../../shared/geometry/reproject';
import { isUploadError, type UploadError } from '../../../shared/geometry/upload-error';

/** GeoPackages are opened with sql.js, as the server does (server/lib/sqlite.ts). */
const openSqlite: OpenSqlite = async (bytes) => new (await initSqlJs()).Database(bytes);

export interface PipelineResult {
  parsed?: ParsedUpload;
  /** Per layer: EPSG:4326 features, or null when the layer's CRS is unknown. */
  reprojected: (Feature<Geometry>[] | null)[];
  warnings: string[];
  error?: UploadError;
}

export async function runUploadPipeline(
  bytes: Uint8Array,
  fileName: string,
  kind: UploadKind,
  limits?: Partial<UploadLimits>,
  expectedBbox?: [number, number, number, number],
  choices: { layer?: string; tracksAsPolygons?: boolean; stream?: boolean } = {},
): Promise<PipelineResult> {
  const catalogue = loadCrsCatalogue();
  try {
    const read = await readUpload(bytes, fileName, kind, limits, { identifyEpsg: (wkt) => identifyCrs(catalogue, wkt), openSqlite, ...choices });
    const parsed: ParsedUpload = {
      ...read,
      layers: read.layers.map(({ stream, ...layer }) => ({ ...layer, features: [...layerChunks({ features: layer.features, stream }, 2_000)].flat() })),
    };
    const warnings = [...parsed.warnings];
    const reprojected = parsed.layers.map((layer) => {
      if (!layer.crs.found) return null;
      const features = reprojectLayer(layer, { wkt: layer.crs.wkt, epsg: layer.crs.epsg }, catalogue);
      warnings.push(...checkCoordinates(features, { expectedBbox, layerName: parsed.layers.length > 1 ? layer.name : undefined }));
      return features;
    });
    return { parsed, reprojected, warnings };
  } catch (e) {
    if (isUploadError(e)) return { reprojected: [], warnings: [], error: e };
    throw e;
  }
}
