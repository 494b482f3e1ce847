/** A 30-year invented flow record whose larger floods last longer (tests of issue 14). */
import { uniformFloat64 } from 'pure-rand/distribution/uniformFloat64';
import { xoroshiro128plus } from 'pure-rand/generator/xoroshiro128plus';
import type { FlowReading } from '../../shared/hydrology/parse-flow-record';

/**
 * A 30-year synthetic daily record (invented): base flow 30 m³/s with one flood a year whose peak
 * above base is Gumbel-distributed (location 300, scale 120 m³/s, seeded) and whose hydrograph
 * rises over a day and recedes with an e-folding time of 2 days × (peak/300)^0.5, so larger floods
 * last longer, (c) a common observation for a catchment (larger storms are longer), chosen here.
 */
export function syntheticRecord(): FlowReading[] {
  const rng = xoroshiro128plus(4141);
  const out: FlowReading[] = [];
  const start = Date.UTC(1990, 3, 1);
  const years = 30;
  const days = Math.round(years * 365.25);
  const q = new Array<number>(days).fill(30);
  for (let y = 0; y < years; y += 1) {
    const u = Math.min(1 - 1e-9, Math.max(1e-9, uniformFloat64(rng)));
    const peak = 300 - 120 * Math.log(-Math.log(u));
    const recession = 2 * Math.sqrt(Math.max(peak, 30) / 300);
    const day = Math.round(y * 365.25) + 90 + Math.floor(120 * uniformFloat64(rng));
    q[day] += peak / 2;
    for (let j = 1; j < 60 && day + j < days; j += 1) q[day + j] += peak * Math.exp(-(j - 1) / recession);
  }
  for (let i = 0; i < days; i += 1) {
    const t = new Date(start + i * 86_400_000).toISOString();
    out.push({ time: t, date: t.slice(0, 10), discharge: q[i] });
  }
  return out;
}


/** The record as a daily CSV (date,discharge). */
export function syntheticRecordCsv(): string {
  return ['date,discharge', ...syntheticRecord().map((r) => `${r.date},${r.discharge.toFixed(3)}`)].join('\n');
}
