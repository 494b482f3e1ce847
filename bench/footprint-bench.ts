/**
 * Times buildFootprint on a generated 10 000-vertex wiggly coast (no test, just a number):
 *
 *   npx tsx bench/footprint-bench.ts
 *
 * The coast runs north–south for about 100 km at 41° N (land to the east) with wiggles of
 * 20–300 m on wavelengths of 150 m to 6 km; the Amberlin River mouth is in the middle and the
 * plume (default bands, 48-hour flood) follows about 24 km of it. Prints the first (cold)
 * run and the median of 10 further runs.
 */
import { buildFootprint } from '../shared/geometry/build-footprint';
import { defaultBandSpecs } from '../shared/geometry/default-band-specs';
import { computePlume } from '../shared/physics/compute-plume';
import { exposureParameters } from '../shared/physics/exposure-field';

const VERTICES = 10_000;
const RUNS = 10;

const coordinates: [number, number][] = [];
for (let i = 0; i < VERTICES; i += 1) {
  const y = -50_000 + (100_000 * i) / (VERTICES - 1); // metres north of the mouth
  const x = 300 * Math.sin(y / 950) + 120 * Math.sin(y / 260 + 1) + 40 * Math.sin(y / 47) + 20 * Math.sin(y / 23 + 2);
  coordinates.push([-70 + x / 84_000, 41 + y / 111_050]);
}
const plume = computePlume({
  latitude: 41,
  discharge: 150,
  reducedGravity: 0.02,
  mouthWidth: 800,
  mouthDepth: 1.5,
  floodDurationHours: 48,
});
const params = exposureParameters(
  { mixingLength: 12_000, t90DayHours: 6, t90NightHours: 48, indicator: { kind: 'constant', concentration: 1e4 } },
  { seaSalinity: 34, riverSalinity: 0 },
  150,
);
const input = {
  coast: { type: 'LineString' as const, coordinates },
  mouth: [coordinates[VERTICES / 2][0] - 0.002, 41] as [number, number],
  outflowAzimuth: 270,
  plume,
  params,
  bands: defaultBandSpecs({ speciesSalinityThreshold: 12, indicatorStandard: 14 }),
};

const time = () => {
  const start = performance.now();
  const result = buildFootprint(input);
  return { ms: performance.now() - start, result };
};
const cold = time();
const times: number[] = [];
for (let i = 0; i < RUNS; i += 1) times.push(time().ms);
times.sort((a, b) => a - b);
const median = (times[RUNS / 2 - 1] + times[RUNS / 2]) / 2;
const vertices = cold.result.bands.map((b) => JSON.stringify(b.geometry.coordinates).split('],[').length);
console.log(`buildFootprint, ${VERTICES}-vertex coast, ${input.bands.length} bands`);
console.log(`  cold run: ${cold.ms.toFixed(0)} ms`);
console.log(`  median of ${RUNS}: ${median.toFixed(0)} ms (min ${times[0].toFixed(0)}, max ${times[RUNS - 1].toFixed(0)})`);
console.log(`  walked ${(cold.result.path.properties.lengthM / 1000).toFixed(1)} km of coast; band vertices ${vertices.join(', ')}`);
console.log(`  warnings: ${cold.result.warnings.length ? cold.result.warnings.join(' | ') : 'none'}`);
