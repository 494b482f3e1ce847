import express from 'express';
import { z } from 'zod';
import { annualMaxima } from '#shared/hydrology/annual-maxima';
import { fitFloodFrequency } from '#shared/hydrology/flood-frequency';
import { parseFlowRecord } from '#shared/hydrology/parse-flow-record';
import { floodFrequencyRequestSchema } from '#shared/schemas/flood-frequency';
import { flowRecordQuerySchema } from '#shared/schemas/flow-record';
import { defineRoute, type RouteContext } from '../http/route';
import { UnsupportedMediaTypeError } from '../lib/errors';
import { engineCall } from './engine-call';

const quantile = z.object({ aep: z.number(), discharge: z.number(), lower: z.number().optional(), upper: z.number().optional() });
const floodFrequencyResponse = z.looseObject({
  n: z.number(),
  gev: z.looseObject({ location: z.number(), scale: z.number(), shape: z.number().describe("Hosking's k"), quantiles: z.array(quantile) }),
  lp3: z.looseObject({ mean: z.number(), stdDev: z.number(), skew: z.number(), quantiles: z.array(quantile) }),
  gumbel: z.looseObject({ location: z.number(), scale: z.number(), quantiles: z.array(quantile) }),
  warnings: z.array(z.string()),
});

const flowRecordResponse = z.object({
  rows: z.number(),
  problems: z.array(z.object({ row: z.number(), value: z.string(), reason: z.string() })),
  annualPeaks: z.array(z.object({ waterYear: z.number(), discharge: z.number(), date: z.string() })),
  gaps: z.array(z.unknown()).optional(),
  interval: z.string().optional(),
});

/** Flood-frequency and flow-record calculators (stateless, no sign-in). */
export function registerHydrologyCalcRoutes(ctx: RouteContext): void {
  defineRoute(ctx, {
    method: 'post',
    path: '/calc/flood-frequency',
    summary: 'GEV (L-moments), log-Pearson III and Gumbel fits of annual peaks, with quantiles per annual exceedance probability',
    tags: ['calculator'],
    access: { public: true },
    body: floodFrequencyRequestSchema,
    response: floodFrequencyResponse,
    errors: [422, 429],
    handler: ({ body }) => engineCall(() => fitFloodFrequency(body)),
  });

  defineRoute(ctx, {
    method: 'post',
    path: '/calc/flow-record',
    summary: 'Read a gauge record (CSV: date or date-time, discharge) and return its row problems and annual peaks',
    tags: ['calculator'],
    access: { public: true },
    middleware: [express.text({ type: ['text/csv', 'text/plain'], limit: '30mb' })],
    bodyContentType: 'text/csv',
    body: z.string({ error: 'Send the record as the request body with Content-Type: text/csv' }),
    query: flowRecordQuerySchema,
    response: flowRecordResponse,
    errors: [415, 422, 429],
    handler: ({ req, body, query }) => {
      if (!req.is(['text/csv', 'text/plain'])) {
        throw new UnsupportedMediaTypeError('Send the gauge record as CSV text with the header Content-Type: text/csv.');
      }
      return engineCall(() => {
        const parsed = parseFlowRecord(body, { units: query.units });
        const peaks = annualMaxima(parsed.readings, { waterYearStart: query.waterYearStart ?? '10-01' });
        return {
          rows: parsed.rows,
          problems: parsed.problems,
          gaps: parsed.gaps,
          interval: parsed.interval,
          annualPeaks: peaks.map((p) => ({ waterYear: p.waterYear, discharge: p.discharge, date: p.date, complete: p.complete, daysOfData: p.daysOfData })),
        };
      });
    },
  });
}
