/**
 * Generates the invented Fennick coast demo region: coast, rivers and flow records, leases, closure
 * zones and monitoring data, as files a user could upload. Deterministic (every random draw comes
 * from a fixed seed); checks its own output and stops with an error if a lease touches land.
 *
 * Run: cd /work/main && npx tsx demo-data/generate.ts
 * Needs ogr2ogr (GDAL) and zip on the PATH for the zipped shapefiles.
 */
import path from 'node:path';
import { area, booleanDisjoint, booleanIntersects, kinks, multiPolygon, polygon, lineString } from '@turf/turf';
import type { Feature, MultiLineString, MultiPolygon, Point, Polygon } from 'geojson';
import { SPECIES_IDS } from '../shared/biology/species-tolerance';
import { annualMaxima } from '../shared/hydrology/annual-maxima';
import { fitFloodFrequency } from '../shared/hydrology/flood-frequency';
import { toFlowCsv } from '../shared/hydrology/synthetic-flow';
import { AMBERLIN_MOUTH, buildCoast, COAST_SEED, ISLAND_SEED, REGION_BOUNDS, TOLLEY_MOUTH, catmullRom } from './lib/coast';
import { GROWERS, JURISDICTION } from './lib/growers';
import { buildLeases, LEASE_SEED } from './lib/leases';
import { REGION_CENTRE, toLonLat, type Xy } from './lib/local-frame';
import { buildSamples, MONITORING_SEED, placeStations, samplesCsv, STATION_TABLE } from './lib/monitoring';
import { boundaryDistance, closeRing, pointInRing } from './lib/planar';
import { inlandLine, RIVER_TABLE, riverFlows } from './lib/rivers';
import { buildZones } from './lib/zones';
import { writeGeoJson, writeJson, writeText, writeZippedShapefile } from './lib/write-files';

const OUT = path.resolve(import.meta.dirname);
const UTM_EPSG = 'EPSG:32624';
/** Smallest allowed gap between a lease and the shore, and between two leases [m]. */
const MIN_SHORE_GAP = 60;
const MIN_LEASE_GAP = 40;

const lonLatRing = (ring: Xy[]) => closeRing(ring).map(toLonLat);
const out = (...parts: string[]) => path.join(OUT, ...parts);

// ---------------------------------------------------------------- coast
const coast = buildCoast();
const landFeature: Feature<MultiPolygon> = multiPolygon([[lonLatRing(coast.landRings.mainland)], [lonLatRing(coast.landRings.island)]], {
  NAME: 'Fennick Coast land',
  REGION: JURISDICTION.region,
  PARTS: 'mainland; Skerrow Island',
});
const shoreFeature: Feature<MultiLineString> = {
  type: 'Feature',
  properties: { NAME: 'Fennick Coast shoreline', REGION: JURISDICTION.region, PARTS: 'mainland (south to north); Skerrow Island' },
  geometry: { type: 'MultiLineString', coordinates: [coast.mainland.map(toLonLat), closeRing(coast.islandLine).map(toLonLat)] },
};
const landKinks = kinks(landFeature).features.length + kinks(lineString(coast.mainland.map(toLonLat))).features.length;
if (landKinks > 0) throw new Error(`the land polygon or shoreline crosses itself (${landKinks} kinks)`);
const landRingsLocal = [coast.landRings.mainland, coast.landRings.island];
const onLand = (p: Xy) => landRingsLocal.some((r) => pointInRing(p, r));

// ---------------------------------------------------------------- rivers and flows
const flows: Record<string, ReturnType<typeof riverFlows>> = {};
const riverSummaries: Record<string, { gev50: number; gev20: number; medianAnnualMax: number; meanFlow: number }> = {};
const riversJson = RIVER_TABLE.map((r) => {
  const readings = riverFlows(r);
  flows[r.name] = readings;
  writeText(out(r.flowRecordFile), toFlowCsv(readings));
  const maxima = annualMaxima(readings).filter((m) => m.complete);
  const fit = fitFloodFrequency({ annualPeaks: maxima.map((m) => m.discharge), bootstrapResamples: 0, aep: [0.5, 0.2] });
  const sorted = maxima.map((m) => m.discharge).sort((a, b) => a - b);
  riverSummaries[r.name] = {
    gev50: fit.gev.quantiles[0].discharge,
    gev20: fit.gev.quantiles[1].discharge,
    medianAnnualMax: (sorted[(sorted.length - 1) >> 1] + sorted[sorted.length >> 1]) / 2,
    meanFlow: readings.reduce((s, x) => s + x.discharge, 0) / readings.length,
  };
  const mouth = r.name === 'Amberlin River' ? AMBERLIN_MOUTH : TOLLEY_MOUTH;
  return {
    name: r.name,
    slug: r.slug,
    catchmentAreaKm2: r.catchmentAreaKm2,
    mouth: toLonLat(mouth),
    outflowAzimuthDeg: r.outflowAzimuthDeg,
    mouthWidthM: r.mouthWidthM,
    mouthDepthM: r.mouthDepthM,
    riverSalinity: r.riverSalinity,
    riverTemperature: r.riverTemperature,
    seaSalinity: r.seaSalinity,
    seaTemperature: r.seaTemperature,
    shelfSlope: r.shelfSlope,
    indicator: r.indicator,
    t90DayHours: r.t90DayHours,
    t90NightHours: r.t90NightHours,
    daylightFraction: r.daylightFraction,
    alongshoreShare: r.alongshoreShare,
    entrainmentCoefficient: r.entrainmentCoefficient,
    nearFieldFreshwaterFraction: r.nearFieldFreshwaterFraction,
    gauge: r.gauge,
    flowRecordFile: r.flowRecordFile,
  };
});
if (riversJson[0].mouth.join() !== toLonLat(coast.mainland[coast.mouthIndex.amberlin]).join())
  throw new Error('Amberlin mouth is not on the coast');
if (riversJson[1].mouth.join() !== toLonLat(coast.mainland[coast.mouthIndex.tolley]).join())
  throw new Error('Tolley mouth is not on the coast');
writeJson(out('rivers', 'rivers.json'), { region: JURISDICTION.region, rivers: riversJson });
writeGeoJson(
  out('rivers', 'river-lines.geojson'),
  'fennick-river-lines',
  RIVER_TABLE.map((r) => ({
    type: 'Feature',
    properties: { NAME: r.name, SLUG: r.slug, NOTE: 'inland centreline from the mouth upstream, for drawing only' },
    geometry: { type: 'LineString', coordinates: catmullRom(inlandLine(r), 12).map(toLonLat) },
  })),
);

// ---------------------------------------------------------------- leases
const leases = buildLeases(coast);
const problems: string[] = [];
const ids = new Set<string>();
const leaseFeatures: Feature<Polygon>[] = leases.map((l) => {
  if (ids.has(l.id)) problems.push(`${l.id}: duplicate id`);
  ids.add(l.id);
  if (!(SPECIES_IDS as readonly string[]).includes(l.species)) problems.push(`${l.id}: unknown species ${l.species}`);
  return polygon([lonLatRing(l.ring)], { LEASE_ID: l.id, HOLDER: l.holder, SPECIES: l.species, STATUS: l.status, NOTES: l.notes });
});
const landForTurf = landFeature;
const leaseReport: string[] = [];
leases.forEach((l, i) => {
  const f = leaseFeatures[i];
  const ha = area(f) / 10_000;
  if (ha < 1 || ha > 15) problems.push(`${l.id}: area ${ha.toFixed(2)} ha is outside 1–15 ha`);
  if (booleanIntersects(f, landForTurf) || !booleanDisjoint(f, landForTurf)) problems.push(`${l.id}: touches land (turf)`);
  if (l.ring.some(onLand)) problems.push(`${l.id}: a vertex is on land`);
  const gap = Math.min(...landRingsLocal.map((r) => boundaryDistance(l.ring, r)));
  if (gap < MIN_SHORE_GAP) problems.push(`${l.id}: only ${gap.toFixed(0)} m from the shore`);
  leases.forEach((o, j) => {
    if (j <= i) return;
    const d = boundaryDistance(l.ring, o.ring);
    if (d < MIN_LEASE_GAP || pointInRing(l.ring[0], o.ring) || pointInRing(o.ring[0], l.ring))
      problems.push(`${l.id} and ${o.id} overlap or are ${d.toFixed(0)} m apart`);
  });
  leaseReport.push(
    `${l.id} ${l.holder.padEnd(21)} ${l.species.padEnd(21)} ${l.status.padEnd(9)} ${ha.toFixed(1).padStart(5)} ha  shore ${gap.toFixed(0).padStart(5)} m`,
  );
});
for (const g of GROWERS) {
  const own = leases.filter((l) => l.holder === g.name);
  if (own.length === 0) problems.push(`${g.name} has no leases`);
}
if (problems.length > 0) throw new Error(`lease checks failed:\n  ${problems.join('\n  ')}`);
writeGeoJson(out('leases', 'fennick-leases.geojson'), 'fennick-leases', leaseFeatures);

// ---------------------------------------------------------------- zones
const zones = buildZones(landRingsLocal);
const zoneFeatures: Feature<Polygon>[] = zones.map(({ spec, ring }) => {
  const trigger = floorSignificant(riverSummaries[spec.RIVER].gev50, 2);
  return polygon([ring.map(toLonLat)], {
    ZONE_NAME: spec.ZONE_NAME,
    RIVER: spec.RIVER,
    TRIGGER_M3S: trigger,
    CLOSURE_DAYS: spec.CLOSURE_DAYS,
  });
});
for (const z of zoneFeatures) if (kinks(z).features.length > 0) throw new Error(`zone ${z.properties?.ZONE_NAME} crosses itself`);
writeGeoJson(out('zones', 'fennick-zones.geojson'), 'fennick-zones', zoneFeatures);
const leasesInZone = zones.map(({ spec, ring }) => ({
  zone: spec.ZONE_NAME,
  leases: leases.filter((l) => l.ring.every((p) => pointInRing(p, ring))).map((l) => l.id),
}));

// ---------------------------------------------------------------- monitoring
const placedStations = placeStations(coast);
const stationFeatures: Feature<Point>[] = placedStations.map((s) => {
  if (onLand(s.point)) throw new Error(`station ${s.STATION_ID} is on land`);
  return { type: 'Feature', properties: { STATION_ID: s.STATION_ID, NAME: s.NAME }, geometry: { type: 'Point', coordinates: toLonLat(s.point) } };
});
writeGeoJson(out('monitoring', 'stations.geojson'), 'fennick-stations', stationFeatures);
const samples = buildSamples(RIVER_TABLE, flows, placedStations, Object.fromEntries(riversJson.map((r) => [r.name, r.mouth[1]])));
writeText(out('monitoring', 'samples.csv'), samplesCsv(samples));

// ---------------------------------------------------------------- coast files and manifest
writeGeoJson(out('coast', 'fennick-land.geojson'), 'fennick-land', [landFeature]);
writeGeoJson(out('coast', 'fennick-shoreline.geojson'), 'fennick-shoreline', [shoreFeature]);
const regionCorners = [
  toLonLat([REGION_BOUNDS.minX, REGION_BOUNDS.minY]),
  toLonLat([REGION_BOUNDS.maxX, REGION_BOUNDS.maxY]),
  toLonLat([REGION_BOUNDS.minX, REGION_BOUNDS.maxY]),
  toLonLat([REGION_BOUNDS.maxX, REGION_BOUNDS.minY]),
];
writeJson(out('region.json'), {
  region: JURISDICTION.region,
  jurisdiction: { name: JURISDICTION.name, slug: JURISDICTION.slug },
  invented: 'Every place, river, organisation, person and number in this folder is invented.',
  centre: [REGION_CENTRE.lon, REGION_CENTRE.lat],
  bbox: [
    Math.min(...regionCorners.map((c) => c[0])),
    Math.min(...regionCorners.map((c) => c[1])),
    Math.max(...regionCorners.map((c) => c[0])),
    Math.max(...regionCorners.map((c) => c[1])),
  ],
  growers: GROWERS,
  files: {
    land: 'coast/fennick-land.geojson',
    shoreline: 'coast/fennick-shoreline.geojson',
    rivers: 'rivers/rivers.json',
    riverLines: 'rivers/river-lines.geojson',
    leases: 'leases/fennick-leases.geojson',
    leaseShapefiles: Object.fromEntries(GROWERS.map((g) => [g.name, `leases/${g.slug}-leases.zip`])),
    zones: 'zones/fennick-zones.geojson',
    zoneShapefile: 'zones/fennick-zones.zip',
    landShapefile: 'coast/fennick-land.zip',
    shorelineShapefile: 'coast/fennick-shoreline.zip',
    flows: Object.fromEntries(RIVER_TABLE.map((r) => [r.name, r.flowRecordFile])),
    stations: 'monitoring/stations.geojson',
    samples: 'monitoring/samples.csv',
  },
  seeds: {
    coast: COAST_SEED,
    island: ISLAND_SEED,
    leases: LEASE_SEED,
    monitoring: MONITORING_SEED,
    ...Object.fromEntries(RIVER_TABLE.map((r) => [`${r.slug}-flow`, r.flow.seed])),
  },
});

// ---------------------------------------------------------------- shapefiles (shell step)
for (const g of GROWERS) {
  writeZippedShapefile({
    source: out('leases', 'fennick-leases.geojson'),
    zipFile: out('leases', `${g.slug}-leases.zip`),
    targetSrs: UTM_EPSG,
    where: `HOLDER = '${g.name.replace(/'/g, "''")}'`,
    geometryType: 'POLYGON',
  });
}
writeZippedShapefile({
  source: out('zones', 'fennick-zones.geojson'),
  zipFile: out('zones', 'fennick-zones.zip'),
  targetSrs: UTM_EPSG,
  geometryType: 'POLYGON',
});
writeZippedShapefile({
  source: out('coast', 'fennick-land.geojson'),
  zipFile: out('coast', 'fennick-land.zip'),
  targetSrs: UTM_EPSG,
  geometryType: 'MULTIPOLYGON',
});
writeZippedShapefile({
  source: out('coast', 'fennick-shoreline.geojson'),
  zipFile: out('coast', 'fennick-shoreline.zip'),
  targetSrs: UTM_EPSG,
  geometryType: 'MULTILINESTRING',
});

// ---------------------------------------------------------------- summary
const log = (s = '') => process.stdout.write(`${s}\n`);
log(`Fennick coast demo data written to ${OUT}`);
log(`coast: ${coast.mainland.length} mainland vertices, ${coast.islandLine.length} island vertices`);
for (const r of RIVER_TABLE) {
  const s = riverSummaries[r.name];
  log(
    `${r.name}: ${flows[r.name].length} days, mean ${s.meanFlow.toFixed(1)} m3/s, median annual max ${s.medianAnnualMax.toFixed(0)}, GEV 50% AEP ${s.gev50.toFixed(0)}, 20% AEP ${s.gev20.toFixed(0)}`,
  );
}
for (const z of zoneFeatures)
  log(`zone ${z.properties?.ZONE_NAME}: trigger ${z.properties?.TRIGGER_M3S} m3/s, ${z.properties?.CLOSURE_DAYS} days`);
for (const z of leasesInZone) log(`  inside ${z.zone}: ${z.leases.join(', ')}`);
log(`leases: ${leases.length}`);
for (const line of leaseReport) log(`  ${line}`);
const censored = samples.filter((s) => s.e_coli_per_100ml.startsWith('<') || s.e_coli_per_100ml.startsWith('>')).length;
log(`samples: ${samples.length} at ${STATION_TABLE.length} stations, ${censored} censored`);
for (const s of placedStations) log(`  ${s.STATION_ID} ${s.river.padEnd(14)} s ${(s.s / 1000).toFixed(2).padStart(6)} km  x ${s.x.toFixed(0).padStart(5)} m`);
const shoreLength = coast.mainland.reduce((sum, p, i, a) => (i ? sum + Math.hypot(p[0] - a[i - 1][0], p[1] - a[i - 1][1]) : 0), 0);
log(`mainland shoreline: ${(shoreLength / 1000).toFixed(1)} km`);

/** @private Rounds down to n significant figures (a plan trigger a little under the 2-year flood). */
function floorSignificant(v: number, n: number): number {
  const step = 10 ** (Math.floor(Math.log10(v)) - n + 1);
  return Math.floor(v / step) * step;
}
