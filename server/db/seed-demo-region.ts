/**
 * Loads the invented Fennick coast region from demo-data/ (idempotent: what exists is left alone):
 * the coast, the two rivers with their flow records and scenarios, the four growers' leases,
 * the two closure zones, and a share of the demo grower's leases with the demo adviser.
 * Then it screens every lease under every scenario.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { eq, sql } from 'drizzle-orm';
import type { RiverJson } from '../../demo-data/lib/rivers';
import type { CurrentUser } from '../http/route';
import { createInlineScreeningJobs } from '../jobs/screening-jobs';
import { carryMixingLength as carryLegacyLength } from '../services/model-upgrade.service';
import { createRiversService } from '../services/rivers.service';
import { createScreeningService } from '../services/screening.service';
import type { Database } from './client';
import { jurisdictions, users } from './schema';
import { DEMO_JURISDICTION } from './seed';

const DEMO_DIR = path.resolve(import.meta.dirname, '../../demo-data');
const readJson = (file: string) => JSON.parse(readFileSync(path.join(DEMO_DIR, file), 'utf8'));


/** Demo rivers written with a fixed mixing length get the entrainment coefficient that matches it at their median annual peak. */
async function carryMixingLength(db: Database, riverId: string, r: RiverJson): Promise<void> {
  const legacy = (r as { mixingLengthM?: number }).mixingLengthM;
  const given = (r as { entrainmentCoefficient?: number }).entrainmentCoefficient;
  if (given !== undefined) {
    await db.execute(sql`UPDATE rivers SET settings = settings || jsonb_build_object('entrainmentCoefficient', ${given}::float8) WHERE id = ${riverId}::uuid`);
  } else if (legacy !== undefined) {
    await carryLegacyLength(db, riverId, legacy);
  }
}

async function userByEmail(db: Database, email: string): Promise<CurrentUser> {
  const [u] = await db.select().from(users).where(eq(users.email, email));
  return { id: u.id, email: u.email, name: u.name, role: u.role, organisationId: u.organisationId, jurisdictionId: u.jurisdictionId };
}

export async function seedDemoRegion(db: Database, log: (msg: string) => void = () => {}): Promise<void> {
  const [jurisdiction] = await db.select().from(jurisdictions).where(eq(jurisdictions.slug, DEMO_JURISDICTION.slug));
  const regulator = await userByEmail(db, 'regulator@brackline.test');

  // The coast, twice: the shoreline (lines) that plumes walk, and the land polygons (mainland
  // and Skerrow Island) that flag leases on land. Both serve the whole jurisdiction.
  for (const [name, file, form] of [
    ['Fennick Coast shoreline (demo)', 'coast/fennick-shoreline.geojson', 'line'],
    ['Fennick Coast land (demo)', 'coast/fennick-land.geojson', 'land'],
  ] as const) {
    const exists = await db.execute(sql`SELECT id FROM coasts WHERE name = ${name} AND jurisdiction_id = ${jurisdiction.id}::uuid`);
    if (exists.rows.length) continue;
    const geometry = readJson(file).features[0].geometry;
    const extract = form === 'line' ? 2 : 3;
    await db.execute(sql`
      INSERT INTO coasts (name, form, owner_id, jurisdiction_id, shared, geom)
      VALUES (${name}, ${form}, ${regulator.id}, ${jurisdiction.id}::uuid, true,
              ST_Multi(ST_CollectionExtract(ST_MakeValid(ST_SetSRID(ST_GeomFromGeoJSON(${JSON.stringify(geometry)}), 4326)), ${extract})))`);
    log(`demo ${form === 'line' ? 'shoreline' : 'land'} loaded`);
  }

  // Leases: each grower's from the region's GeoJSON, owned by that grower's account.
  const region = readJson('region.json');
  // The region's area (issue #15): the demo bay's box, so a lease saved there joins its grower to the region.
  if (Array.isArray(region.bbox) && region.bbox.length === 4) {
    const [w, s, e, n] = region.bbox as number[];
    await db.execute(sql`UPDATE jurisdictions SET area = ST_Multi(ST_MakeEnvelope(${w}, ${s}, ${e}, ${n}, 4326)) WHERE id = ${jurisdiction.id}::uuid AND area IS NULL`);
  }
  const leases = readJson('leases/fennick-leases.geojson');
  const growerByName = new Map<string, CurrentUser>();
  for (const g of region.growers as { name: string; email: string }[]) growerByName.set(g.name, await userByEmail(db, g.email));
  let added = 0;
  for (const f of leases.features) {
    const p = f.properties;
    const owner = growerByName.get(p.HOLDER);
    if (!owner) continue;
    const res = await db.execute(sql`
      INSERT INTO leases (lease_code, holder, species, status, notes, owner_id, organisation_id, jurisdiction_id, source_properties, geom, area_m2)
      SELECT ${p.LEASE_ID}, ${p.HOLDER}, ${p.SPECIES}, ${p.STATUS}::lease_status, ${p.NOTES ?? null}, ${owner.id}, ${owner.organisationId}::uuid, ${jurisdiction.id}::uuid,
             ${JSON.stringify(p)}::jsonb, g, ST_Area(g::geography)
        FROM (SELECT ST_Multi(ST_SetSRID(ST_GeomFromGeoJSON(${JSON.stringify(f.geometry)}), 4326)) AS g) x
       WHERE NOT EXISTS (SELECT 1 FROM leases WHERE owner_id = ${owner.id} AND lease_code = ${p.LEASE_ID})`);
    added += res.rowCount ?? 0;
  }
  if (added) log(`${added} demo leases loaded`);

  // The demo adviser advises Saltreed Oysters, who shares its held leases.
  const adviser = await userByEmail(db, 'adviser@brackline.test');
  const saltreed = growerByName.get('Saltreed Oysters');
  if (saltreed) {
    await db.execute(sql`
      INSERT INTO lease_shares (lease_id, grantee_id)
      SELECT id, ${adviser.id} FROM leases WHERE owner_id = ${saltreed.id} AND status = 'held'
      ON CONFLICT DO NOTHING`);
    // …as an accepted client of the adviser (Clients screen).
    await db.execute(sql`
      INSERT INTO client_invitations (adviser_id, email, grower_id, status, responded_at)
      SELECT ${adviser.id}, lower(email), id, 'accepted', now() FROM users WHERE id = ${saltreed.id}
      ON CONFLICT DO NOTHING`);
  }

  // Closure zones.
  const zones = readJson('zones/fennick-zones.geojson');
  for (const f of zones.features) {
    const p = f.properties;
    await db.execute(sql`
      INSERT INTO closure_zones (name, jurisdiction_id, source_properties, geom, area_m2)
      SELECT ${p.ZONE_NAME}, ${jurisdiction.id}::uuid, ${JSON.stringify(p)}::jsonb, g, ST_Area(g::geography)
        FROM (SELECT ST_Multi(ST_CollectionExtract(ST_MakeValid(ST_SetSRID(ST_GeomFromGeoJSON(${JSON.stringify(f.geometry)}), 4326)), 3)) AS g) x
       WHERE NOT EXISTS (SELECT 1 FROM closure_zones WHERE name = ${p.ZONE_NAME} AND jurisdiction_id = ${jurisdiction.id}::uuid)`);
  }

  // Monitoring stations and their samples (detection limits kept as censored values).
  const stationFile = readJson('monitoring/stations.geojson');
  for (const f of stationFile.features) {
    await db.execute(sql`
      INSERT INTO stations (code, name, jurisdiction_id, owner_id, geom)
      VALUES (${f.properties.STATION_ID}, ${f.properties.NAME ?? null}, ${jurisdiction.id}::uuid, ${regulator.id},
              ST_SetSRID(ST_GeomFromGeoJSON(${JSON.stringify(f.geometry)}), 4326))
      ON CONFLICT (owner_id, code) DO NOTHING`);
  }
  const sampleRows = readFileSync(path.join(DEMO_DIR, 'monitoring/samples.csv'), 'utf8').trim().split(/\r?\n/).slice(1);
  const parsedSamples = sampleRows.map((line) => {
    const [station, at, salinity, ecoli, method, temperature] = line.split(',');
    const censored = ecoli.startsWith('<') ? 'below' : ecoli.startsWith('>') ? 'above' : null;
    return { station, at, salinity: salinity === '' ? null : Number(salinity), indicator: Number(ecoli.replace(/^[<>]/, '')), censored, method, temperature: temperature === '' ? null : Number(temperature) };
  });
  await db.execute(sql`
    INSERT INTO samples (station_id, sampled_at, salinity, indicator, indicator_censored, method, temperature)
    SELECT st.id, x.at, x.salinity, x.indicator, x.censored, x.method, x.temperature
      FROM jsonb_to_recordset(${JSON.stringify(parsedSamples)}::jsonb)
           AS x(station text, at timestamptz, salinity double precision, indicator double precision, censored text, method text, temperature double precision)
      JOIN stations st ON st.code = x.station AND st.owner_id = ${regulator.id}
    ON CONFLICT (station_id, sampled_at) DO NOTHING`);

  // Rivers with their flow records (this also makes the scenarios), then screening.
  const screening = createScreeningService({ db });
  const jobs = createInlineScreeningJobs(db, screening);
  const rivers = createRiversService({ db });
  const riverData = readJson('rivers/rivers.json').rivers as RiverJson[];
  for (const r of riverData) {
    const existing = await db.execute<{ id: string }>(sql`SELECT id FROM rivers WHERE name = ${r.name} AND jurisdiction_id = ${jurisdiction.id}::uuid`);
    if (existing.rows.length) continue;
    const river = await rivers.create(regulator, {
      name: r.name,
      mouthLongitude: r.mouth[0],
      mouthLatitude: r.mouth[1],
      outflowAzimuthDeg: r.outflowAzimuthDeg,
      mouthWidth: r.mouthWidthM,
      mouthDepth: r.mouthDepthM,
      shelfSlope: r.shelfSlope,
      riverSalinity: r.riverSalinity,
      riverTemperature: r.riverTemperature,
      seaSalinity: r.seaSalinity,
      seaTemperature: r.seaTemperature,
      t90DayHours: r.t90DayHours,
      t90NightHours: r.t90NightHours,
      daylightFraction: r.daylightFraction,
      indicator: r.indicator,
      alongshoreShare: r.alongshoreShare,
      // The known value the demo samples were made with (demo-data/README.md).
      nearFieldFreshwaterFraction: r.nearFieldFreshwaterFraction,
      gaugeName: r.gauge.name,
      gaugeCode: r.gauge.code,
    });
    const csv = readFileSync(path.join(DEMO_DIR, r.flowRecordFile), 'utf8');
    await rivers.uploadFlowRecord(regulator, river.id, csv, { units: 'm3s', waterYearStart: '10-01', acceptProblems: false, fileName: path.basename(r.flowRecordFile) });
    await carryMixingLength(db, river.id, r);
    log(`${r.name}: flow record and scenarios loaded; screening…`);
    await jobs.enqueueRiver(river.id);
  }

  // A gauge per river (from its settings), and each closure zone linked to its river, gauge and plan values.
  await db.execute(sql`
    INSERT INTO gauges (river_id, code, name, location)
    SELECT r.id, r.settings->>'gaugeCode', r.settings->>'gaugeName', r.mouth
      FROM rivers r
     WHERE r.jurisdiction_id = ${jurisdiction.id}::uuid AND r.settings->>'gaugeCode' IS NOT NULL
    ON CONFLICT (river_id, code) DO NOTHING`);
  await db.execute(sql`
    UPDATE closure_zones z
       SET river_id = r.id,
           gauge_id = (SELECT g.id FROM gauges g WHERE g.river_id = r.id ORDER BY g.created_at LIMIT 1),
           trigger_flow = (z.source_properties->>'TRIGGER_M3S')::float8,
           min_closure_days = (z.source_properties->>'CLOSURE_DAYS')::float8,
           -- NSSP approved-area geometric mean, 14 MPN/100 mL (science.md §6, a).
           indicator_standard = 14
      FROM rivers r
     WHERE r.name = z.source_properties->>'RIVER' AND r.jurisdiction_id = z.jurisdiction_id
       AND z.jurisdiction_id = ${jurisdiction.id}::uuid AND z.river_id IS NULL`);
}
