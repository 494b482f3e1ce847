/**
 * Downloads of leases (with their yearly screening), a footprint's bands, closure zones and monitoring
 * stations as CSV, GeoJSON, GeoPackage and KML. Each layer is built once (readable field names, EPSG:4326)
 * with its readme — the model version, the cautions, the CRS and what each field means — and written in the
 * asked format: a `readme` table in the GeoPackage, the document description in KML, the FeatureCollection's
 * `metadata` member in GeoJSON. CSV stays a plain table (its point columns name the CRS).
 */
import type { Response } from 'express';
import { z } from 'zod';
import { CAUTION_TEXT } from '#shared/cautions';
import type { ExportLayer, ExportValue } from '#shared/geometry/export-layer';
import { writeKml } from '#shared/geometry/write-kml';
import { MODEL_VERSION } from '#shared/physics/model-version';
import type { Lease } from '#shared/schemas/lease';
import type { Station } from '#shared/schemas/monitoring';
import type { Zone } from '#shared/schemas/zones';
import { EXPORT_CONTENT_TYPES, type ExportFormat } from '#shared/schemas/exports';
import { BINARY_BODY, type ResponseSpec } from '../http/route';
import { writeGeoPackage } from '../lib/write-geopackage';
import { toCsv } from './leases.service';

/**
 * What an export route answers, for the OpenAPI document: one schema per format's media type (format=csv → text/csv,
 * geojson → application/geo+json, gpkg → a binary GeoPackage, kml → KML text).
 */
export function exportResponse(what: string, csv: z.ZodType, geojson: z.ZodType): Exclude<ResponseSpec, z.ZodType | null> {
  return {
    description: `${what} as a file download (Content-Disposition: attachment) in the asked format: CSV, GeoJSON, GeoPackage or KML`,
    content: {
      'text/csv': csv,
      'application/geo+json': geojson,
      'application/geopackage+sqlite3': { ...BINARY_BODY, description: 'A GeoPackage (SQLite) in EPSG:4326 with a readme table (model version, cautions, what each field means)' },
      'application/vnd.google-earth.kml+xml': z.string().describe('A KML 2.2 document in WGS 84 whose description carries the readme (model version, cautions, fields)'),
    },
  };
}

const CRS_NOTE = 'EPSG:4326 — WGS 84 longitude and latitude in decimal degrees';

/** The readme lines every export carries, then the layer's own. */
export function readmeOf(title: string, fields: [string, string][], extra: [string, string][] = [], modelVersion = MODEL_VERSION, now = new Date()): [string, string][] {
  return [
    ['Title', title],
    ['Made by', 'Brackline screening tool'],
    ['Model version', modelVersion],
    ['Coordinate reference system', CRS_NOTE],
    ['Exported at', now.toISOString()],
    ...extra,
    ['Cautions', CAUTION_TEXT.join(' ')],
    ['Ratings', 'Low, Moderate, High and Severe describe predicted exposure to flood water. None of them means a site is safe to harvest.'],
    ...fields.map(([f, meaning]) => [`Field “${f}”`, meaning] as [string, string]),
  ];
}

const round = (v: number | null | undefined, digits: number) => (v === null || v === undefined ? null : Math.round(v * 10 ** digits) / 10 ** digits);

/** Leases with their latest yearly screening: the yearly rating and the two figures it is set from (see Lease). */
export function leasesLayer(rows: Lease[]): ExportLayer {
  const fields: [string, string][] = [
    ['Lease id', 'The lease’s id as uploaded'],
    ['Holder', 'Who holds it'],
    ['Species', 'What is grown there'],
    ['Status', 'held or candidate'],
    ['Area (ha)', 'Area on the WGS 84 ellipsoid, hectares'],
    ['On land', '1 when the outline lies wholly on land according to the coastline (check the file or its CRS)'],
    [
      'Yearly rating',
      'low, moderate, high or severe, set from the two figures after it: severe from 30 closure days a year or a 1-in-2 chance, high from 10 days or 1 in 5, moderate from 2 days or 1 in 20, else low (latest screening; empty before screening)',
    ],
    ['Closure days a year', 'Expected days a year the faecal indicator on the lease is above the approved-area standard, each flood weighted by how often it happens, added over rivers (at most 365)'],
    ['Chance of harmful salinity in a year', 'Chance, 0 to 1, that a year brings a salinity event harmful to the lease’s species (rivers taken as independent)'],
    ['Owner', 'The account that holds the lease in Brackline'],
    ['Added', 'When the lease was added (UTC)'],
  ];
  return {
    name: 'leases',
    title: 'Leases with their latest yearly screening',
    fields: fields.map(([f]) => f),
    readme: readmeOf('Leases with their latest yearly screening', fields),
    features: rows
      .filter((l) => l.geometry)
      .map((l) => ({
        type: 'Feature' as const,
        geometry: l.geometry as never,
        properties: {
          'Lease id': l.leaseId,
          Holder: l.holder,
          Species: l.species,
          Status: l.status,
          'Area (ha)': round(l.areaM2 / 10_000, 4),
          'On land': l.onLand,
          'Yearly rating': l.annualRating ?? null,
          'Closure days a year': round(l.closureDaysPerYear, 2),
          'Chance of harmful salinity in a year': round(l.harmfulSalinityChancePerYear, 4),
          Owner: l.ownerName,
          Added: l.createdAt,
        } satisfies Record<string, ExportValue>,
      })),
  };
}

/** A footprint's bands (and the coast path the plume follows) for one flood. */
export function bandsLayer(fc: {
  properties: { riverName: string; scenarioName: string | null; discharge: number; durationHours: number; modelVersion: string; computedAt: string; warnings: string[] };
  features: { properties: Record<string, unknown>; geometry: unknown }[];
}): ExportLayer {
  const p = fc.properties;
  const fields: [string, string][] = [
    ['Band', 'Band id (bulge, the standard bands, salinity-under-N bands, path)'],
    ['Name', 'What the band means, in words'],
    ['Kind', 'salinity, indicator, bulge or path'],
    ['Threshold', 'The band’s limit (salinity, or indicator per 100 mL), where it has one'],
    ['Order', 'Drawing order, widest first'],
    ['River', 'The river whose plume this is'],
    ['Flood', 'The flood scenario, or the flow asked for'],
    ['Flow (m³/s)', 'River discharge of the flood'],
    ['Duration (h)', 'How long the flood lasts'],
  ];
  const flood = p.scenarioName ?? `${p.discharge} m³/s`;
  return {
    name: 'bands',
    title: `Exposure bands of ${p.riverName} at ${flood}`,
    fields: fields.map(([f]) => f),
    readme: readmeOf(
      `Exposure bands of ${p.riverName} at ${flood}`,
      fields,
      [['Footprint computed at', p.computedAt], ...(p.warnings.length ? ([['Model warnings', p.warnings.join(' ')]] as [string, string][]) : [])],
      p.modelVersion,
    ),
    features: fc.features.map((f) => ({
      type: 'Feature' as const,
      geometry: f.geometry as never,
      properties: {
        Band: String(f.properties.bandId ?? ''),
        Name: String(f.properties.name ?? ''),
        Kind: String(f.properties.kind ?? ''),
        Threshold: (f.properties.threshold as number | null | undefined) ?? null,
        Order: (f.properties.order as number | null | undefined) ?? null,
        River: p.riverName,
        Flood: flood,
        'Flow (m³/s)': p.discharge,
        'Duration (h)': p.durationHours,
      },
    })),
  };
}

/** Closure zones with their plan values and status. */
export function zonesLayer(rows: Zone[]): ExportLayer {
  const fields: [string, string][] = [
    ['Zone', 'The zone’s name'],
    ['Status', 'open, closed or reopening-pending'],
    ['Status since', 'When the status last changed (UTC)'],
    ['River', 'The river linked to the zone'],
    ['Gauge', 'The gauge whose flow triggers it'],
    ['Trigger flow (m³/s)', 'The plan’s trigger flow'],
    ['Minimum closure (days)', 'The plan’s minimum closure'],
    ['Indicator standard (per 100 mL)', 'The faecal-indicator standard for the zone'],
    ['Area (ha)', 'Area on the WGS 84 ellipsoid, hectares'],
    ['Held leases', 'Held leases that touch the zone'],
  ];
  return {
    name: 'closure_zones',
    title: 'Closure zones',
    fields: fields.map(([f]) => f),
    readme: readmeOf('Closure zones', fields),
    features: rows
      .filter((z) => z.geometry)
      .map((z) => ({
        type: 'Feature' as const,
        geometry: z.geometry as never,
        properties: {
          Zone: z.name,
          Status: z.status,
          'Status since': z.statusSince,
          River: z.riverName,
          Gauge: z.gaugeCode,
          'Trigger flow (m³/s)': z.triggerFlow,
          'Minimum closure (days)': z.minClosureDays,
          'Indicator standard (per 100 mL)': z.indicatorStandard,
          'Area (ha)': round(z.areaM2 / 10_000, 4),
          'Held leases': z.heldLeases,
        },
      })),
  };
}

/** Monitoring stations with their sample counts. */
export function stationsLayer(rows: Station[]): ExportLayer {
  const fields: [string, string][] = [
    ['Station', 'The station’s code'],
    ['Name', 'Its name'],
    ['Samples', 'Samples stored for it'],
    ['First sample', 'When the first was taken (UTC)'],
    ['Last sample', 'When the latest was taken (UTC)'],
  ];
  return {
    name: 'stations',
    title: 'Monitoring stations',
    fields: fields.map(([f]) => f),
    readme: readmeOf('Monitoring stations', fields),
    features: rows.map((s) => ({
      type: 'Feature' as const,
      geometry: { type: 'Point' as const, coordinates: [s.longitude, s.latitude] },
      properties: { Station: s.code, Name: s.name, Samples: s.samples, 'First sample': s.firstSample, 'Last sample': s.lastSample },
    })),
  };
}

/**
 * Writes a layer in the asked format and sends it as an attachment.
 *
 * @param res - the response.
 * @param layer - the layer.
 * @param format - csv, geojson, gpkg or kml.
 * @param baseName - file name without extension, e.g. 'brackline-leases-2026-12-02'.
 * @param nameField - the field naming each KML placemark.
 */
export async function sendExport(res: Response, layer: ExportLayer, format: ExportFormat, baseName: string, nameField?: string): Promise<void> {
  const ext = { csv: 'csv', geojson: 'geojson', gpkg: 'gpkg', kml: 'kml' }[format];
  res.setHeader('Content-Type', EXPORT_CONTENT_TYPES[format]);
  res.setHeader('Content-Disposition', `attachment; filename="${baseName}.${ext}"`);
  if (format === 'gpkg') {
    res.send(Buffer.from(await writeGeoPackage(layer)));
  } else if (format === 'kml') {
    res.send(writeKml(layer, nameField));
  } else if (format === 'geojson') {
    res.send(
      JSON.stringify({
        type: 'FeatureCollection',
        metadata: Object.fromEntries(layer.readme),
        features: layer.features,
      }),
    );
  } else {
    const points = layer.features.every((f) => f.geometry.type === 'Point');
    const header = [...layer.fields, ...(points ? ['Longitude (WGS 84)', 'Latitude (WGS 84)'] : [])];
    const rows = layer.features.map((f) => [
      ...layer.fields.map((k) => f.properties[k] ?? null),
      ...(points ? (f.geometry as { coordinates: number[] }).coordinates.slice(0, 2) : []),
    ]);
    // No comment lines above the header: spreadsheets and GDAL's CSV driver read the first line as the header.
    res.send(toCsv(header, rows));
  }
}
