/**
 * @module shared/schemas/flow-record
 * Query of a gauge-record upload (shared/hydrology/parse-flow-record.ts and annual-maxima.ts):
 * the units of the discharge column and the first day of the water year.
 */
import { z } from 'zod';

const MONTH_DAY = /^(0[1-9]|1[0-2])-(0[1-9]|[12]\d|3[01])$/;
const DAYS_IN_MONTH = [31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31];

export const flowRecordQuerySchema = z.strictObject({
  units: z
    .enum(['m3s', 'cfs'], {
      error: "units must be 'm3s' (cubic metres per second) or 'cfs' (cubic feet per second)",
    })
    .describe("Units of the discharge column: 'm3s' or 'cfs' (converted to m³/s)"),
  waterYearStart: z
    .string({ error: 'waterYearStart must be text written MM-DD' })
    .regex(MONTH_DAY, { error: 'waterYearStart must be a day of the year written MM-DD, e.g. 10-01' })
    .refine(
      (s) => {
        const month = Number(s.slice(0, 2));
        const day = Number(s.slice(3, 5));
        return day <= DAYS_IN_MONTH[month - 1];
      },
      { error: 'waterYearStart must be a real day of a year from 01-01 to 12-31, and not 02-29' },
    )
    .optional()
    .describe('First day of the water year, MM-DD; default 10-01 (the water year is named for the year it ends in)'),
});

export type FlowRecordQuery = z.infer<typeof flowRecordQuerySchema>;
