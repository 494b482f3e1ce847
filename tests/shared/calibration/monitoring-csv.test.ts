import { describe, expect, it } from 'vitest';
import { readSamplesCsv, readStationsCsv } from '../../../shared/calibration/monitoring-csv';

describe('readSamplesCsv', () => {
  it('reads the demo layout; detection limits stay censored values with the limit as the value', () => {
    const r = readSamplesCsv(
      'station_id,sampled_at,salinity,e_coli_per_100ml,method,temperature_c\nFB-S01,2020-12-08T13:30:00Z,21.4,>1600,MPN,10.2\nFB-S06,2021-01-23T13:45:00Z,32.7,<2,MF,\n',
    );
    expect(r.problems).toEqual([]);
    expect(r.rows[0]).toMatchObject({
      row: 2,
      stationCode: 'FB-S01',
      indicator: 1600,
      indicatorCensored: 'above',
      indicatorName: 'E. coli',
      indicatorUnit: 'MPN/100 mL',
      temperature: 10.2,
    });
    expect(r.rows[1]).toMatchObject({
      indicator: 2,
      indicatorCensored: 'below',
      method: 'MF',
      indicatorUnit: 'CFU/100 mL',
      temperature: null,
    });
  });

  it('names the indicator from its column, takes a unit column, and reads a zone-less time as UTC (said once)', () => {
    const r = readSamplesCsv(
      'site,date_time,faecal_coliforms,unit,method\nA,2024-05-01 10:30,43,MPN/100 mL,most probable number\nA,2024-05-02,12,,membrane filtration',
    );
    expect(r.problems).toEqual([]);
    expect(r.rows[0]).toMatchObject({
      sampledAt: '2024-05-01T10:30:00.000Z',
      indicatorName: 'Faecal coliforms',
      indicatorUnit: 'MPN/100 mL',
      method: 'MPN',
      salinity: null,
    });
    expect(r.rows[1]).toMatchObject({ sampledAt: '2024-05-02T00:00:00.000Z', method: 'MF' });
    expect(r.warnings).toEqual(['1 date-times had no time zone and were read as UTC.']);
  });

  it('reports every bad row with its number (header = row 1)', () => {
    const r = readSamplesCsv(
      [
        'station_id,sampled_at,salinity,e_coli_per_100ml,method,temperature',
        ',2024-01-01T00:00:00Z,30,5,MPN,10',
        'A,yesterday,30,5,MPN,10',
        'A,2024-01-03T00:00:00Z,-1,5,MPN,10',
        'A,2024-01-04T00:00:00Z,30,<0,MPN,10',
        'A,2024-01-05T00:00:00Z,30,5,qPCR,10',
        'A,2024-01-06T00:00:00Z,30,5,MPN,80',
        'A,2024-01-07T00:00:00Z,30,5,MPN,10',
        'A,2024-01-07T00:00:00Z,31,6,MPN,10',
      ].join('\n'),
    );
    expect(r.problems.map((p) => p.row)).toEqual([2, 3, 4, 5, 6, 7, 9]);
    expect(r.problems.find((p) => p.row === 9)?.message).toMatch(/appears twice \(also row 8\)/);
    expect(r.rows).toHaveLength(1);
  });

  it('refuses a header without the needed columns, naming what it found', () => {
    const r = readSamplesCsv('when,value\n2024-01-01,3');
    expect(r.problems[0]).toMatchObject({ row: 1 });
    expect(r.problems[0].message).toMatch(/lacks a station column .* Found the columns: when, value/);
  });
});

describe('readStationsCsv', () => {
  it('reads lon/lat, or x/y as projected', () => {
    expect(readStationsCsv('station_id,name,longitude,latitude\nA,Inner,-38.5,41.2').rows[0]).toEqual({
      row: 2,
      code: 'A',
      name: 'Inner',
      x: -38.5,
      y: 41.2,
    });
    const projected = readStationsCsv('code,easting,northing\nB,542000,4562000');
    expect(projected.projected).toBe(true);
    expect(projected.rows[0]).toMatchObject({ x: 542_000, y: 4_562_000 });
  });

  it('a longitude out of range with lon/lat columns is a row problem', () => {
    const r = readStationsCsv('code,lon,lat\nA,542000,4562000');
    expect(r.problems[0].row).toBe(2);
    expect(r.problems[0].message).toMatch(/not a longitude and latitude; use columns x\/y/);
  });
});
