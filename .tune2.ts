import { riverPlume } from './shared/physics/river-plume';
import { fieldAt } from './shared/physics/exposure-field';
import rivers from './demo-data/rivers/rivers.json';
const [am, to] = rivers.rivers as any[];
const env = (k: string, d: number) => Number(process.env[k] ?? d);
function settingsOf(r: any, p: string) {
  return { mouthLatitude: r.mouth[1], mouthWidth: r.mouthWidthM, mouthDepth: r.mouthDepthM, shelfSlope: r.shelfSlope, riverSalinity: r.riverSalinity, riverTemperature: r.riverTemperature, seaSalinity: r.seaSalinity, seaTemperature: r.seaTemperature, alongshoreShare: r.alongshoreShare,
    entrainmentCoefficient: env(p + 'E', 3e-5), t90DayHours: env(p + 'TD', r.t90DayHours), t90NightHours: env(p + 'TN', r.t90NightHours), daylightFraction: 0.5,
    indicator: { kind: 'power-law', coefficient: env(p + 'A', r.indicator.coefficient), exponent: 1.2 }, nearFieldFreshwaterFraction: env(p + 'PHI', 0.5) };
}
for (const [r, p, s0, plan] of [[am, 'AM', env('AMS0', 10600), 480], [to, 'TO', env('TOS0', 5000), 57]] as const) {
  const st = settingsOf(r, p);
  let trig = null;
  for (let i = 0; i < 200; i++) {
    const q = plan / 50 * (100 ** (i / 199));
    const { plume, params } = riverPlume(st as any, { discharge: q, durationHours: 72 });
    let hit = false;
    for (let s = s0; s <= s0 + 3000; s += 250) for (let x = 50; x <= 2000; x += 150) if (fieldAt(plume, params, s, x).indicator > 14) hit = true;
    if (hit) { trig = q; break; }
  }
  console.log(r.name, 'trigger', trig?.toFixed(1), 'plan', plan, 'ratio', trig ? (trig / plan).toFixed(2) : '-');
}
