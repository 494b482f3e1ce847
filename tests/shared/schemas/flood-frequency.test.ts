import { describe, expect, it } from 'vitest';
import { floodFrequencyRequestSchema } from '../../../shared/schemas/flood-frequency';
import { flowRecordQuerySchema } from '../../../shared/schemas/flow-record';

const messages = (r: { success: boolean; error?: { issues: { message: string }[] } }): string =>
  r.error?.issues.map((i) => i.message).join(' | ') ?? '';

describe('floodFrequencyRequestSchema', () => {
  it('accepts a minimal and a full body', () => {
    expect(floodFrequencyRequestSchema.safeParse({ annualPeaks: [1, 2, 3] }).success).toBe(true);
    expect(
      floodFrequencyRequestSchema.safeParse({ annualPeaks: [1, 2, 3], aep: [0.01], regionalSkew: 0.6, regionalSkewMse: 0.302 }).success,
    ).toBe(true);
  });
  it.each([
    [{ annualPeaks: [1, 2] }, /annualPeaks must hold at least 3 peaks/],
    [{ annualPeaks: [1, 0, 3] }, /annualPeaks must all be greater than 0/],
    [{ annualPeaks: Array.from({ length: 10001 }, () => 1) }, /at most 10000 peaks/],
    [{ annualPeaks: [1, 2, 3], aep: [0] }, /aep values must be between 0 and 1/],
    [{ annualPeaks: [1, 2, 3], aep: [1] }, /aep values must be between 0 and 1/],
    [{ annualPeaks: [1, 2, 3], regionalSkew: 3.5 }, /regionalSkew must be between -3 and 3/],
    [{ annualPeaks: [1, 2, 3], regionalSkewMse: 0 }, /regionalSkewMse must be greater than 0/],
    [{ annualPeaks: [1, 2, 3], seed: 4 }, /seed/],
    [{ annualPeaks: 'x' }, /annualPeaks must be an array of numbers/],
  ])('refuses %#', (body, message) => {
    const r = floodFrequencyRequestSchema.safeParse(body);
    expect(r.success).toBe(false);
    expect(messages(r)).toMatch(message);
  });
});

describe('flowRecordQuerySchema', () => {
  it('accepts units and a water-year start', () => {
    expect(flowRecordQuerySchema.parse({ units: 'cfs', waterYearStart: '07-01' })).toEqual({ units: 'cfs', waterYearStart: '07-01' });
  });
  it.each([
    [{ units: 'm3' }, /units must be 'm3s'/],
    [{ units: 'm3s', waterYearStart: '02-29' }, /not 02-29/],
    [{ units: 'm3s', waterYearStart: '2021-10-01' }, /MM-DD/],
    [{ units: 'm3s', extra: 1 }, /extra/],
  ])('refuses %#', (query, message) => {
    const r = flowRecordQuerySchema.safeParse(query);
    expect(r.success).toBe(false);
    expect(messages(r)).toMatch(message);
  });
});
