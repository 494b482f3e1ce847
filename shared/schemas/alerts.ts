/** Alert rules and alerts: contracts for the alerts screen and API. */
import { z } from 'zod';
import { CAUTION_TEXT } from '../cautions';

export const ruleCreateSchema = z.discriminatedUnion(
  'kind',
  [
    z.strictObject({
      kind: z.literal('lease'),
      leaseId: z.uuid({ error: 'leaseId must be a lease id (UUID)' }),
      riverId: z.uuid({ error: 'riverId must be a river id (UUID)' }),
      bandId: z.string({ error: 'bandId is required: choose a band from the lease’s flow sweep' }).min(1).max(100),
    }),
    z.strictObject({
      kind: z.literal('zone'),
      zoneId: z.uuid({ error: 'zoneId must be a closure zone id (UUID)' }),
      approachFraction: z
        .number({ error: 'approachFraction must be a number between 0.3 and 0.99' })
        .min(0.3, { error: 'approachFraction must be at least 0.3 (30 % of the trigger flow)' })
        .max(0.99, { error: 'approachFraction must be below 1 (the trigger itself)' })
        .default(0.8),
    }),
  ],
  { error: "kind must be 'lease' (a lease entering a band) or 'zone' (a closure zone's trigger flow)" },
);
export type RuleCreate = z.input<typeof ruleCreateSchema>;

/** The lease-rule form on the alerts screen. */
export const leaseRuleFormSchema = z.object({
  leaseId: z.uuid({ error: 'Choose a lease' }),
  riverId: z.uuid({ error: 'Choose a river' }),
  bandId: z.string().min(1, { error: 'Choose a band' }),
});
export type LeaseRuleForm = z.infer<typeof leaseRuleFormSchema>;

export const ruleSchema = z.object({
  id: z.string(),
  kind: z.enum(['lease', 'zone']),
  riverId: z.string(),
  riverName: z.string(),
  leaseId: z.string().nullable(),
  leaseCode: z.string().nullable(),
  zoneId: z.string().nullable(),
  zoneName: z.string().nullable(),
  bandId: z.string().nullable(),
  bandName: z.string().nullable(),
  thresholdFlow: z.number().describe('m³/s'),
  approachFlow: z.number().nullable().describe('m³/s (zone rules)'),
  createdAt: z.string(),
});
export type AlertRule = z.infer<typeof ruleSchema>;
export const ruleListSchema = z.object({ items: z.array(ruleSchema) });

export const forecastSchema = z.strictObject({
  discharge: z
    .number({ error: 'discharge must be the forecast flow in m³/s' })
    .positive({ error: 'discharge must be above 0 m³/s' })
    .max(1_000_000),
});
export type Forecast = z.infer<typeof forecastSchema>;

export const alertSchema = z.object({
  id: z.string(),
  ruleId: z.string(),
  level: z.enum(['enters', 'approaching', 'passing']),
  source: z.enum(['reading', 'forecast']),
  discharge: z.number(),
  observedAt: z.string().nullable(),
  subject: z.string(),
  body: z.string(),
  emailStatus: z.enum(['pending', 'sent', 'failed']),
  emailAttempts: z.number().int(),
  emailLastError: z.string().nullable(),
  emailSentAt: z.string().nullable(),
  createdAt: z.string(),
});
export type Alert = z.infer<typeof alertSchema>;
export const alertListSchema = z.object({ items: z.array(alertSchema) });

export const forecastResultSchema = z.object({
  reaches: z.boolean(),
  thresholdFlow: z.number(),
  alert: alertSchema.nullable(),
  newAlert: z.boolean().optional(),
});

/** The cautions of product.md §7, as they close every alert e-mail (the same words as the screens'). */
export const ALERT_CAUTIONS = CAUTION_TEXT;

/** Closure zones a regulator can set trigger alerts on. */
export const alertZoneListSchema = z.object({
  items: z.array(z.object({ id: z.string(), name: z.string(), riverName: z.string().nullable(), triggerFlow: z.number().nullable() })),
});
export type AlertZone = z.infer<typeof alertZoneListSchema>['items'][number];

/** The zone-rule form on the alerts screen (approach as a percentage of the trigger). */
export const zoneRuleFormSchema = z.object({
  zoneId: z.uuid({ error: 'Choose a closure zone' }),
  approachPercent: z.coerce
    .number({ error: 'Give the approach level as a percentage of the trigger flow' })
    .min(30, { error: 'The approach level must be at least 30 % of the trigger flow' })
    .max(99, { error: 'The approach level must be below 100 % (the trigger itself)' }),
});
export type ZoneRuleForm = z.infer<typeof zoneRuleFormSchema>;
