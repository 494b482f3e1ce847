/**
 * Loads the invented demo region's accounts (idempotent: existing rows, including user data,
 * are left alone). The demo password is in the README; it is for a local machine only.
 */
import { eq } from 'drizzle-orm';
import { hashPassword } from '../auth/passwords';
import { createDb, type Database } from './client';
import { jurisdictions, organisations, users } from './schema';

export const DEMO_PASSWORD = 'brackline-demo-2026';
export const DEMO_JURISDICTION = { slug: 'fennick-coast', name: 'Fennick Coast Shellfish Authority' };

export const DEMO_ACCOUNTS = [
  { email: 'grower@brackline.test', name: 'Ida Marsh (Saltreed Oysters)', role: 'grower', organisation: 'Saltreed Oysters' },
  { email: 'adviser@brackline.test', name: 'Tomas Quill (Fennick Extension Office)', role: 'adviser', organisation: 'Fennick Extension Office' },
  { email: 'regulator@brackline.test', name: 'Ruth Pennell (Fennick Coast Shellfish Authority)', role: 'regulator', organisation: null },
  { email: 'admin@brackline.test', name: 'Brackline administrator', role: 'admin', organisation: null },
  { email: 'grower2@brackline.test', name: 'Owen Carrick (Carrick Mussel Lines)', role: 'grower', organisation: 'Carrick Mussel Lines' },
  { email: 'grower3@brackline.test', name: 'Bea Lowry (Skerrow Clam Company)', role: 'grower', organisation: 'Skerrow Clam Company' },
  { email: 'grower4@brackline.test', name: 'Hal Dunmore (Gullstone Shellfish)', role: 'grower', organisation: 'Gullstone Shellfish' },
] as const;

export async function seedDemo(db: Database): Promise<void> {
  await db.insert(jurisdictions).values(DEMO_JURISDICTION).onConflictDoNothing();
  const [jurisdiction] = await db.select().from(jurisdictions).where(eq(jurisdictions.slug, DEMO_JURISDICTION.slug));
  const passwordHash = await hashPassword(DEMO_PASSWORD);
  for (const account of DEMO_ACCOUNTS) {
    let organisationId: string | null = null;
    if (account.organisation) {
      await db
        .insert(organisations)
        .values({ name: account.organisation, kind: account.role === 'adviser' ? 'extension' : 'farm', jurisdictionId: jurisdiction.id })
        .onConflictDoNothing();
      const [org] = await db.select().from(organisations).where(eq(organisations.name, account.organisation));
      organisationId = org.id;
    }
    await db
      .insert(users)
      .values({
        email: account.email,
        name: account.name,
        role: account.role,
        passwordHash,
        organisationId,
        jurisdictionId: jurisdiction.id,
        emailVerified: new Date(),
      })
      .onConflictDoNothing({ target: users.email });
  }
}

if (import.meta.url === `file://${process.argv[1]}`) {
  const url = process.env.DATABASE_URL;
  if (!url) {
    console.error('DATABASE_URL is not set');
    process.exit(1);
  }
  const { db, pool } = createDb(url, 2);
  seedDemo(db)
    .then(async () => {
      if (process.env.DEMO_REGION !== 'false') {
        const { seedDemoRegion } = await import('./seed-demo-region');
        await seedDemoRegion(db, (m) => console.log(`[brackline] ${m}`));
      }
    })
    .then(() => console.log('[brackline] demo data loaded'))
    .catch((err) => {
      console.error('[brackline] seeding failed:', err);
      process.exitCode = 1;
    })
    .finally(() => pool.end());
}
