import express from 'express';
import { z } from 'zod';
import { annualMaxima } from '#shared/hydrology/annual-maxima';
import { fitFloodFrequency } from '#shared/hydrology/flood-frequency';
import { parseFlowRecord } from '#shared/hydrology/parse-flow-record';
import { floodFrequencyRequestSchema, floodFrequencyResultSchema } from '#shared/schemas/flood-frequency';
import { flowRecordQuerySchema } from '#shared/schemas/flow-record';
import { annualPeakSchema, flowRecordGapSchema, flowRecordProblemSchema } from '#shared/schemas/river';
import { defineRoute, type RouteContext } from '../http/route';
import { UnsupportedMediaTypeError } from '../lib/errors';
import { engineCall } from './engine-call';

const flowRecordResponse = z.object({
  rows: z.number().int(),
  problems: z.array(flowRecordProblemSchema),
  annualPeaks: z.array(annualPeakSchema.pick({ waterYear: true, discharge: true, date: true, complete: true, daysOfData: true })),
  gaps: z.array(flowRecordGapSchema),
  interval: z.enum(['daily', 'sub-daily']),
});

/** Flood-frequency and flow-record calculators (stateless, no sign-in). */
export function registerHydrologyCalcRoutes(ctx: RouteContext): void {
  defineRoute(ctx, {
    method: 'post',
    path: '/calc/flood-frequency',
    operationId: 'calculateFloodFrequency',
    summary: 'GEV (L-moments), log-Pearson III and Gumbel fits of annual peaks, with quantiles per annual exceedance probability',
    tags: ['calculator'],
    access: { public: true },
    body: floodFrequencyRequestSchema,
    response: floodFrequencyResultSchema,
    errors: [422, 429],
    handler: ({ body }) => engineCall(() => fitFloodFrequency(body)),
  });

  defineRoute(ctx, {
    method: 'post',
    path: '/calc/flow-record',
    operationId: 'readFlowRecord',
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
