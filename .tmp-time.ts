import { fitFloodFrequency } from './shared/hydrology/flood-frequency';
import { multipleGrubbsBeckTest, grubbsBeckTest } from './shared/hydrology/grubbs-beck';
import { fitLogPearson3 } from './shared/hydrology/log-pearson3';
const q: number[] = []; let s = 1; for (let i = 0; i < 100; i++) { s = (s * 16807) % 2147483647; q.push(100 + (s / 2147483647) * 1000); }
for (let k = 0; k < 5; k++) {
  let t0 = performance.now(); multipleGrubbsBeckTest(q); const a = performance.now() - t0;
  t0 = performance.now(); fitFloodFrequency({ annualPeaks: q, bootstrapResamples: 0 }); const b = performance.now() - t0;
  t0 = performance.now(); fitFloodFrequency({ annualPeaks: q }); const c = performance.now() - t0;
  t0 = performance.now(); fitFloodFrequency({ annualPeaks: q.slice(0, 30) }); const d = performance.now() - t0;
  console.log({ mgbt: a.toFixed(2), noBoot: b.toFixed(2), boot200: c.toFixed(2), n30: d.toFixed(2) });
}
