import { defineConfig } from 'drizzle-kit';

export default defineConfig({
  dialect: 'postgresql',
  schema: './server/db/schema.ts',
  out: './drizzle',
  dbCredentials: { url: process.env.DATABASE_URL ?? 'postgres://app@127.0.0.1:54329/brackline' },
  // Without this, drizzle-kit push plans to drop PostGIS's own tables (stack.md gotcha 9).
  extensionsFilters: ['postgis'],
});
