import { riverPlume } from './shared/physics/river-plume';
import { fieldAt } from './shared/physics/exposure-field';
import rivers from './demo-data/rivers/rivers.json';
const [am, to] = rivers.rivers as any[];
const E = Number(process.env.E ?? 3e-5);
function settingsOf(r: any, over: any = {}) {
  return { mouthLatitude: r.mouth[1], mouthWidth: r.mouthWidthM, mouthDepth: r.mouthDepthM, shelfSlope: r.shelfSlope, riverSalinity: r.riverSalinity, riverTemperature: r.riverTemperature, seaSalinity: r.seaSalinity, seaTemperature: r.seaTemperature, alongshoreShare: r.alongshoreShare, entrainmentCoefficient: E, t90DayHours: r.t90DayHours, t90NightHours: r.t90NightHours, daylightFraction: r.daylightFraction, indicator: r.indicator, nearFieldFreshwaterFraction: r.nearFieldFreshwaterFraction, ...over };
}
const dur = Number(process.env.DUR ?? 72);
for (const [r, pts] of [[am, [[11000, 300], [13000, 400], [16000, 500], [20000, 500]]], [to, [[5000, 300], [6000, 300], [8000, 500], [11000, 300]]]] as const) {
  const st = settingsOf(r);
  console.log(r.name);
  for (const q of r.name.startsWith('Amb') ? [20, 50, 100, 200, 300, 400, 500, 700, 1000, 1400] : [2, 5, 10, 20, 30, 40, 60, 80, 110, 130]) {
    const { plume, params } = riverPlume(st as any, { discharge: q, durationHours: dur });
    const row = (pts as any).map(([s, x]: number[]) => { const f = fieldAt(plume, params, s, x); return `${f.indicator.toFixed(1)}/${f.salinity.toFixed(1)}`; });
    console.log(q, 'ys', (plume.bulgeOffshoreExtent/1000).toFixed(1), 'W0', (plume.width/1000).toFixed(1), 'nose', plume.noseSpeed.toFixed(2), 'reach', ((plume.reach ?? 0)/1000).toFixed(0), row.join('  '));
  }
}
