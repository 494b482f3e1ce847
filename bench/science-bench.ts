/** Issue "Science engine" benchmarks: one river × scenario, a 200 × 50 field, a flood-frequency fit on 100 years. */
import { annualMaxima } from '#shared/hydrology/annual-maxima';
import { fitFloodFrequency } from '#shared/hydrology/flood-frequency';
import { parseFlowRecord } from '#shared/hydrology/parse-flow-record';
import { generateSyntheticFlow, toFlowCsv } from '#shared/hydrology/synthetic-flow';
import { computePlume } from '#shared/physics/compute-plume';
import { exposureParameters, sampleField } from '#shared/physics/exposure-field';
import { type BenchResult, bench } from './harness';

export async function scienceBenchmarks(): Promise<BenchResult[]> {
  const input = {
    latitude: 41.2,
    discharge: 900,
    riverSalinity: 0.2,
    riverTemperature: 12,
    seaSalinity: 33.5,
    seaTemperature: 11,
    mouthWidth: 450,
    mouthDepth: 5,
    shelfSlope: 0.004,
    floodDurationHours: 72,
  };
  const settings = { entrainmentCoefficient: 3e-5, t90DayHours: 8, t90NightHours: 40, indicator: { kind: 'constant' as const, concentration: 20_000 } };
  const results: BenchResult[] = [];
  results.push(
    await bench('physics: one river × scenario (computePlume + field parameters)', () => {
      const plume = computePlume(input);
      return exposureParameters(settings, { seaSalinity: 33.5, riverSalinity: 0.2 }, input.discharge) && plume;
    }, { runs: 200, targetMs: 5 }),
  );
  const plume = computePlume(input);
  const params = exposureParameters(settings, { seaSalinity: 33.5, riverSalinity: 0.2 }, input.discharge);
  results.push(await bench('exposure field sampled at 200 × 50 points', () => sampleField(plume, params, { alongSteps: 200, acrossSteps: 50 }), { runs: 100, targetMs: 10 }));

  const readings = generateSyntheticFlow({ seed: 7, years: 100, startDate: '1920-10-01' });
  const csv = toFlowCsv(readings);
  results.push(
    await bench('flood-frequency fit on 100 years of daily data (annual maxima + GEV, LP3, Gumbel)', () => {
      const peaks = annualMaxima(readings, { waterYearStart: '10-01' }).filter((p) => p.complete);
      return fitFloodFrequency({ annualPeaks: peaks.map((p) => p.discharge), bootstrapResamples: 0 });
    }, { runs: 30, targetMs: 20 }),
  );
  results.push(
    await bench('… the same starting from the CSV text (parse 36 525 rows first)', () => {
      const parsed = parseFlowRecord(csv, { units: 'm3s' });
      const peaks = annualMaxima(parsed.readings, { waterYearStart: '10-01' }).filter((p) => p.complete);
      return fitFloodFrequency({ annualPeaks: peaks.map((p) => p.discharge), bootstrapResamples: 0 });
    }, { runs: 15, note: 'parse included' }),
  );
  return results;
}
