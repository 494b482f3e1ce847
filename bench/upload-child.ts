/**
 * One upload case of bench/upload-bench.ts in its own process: reads the file the parent generated, uploads and
 * confirms it through the imports service `runs` times, and prints one JSON line with the times and the process's
 * peak RSS (getrusage maxrss, which counts every byte the process held at its worst moment).
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { sql } from 'drizzle-orm';
import { createDb } from '../server/db/client';
import { users } from '../server/db/schema';
import { seedDemo } from '../server/db/seed';
import type { CurrentUser } from '../server/http/route';
import { createImportsService } from '../server/services/imports.service';

async function main() {
  const [filePath, runsText] = process.argv.slice(2);
  const runs = Number(runsText ?? 1);
  const handle = createDb(process.env.DATABASE_URL!, 4);
  await seedDemo(handle.db);
  const [row] = await handle.db.select().from(users).where(sql`email = 'grower3@brackline.test'`);
  const user: CurrentUser = {
    id: row.id,
    email: row.email,
    name: row.name,
    role: row.role,
    organisationId: row.organisationId,
    jurisdictionId: row.jurisdictionId,
  };
  const imports = createImportsService({ db: handle.db });
  // What the process holds before any file exists (Node, tsx, the modules, a pool): the upload's own share is the rest.
  const startRssMb = (process.resourceUsage().maxRSS * 1024) / 1e6;
  // The bytes as the server holds an upload (multer's memory storage): one Buffer.
  const file = readFileSync(filePath);
  const name = path.basename(filePath);
  const uploadMs: number[] = [];
  const confirmMs: number[] = [];
  let stored = 0;
  // One warm-up for the repeated case, so the first run's compilation is not measured.
  for (let i = 0; i < (runs > 1 ? runs + 1 : runs); i++) {
    await handle.db.execute(sql`DELETE FROM leases WHERE owner_id = ${user.id} AND (lease_code LIKE 'BEN-%' OR lease_code LIKE 'BIG-%')`);
    const t0 = performance.now();
    const preview = await imports.create(user, 'lease', { buffer: file, originalname: name });
    const t1 = performance.now();
    const res = await imports.confirm(user, preview.id, {
      mapping: { leaseId: 'LEASE_ID', holder: 'HOLDER', status: 'STATUS' },
      onDuplicate: 'keep',
    });
    const t2 = performance.now();
    stored = res.created;
    if (runs > 1 && i === 0) continue;
    uploadMs.push(t1 - t0);
    confirmMs.push(t2 - t1);
  }
  await handle.db.execute(sql`DELETE FROM leases WHERE owner_id = ${user.id} AND (lease_code LIKE 'BEN-%' OR lease_code LIKE 'BIG-%')`);
  await handle.db.execute(sql`DELETE FROM imports WHERE owner_id = ${user.id}`);
  await handle.pool.end();
  // ru_maxrss is in kilobytes on Linux.
  const peakRssMb = (process.resourceUsage().maxRSS * 1024) / 1e6;
  console.log(JSON.stringify({ uploadMs, confirmMs, peakRssMb, startRssMb, fileMb: file.length / 1e6, features: stored }));
}

void main();
