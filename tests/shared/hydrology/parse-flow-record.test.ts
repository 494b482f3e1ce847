import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { CUBIC_METRES_PER_CUBIC_FOOT, parseFlowRecord } from '../../../shared/hydrology/parse-flow-record';

const m3s = { units: 'm3s' as const };

describe('parseFlowRecord: good records', () => {
  it('reads a daily record with a header, in m³/s', () => {
    const r = parseFlowRecord('date,discharge\n2021-01-01,12.5\n2021-01-02,13\n', m3s);
    expect(r).toEqual({
      rows: 2,
      readings: [
        { time: '2021-01-01T00:00:00.000Z', date: '2021-01-01', discharge: 12.5 },
        { time: '2021-01-02T00:00:00.000Z', date: '2021-01-02', discharge: 13 },
      ],
      problems: [],
      gaps: [],
      interval: 'daily',
      header: ['date', 'discharge'],
    });
  });

  it('converts cfs with 1 ft³ = 0.028316846592 m³ exactly', () => {
    // (a) international foot of 1959: 0.3048³ m³.
    expect(CUBIC_METRES_PER_CUBIC_FOOT).toBe(0.028316846592);
    const r = parseFlowRecord('2021-01-01,1000', { units: 'cfs' });
    expect(r.readings[0].discharge).toBeCloseTo(28.316846592, 12);
    expect(r.header).toBeNull();
  });

  it.each([
    ['Date Time,Flow (m3/s)\n2021-03-01T06:00,5\n2021-03-01T12:00,6', 'sub-daily'],
    ['"DATETIME";"Q"\n2021-03-01T06:00Z;5\n2021-03-01 12:00:00+01:00;6', 'sub-daily'],
    ['site,timestamp,discharge,flag\nA1,2021-03-01,5,e\nA1,2021-03-02,6,', 'daily'],
    ['date\ttime\tflow\n2021-03-01\t06:00\t5\n2021-03-01\t18:30\t6', 'sub-daily'],
  ])('recognises headers, delimiters and date-times (%#)', (text, interval) => {
    const r = parseFlowRecord(text, m3s);
    expect(r.problems).toEqual([]);
    expect(r.readings).toHaveLength(2);
    expect(r.interval).toBe(interval);
  });

  it('takes a zone-less time as UTC and applies offsets', () => {
    const r = parseFlowRecord('2021-03-01T06:00,5\n2021-03-01T06:00-05:00,6', m3s);
    expect(r.readings.map((x) => x.time)).toEqual(['2021-03-01T06:00:00.000Z', '2021-03-01T11:00:00.000Z']);
    expect(r.readings[1].date).toBe('2021-03-01');
  });

  it('skips blank and # comment lines and a byte-order mark', () => {
    const r = parseFlowRecord('\uFEFF# gauge 01\n\ndate,q\n\n2021-01-01,1\n,\n', m3s);
    expect(r.rows).toBe(1);
    expect(r.readings).toHaveLength(1);
  });

  it('reports missing days as gaps, not as row problems', () => {
    const r = parseFlowRecord('2021-01-01,1\n2021-01-02,1\n2021-01-06,1\n2021-01-08,1', m3s);
    expect(r.problems).toEqual([]);
    expect(r.gaps).toEqual([
      { from: '2021-01-03', to: '2021-01-05', missingDays: 3 },
      { from: '2021-01-07', to: '2021-01-07', missingDays: 1 },
    ]);
  });
});

describe('parseFlowRecord: each problem is reported with its line number', () => {
  const header = 'date,discharge\n';
  it.each([
    ['unparseable date', `${header}2021-01-01,1\n01/02/2021,2`, 3, '01/02/2021', /is not a date; write dates as YYYY-MM-DD/],
    ['impossible date', `${header}2021-02-30,2`, 2, '2021-02-30', /not a real calendar date/],
    ['impossible time', `${header}2021-02-03T25:00,2`, 2, '2021-02-03T25:00', /impossible time of day/],
    ['non-numeric value', `${header}2021-01-01,abc`, 2, 'abc', /'abc' is not a number/],
    ['number with units', `${header}2021-01-01,12 m3/s`, 2, '12 m3/s', /is not a number/],
    ['negative value', `${header}2021-01-01,-3.5`, 2, '-3.5', /is negative/],
    ['empty value', `${header}2021-01-01,`, 2, '', /the discharge is empty/],
    ['empty date', `${header},4`, 2, '', /the date is empty/],
    ['duplicate time', `${header}2021-01-01,1\n2021-01-02,1\n2021-01-01,3`, 4, '2021-01-01', /already appears on row 2/],
    ['unsorted row', `${header}2021-01-01,1\n2021-01-03,1\n2021-01-02,3`, 4, '2021-01-02', /earlier than row 3 .* sort the file/],
    ['too many columns', `${header}2021-01-01,1,234`, 2, '2021-01-01,1,234', /expected 2 columns \(date, discharge\) but found 3/],
    ['too few columns', `${header}2021-01-01`, 2, '2021-01-01', /expected 2 columns/],
  ])('%s', (_name, text, row, value, reason) => {
    const r = parseFlowRecord(text, m3s);
    const problem = r.problems.find((p) => p.row === row);
    expect(problem).toBeDefined();
    expect(problem?.value).toBe(value);
    expect(problem?.reason).toMatch(reason);
    expect(r.rows).toBe(r.readings.length + r.problems.length);
  });

  it('hints at the header names when an unrecognised header is read as data', () => {
    const r = parseFlowRecord('Day,Value\n2021-01-01,1', m3s);
    expect(r.problems[0].row).toBe(1);
    expect(r.problems[0].reason).toMatch(/if this line is a header, name its columns 'date'/);
  });

  it('counts rows after comment and blank lines by their true line numbers', () => {
    const r = parseFlowRecord('# c\n\ndate,flow\n2021-01-01,x', m3s);
    expect(r.problems[0].row).toBe(4);
  });

  it.each([['m3'], ['CFS'], [undefined]])('throws on units %s', (units) => {
    // @ts-expect-error testing bad units at run time
    expect(() => parseFlowRecord('2021-01-01,1', { units })).toThrow(/units must be 'm3s' .* or 'cfs'/);
  });
});

describe('parseFlowRecord properties (fast-check)', () => {
  const line = fc.oneof(
    fc.string({ maxLength: 30 }),
    fc
      .tuple(fc.date({ min: new Date('1900-01-01'), max: new Date('2100-01-01'), noInvalidDate: true }), fc.double())
      .map(([d, q]) => `${d.toISOString().slice(0, 10)},${q}`),
    fc.constantFrom('date,discharge', '', '#', ',', '"a,b",1', '2021-13-01,1', '2021-01-01T10:00+25:00,3'),
  );
  it('never throws on any text and accounts for every data row', () => {
    fc.assert(
      fc.property(fc.array(line, { maxLength: 40 }), fc.constantFrom('\n', '\r\n', '\r'), (lines, eol) => {
        const r = parseFlowRecord(lines.join(eol), m3s);
        expect(r.rows).toBe(r.readings.length + r.problems.length);
        for (const x of r.readings) expect(x.discharge).toBeGreaterThanOrEqual(0);
        for (let i = 1; i < r.readings.length; i++) expect(r.readings[i].time > r.readings[i - 1].time).toBe(true);
      }),
      { numRuns: 400 },
    );
  });
  it('never throws on arbitrary strings', () => {
    fc.assert(
      fc.property(fc.string({ maxLength: 400 }), (text) => {
        const r = parseFlowRecord(text, { units: 'cfs' });
        expect(r.rows).toBe(r.readings.length + r.problems.length);
      }),
      { numRuns: 400 },
    );
  });
});
