import express from 'express';
import { z } from 'zod';
import {
  gaugeListSchema,
  gaugeTokenSchema,
  readingListQuerySchema,
  readingListSchema,
  readingsPostSchema,
  readingsResultSchema,
} from '#shared/schemas/gauges';
import { defineRoute, type RouteContext } from '../http/route';
import type { GaugesService } from '../services/gauges.service';

const idParams = z.object({ id: z.uuid({ error: 'id must be a gauge id (UUID)' }) });

export function registerGaugeRoutes(ctx: RouteContext, gauges: GaugesService): void {
  defineRoute(ctx, {
    method: 'get',
    path: '/gauges',
    summary: 'River gauges with their latest reading',
    tags: ['gauges'],
    access: { roles: 'any' },
    response: gaugeListSchema,
    handler: () => gauges.list(),
  });

  defineRoute(ctx, {
    method: 'get',
    path: '/gauges/:id/readings',
    summary: "A gauge's readings, newest first (m³/s)",
    tags: ['gauges'],
    access: { roles: 'any' },
    params: idParams,
    query: readingListQuerySchema,
    response: readingListSchema,
    errors: [404],
    handler: ({ params, query }) => gauges.readings(params.id, query.limit),
  });

  defineRoute(ctx, {
    method: 'post',
    path: '/gauges/:id/readings',
    operationId: 'postGaugeReadings',
    summary:
      "Post readings with the gauge's upload token (Authorization: Bearer <token>): JSON { readings: [{ observedAt, discharge }] } or a CSV (Content-Type: text/csv) with columns observedAt,discharge (m³/s). Repeated times are skipped; each new reading is checked against the alert rules.",
    tags: ['gauges'],
    // Authenticated by the gauge's own token (its uploader has no account), checked in the service.
    access: { public: true },
    security: [{ gaugeToken: [] }],
    params: idParams,
    // Validated by the service after the token check, so a caller without the token learns nothing about the body.
    requestContent: {
      'application/json': readingsPostSchema,
      'text/csv': z.string().describe('CSV with a header row observedAt,discharge (ISO 8601 instant, m³/s)'),
    },
    response: readingsResultSchema,
    successStatus: 201,
    errors: [401, 404],
    middleware: [express.text({ type: ['text/csv', 'text/plain'], limit: '5mb' })],
    handler: ({ req, params }) => gauges.postReadings(params.id, req.header('authorization'), req.body, typeof req.body === 'string'),
  });

  defineRoute(ctx, {
    method: 'post',
    path: '/gauges/:id/token',
    operationId: 'issueGaugeToken',
    summary: 'Issue a new upload token for a gauge (shown once; the previous one stops working)',
    tags: ['gauges'],
    access: { roles: ['admin', 'regulator'] },
    params: idParams,
    response: gaugeTokenSchema,
    successStatus: 201,
    errors: [404],
    handler: ({ user, params }) => gauges.issueToken(user!, params.id),
  });
}
