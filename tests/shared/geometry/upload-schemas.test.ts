import { describe, expect, it } from 'vitest';
import { importConfirmBodySchema, importCrsBodySchema, importResponseSchema, uploadKindSchema } from '../../../shared/schemas/upload';

const messages = (r: { success: boolean; error?: { issues: { message: string }[] } }): string =>
  r.error?.issues.map((i) => i.message).join(' | ') ?? '';

describe('upload schemas', () => {
  it('accepts the three kinds only', () => {
    expect(uploadKindSchema.parse('coast')).toBe('coast');
    expect(messages(uploadKindSchema.safeParse('river'))).toMatch(/kind must be 'lease', 'coast' or 'zone'/);
  });

  it('accepts an import response and strips unknown members', () => {
    const body = {
      id: '0b6f3c1e-6a57-4c8e-9a57-3f1d2b9e4c21',
      kind: 'lease',
      crs: { found: true, epsg: 32630, wkt: 'PROJCS["WGS_1984_UTM_Zone_30N"]', name: 'WGS_1984_UTM_Zone_30N' },
      featureCount: 2,
      geometryTypes: ['Polygon'],
      fields: ['LEASE_ID'],
      warnings: [],
      overview: {
        bbox: [-3, 47.56, -2.9465, 47.5835],
        areaM2: { min: 94092.4, max: 94092.4, total: 94092.4 },
        repaired: { count: 1, indexes: [1] },
        onLand: { count: 0, indexes: [] },
      },
      featurePage: { offset: 0, limit: 200, total: 2 },
      features: [
        { index: 0, properties: { LEASE_ID: 'FB-014' }, areaM2: 94092.4, bbox: [-2.951, 47.581, -2.9465, 47.5835], repaired: false },
        { index: 1, properties: {}, areaM2: null, bbox: [-3, 47.56, -2.97, 47.565], repaired: true },
      ],
    };
    const parsed = importResponseSchema.parse(body);
    expect(parsed.crs).toEqual({ found: true, epsg: 32630, wkt: 'PROJCS["WGS_1984_UTM_Zone_30N"]' });
    expect(importResponseSchema.safeParse({ ...body, features: [{ ...body.features[0], bbox: [1, 2, 3] }] }).success).toBe(false);
    // The figures over every feature are part of the contract: a preview without them is refused.
    const { overview: _overview, ...withoutOverview } = body;
    expect(importResponseSchema.safeParse(withoutOverview).success).toBe(false);
  });

  it.each([
    [{ epsg: 2193 }, null],
    [{ epsg: '2193' }, /epsg must be a number/],
    [{ epsg: 2193.5 }, /epsg must be a whole number/],
    [{ epsg: 12 }, /epsg must be an EPSG code from 1024 to 999999/],
    [{ epsg: 2193, name: 'x' }, /name/],
    [{}, /epsg must be a number/],
  ])('CRS body %j', (body, message) => {
    const r = importCrsBodySchema.safeParse(body);
    if (message === null) expect(r.success).toBe(true);
    else {
      expect(r.success).toBe(false);
      expect(messages(r)).toMatch(message);
    }
  });

  it.each([
    [{ mapping: { leaseId: 'LEASE_ID', holder: 'HOLDER', species: 'SPECIES', status: 'STATUS' }, onDuplicate: 'replace' }, null],
    [{ mapping: {} }, null],
    [{ mapping: { leaseId: '' } }, /mapping\.leaseId must not be empty/],
    [{ mapping: { leaseId: 3 } }, /mapping\.leaseId must be the name of one of the file’s attributes/],
    [{ mapping: { lease: 'x' } }, /lease/],
    [{ mapping: {}, onDuplicate: 'merge' }, /onDuplicate must be 'replace' .* or 'keep'/],
    [{ mapping: 'LEASE_ID' }, /mapping must be an object/],
    [{ mapping: {}, extra: true }, /extra/],
  ])('confirm body %j', (body, message) => {
    const r = importConfirmBodySchema.safeParse(body);
    if (message === null) expect(r.success).toBe(true);
    else {
      expect(r.success).toBe(false);
      expect(messages(r)).toMatch(message);
    }
  });
});
