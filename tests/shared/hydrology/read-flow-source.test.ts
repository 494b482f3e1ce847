/**
 * Gauge records as agencies publish them (hand-written fixtures with invented values in
 * tests/shared/hydrology/fixtures/agency): WaterML 2.0 time series (OGC 10-126r4) and multi-column CSV /
 * tab-separated exports with comment lines, quality codes, ft³/s and sub-daily readings with UTC offsets.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { parseFlowRecord } from '../../../shared/hydrology/parse-flow-record';
import { FlowSourceError, isProvisional, readFlowSource, unitsOf } from '../../../shared/hydrology/read-flow-source';

const fixture = (name: string) => readFileSync(path.resolve(import.meta.dirname, 'fixtures/agency', name), 'utf8');
// 1 ft³ = 0.3048³ m³ = 0.028316846592 m³, exact by the definition of the international foot (1959).
const FT3 = 0.028316846592;

describe('WaterML 2.0', () => {
  it('reads the unit of measure ([ft_i]3/s, UCUM), converts to m³/s and says so; keeps the qualifiers', () => {
    const r = readFlowSource(fixture('tolley-daily-waterml2.xml'), { units: 'auto' });
    expect(r.format).toBe('waterml2');
    expect(r.units).toBe('cfs');
    expect(r.unitsNote).toMatch(/ft³\/s \(from the unit of measure “\[ft_i\]3\/s”\) and converted to m³\/s \(1 ft³ = 0\.028316846592 m³/);
    expect(r.readings.map((x) => x.discharge)).toEqual([100 * FT3, 250 * FT3, 1000 * FT3, 400 * FT3]);
    expect(r.readings[0].discharge).toBeCloseTo(2.8316846592, 12);
    expect(r.readings.map((x) => x.quality)).toEqual(['A', 'A', 'P', 'P']);
    // The gauge's own day as written, and the instant in UTC (−05:00 → 05:00Z).
    expect(r.readings[0]).toMatchObject({ date: '2023-03-01', time: '2023-03-01T05:00:00.000Z' });
    // The nil value of point 3 is reported as row 4 (points count from row 2), not dropped silently.
    expect(r.problems).toEqual([expect.objectContaining({ row: 4, value: '' })]);
    expect(r.qualityCodes).toEqual([
      { code: 'A', count: 3, provisional: false },
      { code: 'P', count: 2, provisional: true },
    ]);
  });

  it('drops provisional values on request and counts them', () => {
    const r = readFlowSource(fixture('tolley-daily-waterml2.xml'), { units: 'auto', dropProvisional: true });
    expect(r.readings.map((x) => x.quality)).toEqual(['A', 'A']);
    expect(r.droppedProvisional).toBe(2);
  });

  it('uses the file’s unit over a conflicting choice, with a warning', () => {
    const r = readFlowSource(fixture('tolley-daily-waterml2.xml'), { units: 'm3s' });
    expect(r.units).toBe('cfs');
    expect(r.warnings.join(' ')).toMatch(/the file's unit of measure was used/);
  });

  it('turns a sub-daily series with a +10:00 offset into daily maxima or means per day as written', () => {
    const r = readFlowSource(fixture('amberlin-15min-waterml2.xml'), { units: 'auto' });
    expect(r.interval).toBe('sub-daily');
    // Hand computation: 10 June: 12, 18 → max 18, mean 15; 11 June: 30, 24, 21 → max 30, mean 25.
    expect(r.daily).toEqual([
      { date: '2024-06-10', max: 18, mean: 15, count: 2 },
      { date: '2024-06-11', max: 30, mean: 25, count: 3 },
    ]);
    expect(r.readings[2].time).toBe('2024-06-10T14:00:00.000Z'); // 00:00+10:00
    const max = readFlowSource(fixture('amberlin-15min-waterml2.xml'), { units: 'auto', daily: 'max' });
    expect(max.interval).toBe('daily');
    expect(max.aggregated).toBe('max');
    expect(max.readings.map((x) => [x.date, x.discharge])).toEqual([
      ['2024-06-10', 18],
      ['2024-06-11', 30],
    ]);
    expect(max.readings[1].quality).toBe('good/unchecked');
    const mean = readFlowSource(fixture('amberlin-15min-waterml2.xml'), { units: 'auto', daily: 'mean' });
    expect(mean.readings.map((x) => x.discharge)).toEqual([15, 25]);
  });

  it('refuses XML without a time series, broken XML and units other than m³/s or ft³/s', () => {
    expect(() => readFlowSource('<gpx/>', { units: 'auto' })).toThrow(/no WaterML 2.0 time series/);
    expect(() => readFlowSource('<wml2:MeasurementTimeseries xmlns:wml2="x"><wml2:point>', { units: 'auto' })).toThrow(FlowSourceError);
    const litres = fixture('amberlin-15min-waterml2.xml').replace('code="m3/s"', 'code="L/s"');
    expect(() => readFlowSource(litres, { units: 'auto' })).toThrow(/unit of measure is “L\/s”/);
  });
});

describe('agency CSV and tab-separated exports', () => {
  it('skips # comments and the format line, guesses date, flow and code columns, reads cfs from the column name', () => {
    const r = readFlowSource(fixture('fennick-gauge-export.tsv'), { units: 'auto' });
    expect(r.columns).toMatchObject({ date: 'datetime', discharge: 'q_mean_cfs', quality: 'q_mean_cd', guessed: true });
    expect(r.units).toBe('cfs');
    expect(r.readings.map((x) => x.discharge)).toEqual([350 * FT3, 420 * FT3, 1200 * FT3, 980 * FT3]);
    expect(r.readings[2].discharge).toBeCloseTo(33.9802159104, 10);
    expect(r.readings.map((x) => x.quality)).toEqual(['A', 'A:e', 'P', 'P']);
    expect(r.problems).toEqual([]);
    expect(r.rows).toBe(4);
  });

  it('joins separate date and time columns, keeps quality words, and summarises the sub-daily days', () => {
    const r = readFlowSource(fixture('marrow-multi-column.csv'), { units: 'auto' });
    expect(r.columns).toMatchObject({ date: 'Date', discharge: 'Flow (m3/s)', quality: 'Quality' });
    expect(r.units).toBe('m3s');
    expect(r.readings[1]).toMatchObject({ time: '2023-12-01T21:00:00.000Z', discharge: 60.25, quality: 'Good' });
    // 1 December: 45.5 and 60.25 → max 60.25, mean 52.875.
    expect(r.daily?.[0]).toEqual({ date: '2023-12-01', max: 60.25, mean: 52.875, count: 2 });
  });

  it('takes the columns the user picks, and reports rows with the file’s own line numbers', () => {
    const text = fixture('marrow-multi-column.csv').replace('MR-07,2023-12-02,09:00,1.31,52.0', 'MR-07,2023-12-02,09:00,1.31,n/a');
    const r = readFlowSource(text, { units: 'm3s', dischargeColumn: 'Stage (m)', qualityColumn: '' });
    expect(r.columns).toMatchObject({ discharge: 'Stage (m)', quality: null, guessed: true });
    expect(r.readings.map((x) => x.discharge)).toEqual([1.2, 1.42, 1.31, 1.18]);
    const flows = readFlowSource(text, { units: 'm3s', dateColumn: 'Date', dischargeColumn: 'Flow (m3/s)' });
    expect(flows.problems).toEqual([expect.objectContaining({ row: 6, value: 'n/a' })]);
    expect(() => readFlowSource(text, { units: 'm3s', dischargeColumn: 'Q' })).toThrow(/no column “Q” for the flow\. Its columns are: “Station”, “Date”/);
  });

  it('takes m³/s, and says so, when neither the header nor a comment names the units', () => {
    const r = readFlowSource('date,flow\n2021-01-01,3\n', { units: 'auto' });
    expect(r.units).toBe('m3s');
    expect(r.readings[0].discharge).toBe(3);
    expect(r.unitsNote).toMatch(/taken as m³\/s: the file does not name its units/);
    expect(r.warnings.join(' ')).toMatch(/column “flow” names no unit.*If they are ft³\/s, choose that unit/);
    expect(readFlowSource('date,flow\n2021-01-01,3\n', { units: 'm3s' }).warnings).toEqual([]);
  });

  it('reads the old two-column record exactly as before', () => {
    const text = 'date,discharge\n2021-01-01,12.5\n2021-01-02,abc\n2021-01-04,9\n';
    const r = readFlowSource(text, { units: 'm3s' });
    const before = parseFlowRecord(text, { units: 'm3s' });
    expect(r.readings).toEqual(before.readings);
    expect(r.problems).toEqual([expect.objectContaining({ row: 3, value: 'abc' })]);
    expect(r.problems[0].row).toBe(before.problems[0].row);
    expect(r.gaps).toEqual(before.gaps);
  });
});

describe('codes and units', () => {
  it('tells provisional codes (common practice: P in agency exports, WaterML "unchecked")', () => {
    expect(['P', 'p', 'Provisional', 'unchecked'].map(isProvisional)).toEqual([true, true, true, true]);
    expect(['A', 'e', 'good', 'A:e'].map(isProvisional)).toEqual([false, false, false, false]);
  });
  it('reads unit notes', () => {
    expect(['[ft_i]3/s', 'Flow (ft³/s)', 'q_cfs', 'm3/s', 'Discharge (m³/s)', 'L/s'].map(unitsOf)).toEqual(['cfs', 'cfs', 'cfs', 'm3s', 'm3s', undefined]);
  });
});
