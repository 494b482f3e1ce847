import { write } from '@mapbox/shp-write';
import { sql } from 'drizzle-orm';
import { zipSync } from 'fflate';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ellipsoidalArea } from '../../../shared/geometry/polygon-area';
import { checkShp } from '../../../shared/geometry/read-shp';
import { createTestApp, signIn, type TestApp } from '../../helpers/test-app';
import { geojsonBuffer, leaseCollection, rectangle } from '../../helpers/lease-fixtures';

let t: TestApp;
let grower: Awaited<ReturnType<typeof signIn>>['agent'];
let grower2: Awaited<ReturnType<typeof signIn>>['agent'];
let adviser: Awaited<ReturnType<typeof signIn>>['agent'];
let regulator: Awaited<ReturnType<typeof signIn>>['agent'];
let admin: Awaited<ReturnType<typeof signIn>>['agent'];

beforeAll(async () => {
  t = await createTestApp();
  await t.db.db.execute(sql`DELETE FROM leases`);
  grower = (await signIn(t.app, 'grower@brackline.test')).agent;
  grower2 = (await signIn(t.app, 'grower2@brackline.test')).agent;
  adviser = (await signIn(t.app, 'adviser@brackline.test')).agent;
  regulator = (await signIn(t.app, 'regulator@brackline.test')).agent;
  admin = (await signIn(t.app, 'admin@brackline.test')).agent;
});
afterAll(async () => {
  await t.close();
});

async function counts() {
  const r = await t.db.pool.query(
    'select (select count(*) from imports)::int as imports, (select count(*) from import_features)::int as features, (select count(*) from leases)::int as leases',
  );
  return r.rows[0] as { imports: number; features: number; leases: number };
}

/** Every staged feature of an upload, read page by page as a client would (the preview holds only the first 200). */
async function everyStagedFeature(id: string): Promise<{ index: number; properties: Record<string, unknown> }[]> {
  const all: { index: number; properties: Record<string, unknown> }[] = [];
  for (let offset = 0; ; offset += 1000) {
    const page = await grower.get(`/api/v1/imports/${id}/features?offset=${offset}&limit=1000`).expect(200);
    all.push(...page.body.items);
    if (page.body.items.length < 1000) return all;
  }
}

function upload(agent: typeof grower, buffer: Buffer, name: string, kind = 'lease') {
  return agent.post('/api/v1/imports').field('kind', kind).attach('file', buffer, name);
}

describe('uploading leases as GeoJSON', () => {
  it('previews, maps attributes and saves the leases', async () => {
    const fc = leaseCollection('UP', 3);
    const res = await upload(grower, geojsonBuffer(fc), 'up-leases.geojson').expect(201);
    expect(res.body).toMatchObject({ kind: 'lease', featureCount: 3, geometryTypes: ['Polygon'], crs: { found: true, epsg: 4326 } });
    expect(res.body.fields).toEqual(['LEASE_ID', 'HOLDER', 'SPECIES', 'STATUS']);
    // Areas on the ellipsoid from PostGIS geography match geographiclib's (Karney 2013) within 0.1 %.
    for (const [i, f] of res.body.features.entries()) {
      const expected = ellipsoidalArea(fc.features[i].geometry);
      expect(Math.abs(f.areaM2 - expected) / expected).toBeLessThan(1e-3);
      expect(f.bbox[0]).toBeLessThan(f.bbox[2]);
      expect(f.repaired).toBe(false);
    }
    const confirm = await grower
      .post(`/api/v1/imports/${res.body.id}/confirm`)
      .send({ mapping: { leaseId: 'LEASE_ID', holder: 'HOLDER', species: 'SPECIES', status: 'STATUS' } })
      .expect(200);
    expect(confirm.body).toMatchObject({ created: 3, updated: 0 });
    const list = await grower.get('/api/v1/leases?q=UP-&sort=leaseId').expect(200);
    expect(list.body.items.map((l: { leaseId: string }) => l.leaseId)).toEqual(['UP-001', 'UP-002', 'UP-003']);
    expect(list.body.items[0].status).toBe('candidate');
    expect(list.body.items[1].status).toBe('held');
    expect(list.body.items[0].geometry.type).toBe('MultiPolygon');
  });

  it('asks what to do with duplicate lease ids, then replaces or keeps both', async () => {
    const fc = leaseCollection('DUP', 2);
    const first = await upload(grower, geojsonBuffer(fc), 'dup.geojson').expect(201);
    await grower
      .post(`/api/v1/imports/${first.body.id}/confirm`)
      .send({ mapping: { leaseId: 'LEASE_ID' } })
      .expect(200);
    const again = await upload(grower, geojsonBuffer(fc), 'dup.geojson').expect(201);
    const conflict = await grower
      .post(`/api/v1/imports/${again.body.id}/confirm`)
      .send({ mapping: { leaseId: 'LEASE_ID' } })
      .expect(409);
    expect(conflict.body.error.details.duplicates.sort()).toEqual(['DUP-001', 'DUP-002']);
    expect(conflict.body.error.message).toMatch(/replace.*keep/);
    const replaced = await grower
      .post(`/api/v1/imports/${again.body.id}/confirm`)
      .send({ mapping: { leaseId: 'LEASE_ID' }, onDuplicate: 'replace' })
      .expect(200);
    expect(replaced.body).toMatchObject({ created: 0, updated: 2 });
    const third = await upload(grower, geojsonBuffer(fc), 'dup.geojson').expect(201);
    const kept = await grower
      .post(`/api/v1/imports/${third.body.id}/confirm`)
      .send({ mapping: { leaseId: 'LEASE_ID' }, onDuplicate: 'keep' })
      .expect(200);
    expect(kept.body).toMatchObject({ created: 2, updated: 0 });
    const list = await grower.get('/api/v1/leases?q=DUP-').expect(200);
    expect(list.body.total).toBe(4);
  });

  it('repairs a self-intersecting ring with ST_MakeValid and says so', async () => {
    const bowTie = {
      type: 'FeatureCollection',
      features: [
        {
          type: 'Feature',
          properties: { LEASE_ID: 'BOW-1' },
          geometry: {
            type: 'Polygon',
            coordinates: [
              [
                [-38.7, 41.1],
                [-38.69, 41.11],
                [-38.69, 41.1],
                [-38.7, 41.11],
                [-38.7, 41.1],
              ],
            ],
          },
        },
      ],
    };
    const res = await upload(grower, geojsonBuffer(bowTie), 'bow.geojson').expect(201);
    expect(res.body.features[0].repaired).toBe(true);
    expect(res.body.features[0].areaM2).toBeGreaterThan(0);
    expect(res.body.overview.repaired).toEqual({ count: 1, indexes: [0] });
  });

  it('refuses a mapping field the file does not have', async () => {
    const res = await upload(grower, geojsonBuffer(leaseCollection('MAP', 1)), 'map.geojson').expect(201);
    const bad = await grower
      .post(`/api/v1/imports/${res.body.id}/confirm`)
      .send({ mapping: { leaseId: 'NOPE' } })
      .expect(400);
    expect(bad.body.error.message).toMatch(/no field "NOPE"/);
  });
});

describe('bad input leaves nothing behind', () => {
  it.each([
    ['an empty file', Buffer.alloc(0), 'empty.geojson', 400],
    ['text that is neither zip nor JSON', Buffer.from('hello'), 'notes.txt', 415],
    ['a Feature instead of a FeatureCollection', geojsonBuffer(rectangle(-38.7, 41.1, 100, {})), 'one.geojson', 422],
    [
      'points where polygons are needed',
      geojsonBuffer({
        type: 'FeatureCollection',
        features: [{ type: 'Feature', properties: {}, geometry: { type: 'Point', coordinates: [-38.7, 41.1] } }],
      }),
      'pts.geojson',
      422,
    ],
    ['invalid JSON', Buffer.from('{"type": "FeatureCollection", '), 'broken.geojson', 400],
  ])('%s is refused with a message', async (_what, buffer, name, status) => {
    const before = await counts();
    const res = await upload(grower, buffer as Buffer, name as string);
    expect(res.status).toBe(status);
    expect(res.body.error.message.length).toBeGreaterThan(20);
    expect(await counts()).toEqual(before);
  });

  it('refuses a request that is not multipart with 415', async () => {
    const res = await grower.post('/api/v1/imports').send({ kind: 'lease' }).expect(415);
    expect(res.body.error.message).toMatch(/multipart/);
  });

  it('refuses a missing file with 400', async () => {
    const res = await grower.post('/api/v1/imports').field('kind', 'lease').expect(400);
    expect(res.body.error.message).toMatch(/file/);
  });

  it('refuses a file over the size limit with 413 and names the setting', async () => {
    const small = await createTestApp({ uploadLimits: { maxCompressedBytes: 1000 } });
    try {
      const agent = (await signIn(small.app, 'grower@brackline.test')).agent;
      const res = await agent
        .post('/api/v1/imports')
        .field('kind', 'lease')
        .attach('file', geojsonBuffer(leaseCollection('BIG', 20)), 'big.geojson')
        .expect(413);
      expect(res.body.error.message).toMatch(/UPLOAD_MAX_BYTES/);
    } finally {
      await small.close();
    }
  });

  it('refuses out-of-range coordinates (projected metres in a GeoJSON) with 422', async () => {
    const before = await counts();
    const metres = {
      type: 'FeatureCollection',
      features: [
        {
          type: 'Feature',
          properties: {},
          geometry: {
            type: 'Polygon',
            coordinates: [
              [
                [500000, 4500000],
                [500100, 4500000],
                [500100, 4500100],
                [500000, 4500000],
              ],
            ],
          },
        },
      ],
    };
    const res = await upload(grower, geojsonBuffer(metres), 'metres.geojson').expect(422);
    expect(res.body.error.message).toMatch(/projected|range|degrees/i);
    expect(await counts()).toEqual(before);
  });
});

describe('a file larger than one staging chunk (2 000 features)', () => {
  // Small squares on a grid in the demo sea, so that 4 500 of them stage quickly.
  const grid = (prefix: string, count: number) => ({
    type: 'FeatureCollection' as const,
    features: Array.from({ length: count }, (_, i) =>
      rectangle(-38.75 + (i % 100) * 0.003, 41.15 + Math.floor(i / 100) * 0.003, 100, { LEASE_ID: `${prefix}-${i + 1}` }),
    ),
  });

  it('stages every feature once, in file order, across the chunks', async () => {
    const res = await upload(grower, geojsonBuffer(grid('CHK', 4500)), 'chunks.geojson').expect(201);
    expect(res.body.featureCount).toBe(4500);
    // The preview holds the first 200 features and figures over all 4 500; the rest are paged.
    expect(res.body.featurePage).toEqual({ offset: 0, limit: 200, total: 4500 });
    expect(res.body.features.map((f: { index: number }) => f.index)).toEqual(Array.from({ length: 200 }, (_, i) => i));
    const features = await everyStagedFeature(res.body.id);
    expect(features.map((f) => f.index)).toEqual(Array.from({ length: 4500 }, (_, i) => i));
    expect(features[4499].properties).toEqual({ LEASE_ID: 'CHK-4500' });
    // The extent and areas over every feature agree with PostGIS over the staged rows.
    const figures = await t.db.pool.query(
      `select min(area_m2) as amin, max(area_m2) as amax, st_xmin(st_extent(geom)) as x0, st_ymax(st_extent(geom)) as y1,
              count(*) filter (where on_land)::int as on_land, (array_agg(feature_index order by feature_index) filter (where on_land))[1:100] as first_on_land
         from import_features where import_id = $1`,
      [res.body.id],
    );
    // Part of the grid runs over the demo region's land: the count is over all 4 500, the list the first 100.
    expect(res.body.overview.repaired).toEqual({ count: 0, indexes: [] });
    expect(res.body.overview.onLand).toEqual({ count: figures.rows[0].on_land, indexes: figures.rows[0].first_on_land ?? [] });
    expect(res.body.overview.areaM2.min).toBeCloseTo(figures.rows[0].amin, 6);
    expect(res.body.overview.areaM2.max).toBeCloseTo(figures.rows[0].amax, 6);
    expect(res.body.overview.bbox[0]).toBeCloseTo(figures.rows[0].x0, 9);
    expect(res.body.overview.bbox[3]).toBeCloseTo(figures.rows[0].y1, 9);
    // Someone else's upload is not there for them; a page past the end is empty.
    await grower2.get(`/api/v1/imports/${res.body.id}/features`).expect(404);
    const past = await grower.get(`/api/v1/imports/${res.body.id}/features?offset=4500`).expect(200);
    expect(past.body).toMatchObject({ offset: 4500, total: 4500, items: [] });
    const bad = await grower.get(`/api/v1/imports/${res.body.id}/features?limit=5000`).expect(400);
    expect(bad.body.error.message).toMatch(/limit/);
    const staged = await t.db.pool.query('select count(*)::int as n, count(distinct feature_index)::int as d from import_features where import_id = $1', [res.body.id]);
    expect(staged.rows[0]).toEqual({ n: 4500, d: 4500 });
  });

  it('judges the coordinates of the whole file: a projected feature in the third chunk is refused with the same message, and nothing is kept', async () => {
    const fc = grid('BAD', 4500);
    // Metres of a projected system where degrees belong (RFC 7946 §4: longitude −180…180, latitude −90…90).
    fc.features[4200].geometry.coordinates = [
      [
        [500000, 4500000],
        [500100, 4500000],
        [500100, 4500100],
        [500000, 4500000],
      ],
    ];
    const before = await counts();
    const res = await upload(grower, geojsonBuffer(fc), 'bad-chunk.geojson').expect(422);
    expect(res.body.error.code).toBe('coordinates_out_of_range');
    expect(res.body.error.message).toMatch(/^Feature 4200 has the coordinate \(500000, 4500000\), outside longitude −180…180 and latitude −90…90 \(1 feature in all\)\. The numbers look like metres/);
    expect(await counts()).toEqual(before);
  });

  // The same grid as a zipped shapefile, read streamed: its features are built chunk by chunk from the .shp and .dbf.
  const WGS84_PRJ =
    'GEOGCS["GCS_WGS_1984",DATUM["D_WGS_1984",SPHEROID["WGS_1984",6378137.0,298.257223563]],PRIMEM["Greenwich",0.0],UNIT["Degree",0.0174532925199433]]';
  function shapefileOf(fc: ReturnType<typeof grid>, patch?: (shp: Uint8Array) => void): Buffer {
    let files: { shp: Uint8Array; shx: Uint8Array; dbf: Uint8Array } | undefined;
    write(
      fc.features.map((f) => f.properties ?? {}),
      'POLYGON',
      fc.features.map((f) => f.geometry.coordinates) as object[],
      (_err, out) => {
        const bytes = (v: DataView) => new Uint8Array(v.buffer.slice(v.byteOffset, v.byteOffset + v.byteLength));
        files = { shp: bytes(out.shp as DataView), shx: bytes(out.shx as DataView), dbf: bytes(out.dbf as DataView) };
      },
    );
    patch?.(files!.shp);
    return Buffer.from(zipSync({ 'grid.shp': files!.shp, 'grid.shx': files!.shx, 'grid.dbf': files!.dbf, 'grid.prj': new TextEncoder().encode(WGS84_PRJ) }));
  }

  it('stages every feature of a streamed shapefile once, in file order', async () => {
    const res = await upload(grower, shapefileOf(grid('SHP', 4500)), 'grid.zip').expect(201);
    expect(res.body).toMatchObject({ format: 'shapefile', featureCount: 4500, geometryTypes: ['Polygon'], fields: ['LEASE_ID'] });
    const features = await everyStagedFeature(res.body.id);
    expect(features.map((f) => f.index)).toEqual(Array.from({ length: 4500 }, (_, i) => i));
    expect(features[4499].properties).toEqual({ LEASE_ID: 'SHP-4500' });
    const staged = await t.db.pool.query('select count(*)::int as n, count(distinct feature_index)::int as d from import_features where import_id = $1', [res.body.id]);
    expect(staged.rows[0]).toEqual({ n: 4500, d: 4500 });
  });

  it('refuses a streamed shapefile whose last shape is null with the whole-file message, and keeps nothing', async () => {
    const zip = shapefileOf(grid('NUL', 4500), (shp) => {
      // The last record's shape type set to 0, a null shape (ESRI Shapefile Technical Description 1998, table 1).
      const check = checkShp(shp, 'grid.shp');
      new DataView(shp.buffer).setInt32(check.offsets[4499] + 8, 0, true);
    });
    const before = await counts();
    const res = await upload(grower, zip, 'null-last.zip').expect(422);
    expect(res.body.error.code).toBe('null_geometry');
    expect(res.body.error.message).toBe(
      '1 of the 4 500 features have no geometry (null or empty): feature 4499 (counting from 0). Every feature needs a boundary: delete those features or draw their shapes in your GIS, then upload again.',
    );
    expect(await counts()).toEqual(before);
  });

  it('refuses a streamed shapefile with a projected feature in the third chunk with the whole-file message, and keeps nothing', async () => {
    const fc = grid('SHB', 4500);
    fc.features[4200].geometry.coordinates = [
      [
        [500000, 4500000],
        [500000, 4500100],
        [500100, 4500100],
        [500000, 4500000],
      ],
    ];
    const before = await counts();
    const res = await upload(grower, shapefileOf(fc), 'bad-chunk.zip').expect(422);
    expect(res.body.error.code).toBe('coordinates_out_of_range');
    expect(res.body.error.message).toMatch(/^Feature 4200 has the coordinate \(500000, 4500000\), outside longitude −180…180 and latitude −90…90 \(1 feature in all\)\. The numbers look like metres/);
    expect(await counts()).toEqual(before);
  });
});

describe('who may see and change leases', () => {
  let growerHeld: string;
  let growerCandidate: string;
  beforeAll(async () => {
    const res = await upload(grower, geojsonBuffer(leaseCollection('PRIV', 2)), 'priv.geojson').expect(201);
    const saved = await grower
      .post(`/api/v1/imports/${res.body.id}/confirm`)
      .send({ mapping: { leaseId: 'LEASE_ID', status: 'STATUS' } })
      .expect(200);
    [growerCandidate, growerHeld] = saved.body.ids;
  });

  it('another grower sees neither lease (404, not 403)', async () => {
    await grower2.get(`/api/v1/leases/${growerHeld}`).expect(404);
    await grower2.get(`/api/v1/leases/${growerCandidate}`).expect(404);
    const list = await grower2.get('/api/v1/leases?q=PRIV').expect(200);
    expect(list.body.total).toBe(0);
  });

  it("the regulator sees held leases of the jurisdiction but never a grower's candidate site", async () => {
    await regulator.get(`/api/v1/leases/${growerHeld}`).expect(200);
    await regulator.get(`/api/v1/leases/${growerCandidate}`).expect(404);
    const list = await regulator.get('/api/v1/leases?q=PRIV').expect(200);
    expect(list.body.items.map((l: { id: string }) => l.id)).toEqual([growerHeld]);
  });

  it('an adviser sees a lease only once it is shared', async () => {
    await adviser.get(`/api/v1/leases/${growerCandidate}`).expect(404);
    const adviserId = (await adviser.get('/api/v1/account/me')).body.id;
    await t.db.pool.query('insert into lease_shares (lease_id, grantee_id) values ($1, $2)', [growerCandidate, adviserId]);
    await adviser.get(`/api/v1/leases/${growerCandidate}`).expect(200);
  });

  it('only the holder changes or deletes a lease', async () => {
    const r = await regulator.patch(`/api/v1/leases/${growerHeld}`).send({ notes: 'x' }).expect(403);
    expect(r.body.error.message).toMatch(/Only the account that holds/);
    await grower2.delete(`/api/v1/leases/${growerHeld}`).expect(404);
    const ok = await grower.patch(`/api/v1/leases/${growerHeld}`).send({ species: 'blue-mussel', notes: 'moved lines' }).expect(200);
    expect(ok.body).toMatchObject({ species: 'blue-mussel', notes: 'moved lines' });
  });

  it('the admin has no access to leases', async () => {
    await admin.get('/api/v1/leases').expect(403);
  });

  it('another user cannot read or confirm my upload', async () => {
    const res = await upload(grower, geojsonBuffer(leaseCollection('MINE', 1)), 'mine.geojson').expect(201);
    await grower2.get(`/api/v1/imports/${res.body.id}`).expect(404);
    await grower2.post(`/api/v1/imports/${res.body.id}/confirm`).send({ mapping: {} }).expect(404);
  });

  it('a grower cannot upload closure zones', async () => {
    const res = await upload(grower, geojsonBuffer(leaseCollection('Z', 1)), 'zones.geojson', 'zone').expect(403);
    expect(res.body.error.message).toMatch(/closure zones/);
  });
});

describe('export', () => {
  it('exports CSV with areas and GeoJSON', async () => {
    const csv = await grower.get('/api/v1/leases/export?format=csv').expect(200);
    expect(csv.headers['content-type']).toMatch(/text\/csv/);
    const lines = csv.text.trim().split('\r\n');
    expect(lines[0]).toBe('id,lease_id,holder,species,status,area_m2,area_ha,on_land,owner,created_at,annual_rating,closure_days_per_year,harmful_salinity_chance_per_year');
    expect(lines.length).toBeGreaterThan(3);
    const gj = await grower.get('/api/v1/leases/export?format=geojson').expect(200);
    const fc = JSON.parse(gj.text);
    expect(fc.type).toBe('FeatureCollection');
    expect(fc.features[0].geometry.type).toBe('MultiPolygon');
  });
});

describe('coastlines and on-land leases', () => {
  it('flags a lease that lies wholly on a land-polygon coast', async () => {
    const before = (await t.db.pool.query('select clock_timestamp() as t')).rows[0].t;
    const land = { type: 'FeatureCollection', features: [rectangle(-38.0, 41.0, 20_000, { NAME: 'test land' })] };
    const coast = await upload(grower, geojsonBuffer(land), 'test-land.geojson', 'coast').expect(201);
    await grower.post(`/api/v1/imports/${coast.body.id}/confirm`).send({ mapping: {} }).expect(200);
    const onLand = { type: 'FeatureCollection', features: [rectangle(-38.0, 41.0, 300, { LEASE_ID: 'LAND-1' })] };
    const res = await upload(grower, geojsonBuffer(onLand), 'land-lease.geojson').expect(201);
    expect(res.body.warnings.join(' ')).toMatch(/on land/);
    // Only this test's coast: the demo coasts stay for the files after this one (a river there needs its coast).
    await t.db.pool.query('delete from coasts where created_at >= $1', [before]);
  });
});
