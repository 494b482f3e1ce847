/** River gauges and their readings: contracts for the gauge API and the alerts screen. */
import { z } from 'zod';

export const MAX_READINGS_PER_POST = 5000;

export const readingInputSchema = z.strictObject({
  observedAt: z.iso.datetime({ offset: true, error: 'observedAt must be an ISO 8601 time with a zone, e.g. 2026-12-02T06:00:00Z' }),
  discharge: z
    .number({ error: 'discharge must be a number in m³/s' })
    .min(0, { error: 'discharge cannot be negative (m³/s)' })
    .max(1_000_000, { error: 'discharge looks too large: give it in m³/s' }),
});
export type ReadingInput = z.infer<typeof readingInputSchema>;

export const readingsPostSchema = z.strictObject({
  readings: z
    .array(readingInputSchema, { error: 'readings must be a list of { observedAt, discharge }' })
    .min(1, { error: 'send at least one reading' })
    .max(MAX_READINGS_PER_POST, { error: `send at most ${MAX_READINGS_PER_POST} readings at a time` }),
});
export type ReadingsPost = z.infer<typeof readingsPostSchema>;

export const readingSchema = z.object({
  id: z.string(),
  observedAt: z.string(),
  discharge: z.number(),
  source: z.enum(['token', 'csv', 'feed', 'manual']),
});
export type Reading = z.infer<typeof readingSchema>;

export const readingsResultSchema = z.object({ received: z.number().int(), stored: z.number().int(), duplicates: z.number().int() });
export type ReadingsResult = z.infer<typeof readingsResultSchema>;

export const gaugeSchema = z.object({
  id: z.string(),
  code: z.string(),
  name: z.string(),
  riverId: z.string(),
  riverName: z.string(),
  hasToken: z.boolean(),
  latest: readingSchema.nullable(),
});
export type Gauge = z.infer<typeof gaugeSchema>;
export const gaugeListSchema = z.object({ items: z.array(gaugeSchema) });

export const readingListSchema = z.object({ gaugeId: z.string(), items: z.array(readingSchema) });
export const readingListQuerySchema = z.strictObject({
  limit: z.coerce.number().int().min(1).max(2000).default(96),
});

export const gaugeTokenSchema = z.object({
  gaugeId: z.string(),
  token: z.string().describe('Shown once; send it as "Authorization: Bearer <token>" when posting readings'),
});
