/**
 * Issue "Lease and coast upload" benchmark: a 5 000-polygon shapefile (UTM 24 N, generated here,
 * not committed) uploaded end to end through the imports service: parse, reproject, check,
 * stage in PostGIS with validity checks and repair, confirm into leases. Peak memory sampled.
 */
import { zip as shpZip } from '@mapbox/shp-write';
import { sql } from 'drizzle-orm';
import proj4 from 'proj4';
import { createDb } from '../server/db/client';
import { seedDemo } from '../server/db/seed';
import { users } from '../server/db/schema';
import type { CurrentUser } from '../server/http/route';
import { createImportsService } from '../server/services/imports.service';
import { type BenchResult, bench } from './harness';

const UTM24N_WKT =
  'PROJCS["WGS_1984_UTM_Zone_24N",GEOGCS["GCS_WGS_1984",DATUM["D_WGS_1984",SPHEROID["WGS_1984",6378137.0,298.257223563]],PRIMEM["Greenwich",0.0],UNIT["Degree",0.0174532925199433]],PROJECTION["Transverse_Mercator"],PARAMETER["False_Easting",500000.0],PARAMETER["False_Northing",0.0],PARAMETER["Central_Meridian",-39.0],PARAMETER["Scale_Factor",0.9996],PARAMETER["Latitude_Of_Origin",0.0],UNIT["Meter",1.0]]';

export function generateLeaseShapefile(count: number): Buffer {
  const toUtm = proj4('EPSG:4326', '+proj=utm +zone=24 +datum=WGS84 +units=m +no_defs');
  const [x0, y0] = toUtm.forward([-38.9, 41.0]);
  const features = Array.from({ length: count }, (_, i) => {
    const x = x0 + (i % 100) * 400;
    const y = y0 + Math.floor(i / 100) * 400;
    // A rotated quadrilateral with a few extra vertices along each side, 150–300 m across.
    const w = 150 + (i % 7) * 20;
    const h = 150 + (i % 5) * 30;
    const ring: [number, number][] = [];
    for (const [px, py] of [
      [0, 0],
      [w / 2, -5],
      [w, 0],
      [w + 5, h / 2],
      [w, h],
      [w / 2, h + 5],
      [0, h],
      [-5, h / 2],
      [0, 0],
    ]) ring.push([x + px, y + py]);
    return { type: 'Feature' as const, properties: { LEASE_ID: `BEN-${i + 1}`, HOLDER: 'Bench Holder', STATUS: i % 3 ? 'held' : 'candidate' }, geometry: { type: 'Polygon' as const, coordinates: [ring] } };
  });
  return shpZip({ type: 'FeatureCollection', features }, { outputType: 'nodebuffer', compression: 'DEFLATE', types: { polygon: 'bench' }, prj: UTM24N_WKT } as never) as unknown as Buffer;
}

export async function uploadBenchmarks(databaseUrl: string): Promise<BenchResult[]> {
  const handle = createDb(databaseUrl, 4);
  await seedDemo(handle.db);
  const [row] = await handle.db.select().from(users).where(sql`email = 'grower3@brackline.test'`);
  const user: CurrentUser = { id: row.id, email: row.email, name: row.name, role: row.role, organisationId: row.organisationId, jurisdictionId: row.jurisdictionId };
  const imports = createImportsService({ db: handle.db });
  const zip = await generateLeaseShapefile(5000);
  let peakRss = 0;
  const sampler = setInterval(() => {
    peakRss = Math.max(peakRss, process.memoryUsage().rss);
  }, 20);
  const result = await bench(
    'upload 5 000-polygon shapefile end to end (parse, reproject, validate in PostGIS, store)',
    async () => {
      const preview = await imports.create(user, 'lease', { buffer: zip, originalname: 'bench-leases.zip' });
      await imports.confirm(user, preview.id, { mapping: { leaseId: 'LEASE_ID', holder: 'HOLDER', status: 'STATUS' }, onDuplicate: 'keep' });
    },
    { runs: 3, warmup: 1, targetMs: 10_000 },
  );
  clearInterval(sampler);
  result.note = `zip ${(zip.length / 1e6).toFixed(2)} MB; peak RSS ${(peakRss / 1e6).toFixed(0)} MB`;
  await handle.db.execute(sql`DELETE FROM leases WHERE owner_id = ${user.id}`);
  await handle.pool.end();
  return [result];
}
