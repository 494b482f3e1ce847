/**
 * Gauge records in agency formats through the API: a WaterML 2.0 series in ft³/s and a multi-column,
 * tab-separated export with comment lines and approval codes. Four water years of invented daily flows
 * (a yearly sine with one flood a year) are written in each shape by the test.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestApp, signIn, type TestApp } from '../../helpers/test-app';

let t: TestApp;
type Agent = Awaited<ReturnType<typeof signIn>>['agent'];
let adviser: Agent;
// 1 ft³ = 0.028316846592 m³, exact by the definition of the international foot.
const FT3 = 0.028316846592;

/** Four water years (2019-10-01 … 2023-09-30) of invented daily flows in ft³/s. */
function days(): { date: string; cfs: number }[] {
  const out: { date: string; cfs: number }[] = [];
  const start = Date.UTC(2019, 9, 1);
  for (let i = 0; i < 1461; i++) {
    const date = new Date(start + i * 86_400_000).toISOString().slice(0, 10);
    const flood = i % 365 === 120 ? 4000 + 500 * Math.floor(i / 365) : 0;
    out.push({ date, cfs: Math.round(800 + 400 * Math.sin((2 * Math.PI * i) / 365) + flood) });
  }
  return out;
}

beforeAll(async () => {
  t = await createTestApp();
  adviser = (await signIn(t.app, 'adviser@brackline.test')).agent;
});
afterAll(async () => {
  await t.close();
});

async function newRiver(name: string) {
  const res = await adviser
    .post('/api/v1/rivers')
    .send({ name, mouthLongitude: -38.6, mouthLatitude: 41.1, outflowAzimuthDeg: 270, mouthWidth: 40, mouthDepth: 2 })
    .expect(201);
  return res.body.id as string;
}

describe('flow records in agency formats', () => {
  it('a WaterML 2.0 series in [ft_i]3/s is read with its unit of measure and stored in m³/s', async () => {
    const id = await newRiver('Waterml Creek');
    const points = days()
      .map((d) => `<wml2:point><wml2:MeasurementTVP><wml2:time>${d.date}T00:00:00Z</wml2:time><wml2:value>${d.cfs}</wml2:value></wml2:MeasurementTVP></wml2:point>`)
      .join('\n');
    const xml = `<?xml version="1.0"?>
<wml2:MeasurementTimeseries xmlns:wml2="http://www.opengis.net/waterml/2.0" xmlns:gml="http://www.opengis.net/gml/3.2" xmlns:xlink="http://www.w3.org/1999/xlink" gml:id="ts1">
<wml2:defaultPointMetadata><wml2:DefaultTVPMeasurementMetadata><wml2:qualifier xlink:title="A"/><wml2:uom code="[ft_i]3/s"/></wml2:DefaultTVPMeasurementMetadata></wml2:defaultPointMetadata>
${points}
</wml2:MeasurementTimeseries>`;
    const res = await adviser.post(`/api/v1/rivers/${id}/flow-records`).set('Content-Type', 'application/xml').set('X-File-Name', 'waterml.xml').send(xml);
    expect(res.status, res.body?.error?.message).toBe(201);
    expect(res.body).toMatchObject({ format: 'waterml2', units: 'cfs', readings: 1461, qualityCodes: [{ code: 'A', count: 1461, provisional: false }] });
    expect(res.body.unitsNote).toMatch(/converted to m³\/s/);
    const peak = Math.max(...(res.body.annualPeaks as { discharge: number }[]).map((p) => p.discharge));
    expect(peak).toBeCloseTo(Math.max(...days().map((d) => d.cfs)) * FT3, 6);
  });

  it('a tab-separated export with # comments, a format line, several columns and P codes; provisional values dropped on request', async () => {
    const id = await newRiver('Export Creek');
    const rows = days().map((d, i) => `FGN\t0042\t${d.date}\t${d.cfs}\t${i >= 1400 ? 'P' : 'A'}`);
    const tsv = ['# Invented agency export', '# Discharge in cubic feet per second', 'agency_cd\tsite_no\tdatetime\tq_cfs\tq_cd', '5s\t15s\t20d\t14n\t10s', ...rows].join('\n');
    const res = await adviser.post(`/api/v1/rivers/${id}/flow-records?dropProvisional=true`).set('Content-Type', 'text/plain').send(tsv);
    expect(res.status, res.body?.error?.message).toBe(201);
    expect(res.body).toMatchObject({ format: 'csv', units: 'cfs', readings: 1400, droppedProvisional: 61 });
    expect(res.body.columns).toMatchObject({ date: 'datetime', discharge: 'q_cfs', quality: 'q_cd' });
    expect(res.body.qualityCodes).toEqual([
      { code: 'A', count: 1400, provisional: false },
      { code: 'P', count: 61, provisional: true },
    ]);
  });

  it('says what is wrong with a record it cannot read', async () => {
    const id = await newRiver('Broken Creek');
    const litres = await adviser
      .post(`/api/v1/rivers/${id}/flow-records`)
      .set('Content-Type', 'application/xml')
      .send('<wml2:MeasurementTimeseries xmlns:wml2="http://www.opengis.net/waterml/2.0"><wml2:defaultPointMetadata><wml2:DefaultTVPMeasurementMetadata><wml2:uom code="L/s"/></wml2:DefaultTVPMeasurementMetadata></wml2:defaultPointMetadata></wml2:MeasurementTimeseries>')
      .expect(422);
    expect(litres.body.error.message).toMatch(/unit of measure is “L\/s”; Brackline reads flows in m³\/s or ft³\/s/);
    const noSeries = await adviser.post(`/api/v1/rivers/${id}/flow-records?units=m3s`).set('Content-Type', 'application/xml').send('<kml/>').expect(422);
    expect(noSeries.body.error.message).toMatch(/no WaterML 2.0 time series/);
    const badColumn = await adviser
      .post(`/api/v1/rivers/${id}/flow-records?units=m3s&dischargeColumn=Q`)
      .set('Content-Type', 'text/csv')
      .send('date,flow\n2021-01-01,3\n')
      .expect(422);
    expect(badColumn.body.error.message).toMatch(/no column “Q”/);
  });
});
