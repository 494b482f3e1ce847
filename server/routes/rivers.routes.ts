import express from 'express';
import { z } from 'zod';
import {
  flowRecordSchema,
  flowRecordUploadQuerySchema,
  flowRecordUploadResultSchema,
  hydrographSchema,
  riverCreateSchema,
  riverSchema,
  riverUpdateSchema,
  scenarioCreateSchema,
  scenarioPlumeSchema,
  scenarioSchema,
  screeningRunStartedSchema,
  scenarioUpdateSchema,
} from '#shared/schemas/river';
import { defineRoute, type RouteContext } from '../http/route';
import { ForbiddenError, UnsupportedMediaTypeError } from '../lib/errors';
import type { ScreeningJobs } from '../jobs/screening-jobs';
import type { RiversService } from '../services/rivers.service';

const READERS = ['grower', 'adviser', 'regulator'] as const;
const idParams = z.object({ id: z.uuid({ error: 'id must be a river id (UUID)' }) });
const scenarioParams = z.object({ id: z.uuid({ error: 'id must be a scenario id (UUID)' }) });

/** Media types a gauge record may be sent as. */
const FLOW_RECORD_TYPES = ['text/csv', 'text/plain', 'text/tab-separated-values', 'application/xml', 'text/xml', 'application/waterml+xml'];

export function registerRiverRoutes(ctx: RouteContext, rivers: RiversService, jobs: ScreeningJobs): void {
  defineRoute(ctx, {
    method: 'get',
    path: '/rivers',
    summary: 'Rivers of your jurisdiction and your own',
    tags: ['rivers'],
    access: { roles: READERS },
    response: z.object({ items: z.array(riverSchema) }),
    handler: async ({ user }) => ({ items: await rivers.list(user!) }),
  });

  defineRoute(ctx, {
    method: 'post',
    path: '/rivers',
    summary: 'Create a river; optional physics left out get documented defaults (listed in defaultsUsed)',
    tags: ['rivers'],
    access: { roles: READERS },
    body: riverCreateSchema,
    response: riverSchema,
    successStatus: 201,
    handler: ({ user, body }) => rivers.create(user!, body),
  });

  defineRoute(ctx, {
    method: 'get',
    path: '/rivers/:id',
    summary: 'One river with its settings and which of them are still defaults',
    tags: ['rivers'],
    access: { roles: READERS },
    params: idParams,
    response: riverSchema,
    errors: [404],
    handler: ({ user, params }) => rivers.get(user!, params.id),
  });

  defineRoute(ctx, {
    method: 'patch',
    path: '/rivers/:id',
    summary: "Change a river's settings (its creator or a regulator of its jurisdiction); re-screens its leases",
    tags: ['rivers'],
    access: { roles: READERS },
    params: idParams,
    body: riverUpdateSchema,
    response: riverSchema,
    errors: [404],
    handler: ({ user, params, body }) => rivers.update(user!, params.id, body),
  });

  defineRoute(ctx, {
    method: 'post',
    path: '/rivers/:id/flow-records',
    operationId: 'uploadFlowRecord',
    summary:
      'Upload the gauge record (CSV or tab-separated with # comments and several columns, or WaterML 2.0): fits flood frequency and makes the scenarios',
    tags: ['rivers'],
    access: { roles: READERS },
    middleware: [express.text({ type: FLOW_RECORD_TYPES, limit: '50mb' })],
    bodyContentType: 'text/csv',
    params: idParams,
    query: flowRecordUploadQuerySchema,
    body: z.string({ error: 'Send the record as the request body with Content-Type: text/csv (or application/xml for WaterML 2.0)' }),
    response: flowRecordUploadResultSchema,
    errors: [404, 415, 422],
    successStatus: 201,
    handler: async ({ user, params, query, body, req }) => {
      if (!req.is(FLOW_RECORD_TYPES)) {
        throw new UnsupportedMediaTypeError('Send the gauge record as text with the header Content-Type: text/csv (CSV) or application/xml (WaterML 2.0).');
      }
      const fileName = typeof req.headers['x-file-name'] === 'string' ? req.headers['x-file-name'] : undefined;
      return rivers.uploadFlowRecord(user!, params.id, body, { ...query, fileName });
    },
  });

  defineRoute(ctx, {
    method: 'get',
    path: '/rivers/:id/flow-records',
    operationId: 'getFlowRecord',
    summary: "The river's active flow record: row problems, gaps, annual peaks, flood-frequency fit, durations and percentiles",
    tags: ['rivers'],
    access: { roles: READERS },
    params: idParams,
    response: flowRecordSchema,
    errors: [404],
    handler: ({ user, params }) => rivers.flowRecord(user!, params.id),
  });

  defineRoute(ctx, {
    method: 'get',
    path: '/rivers/:id/flow-records/readings',
    operationId: 'getHydrograph',
    summary: 'The hydrograph, thinned to at most 5 000 points (each keeps its bucket’s highest flow)',
    tags: ['rivers'],
    access: { roles: READERS },
    params: idParams,
    response: hydrographSchema,
    errors: [404],
    handler: async ({ user, params }) => ({ points: await rivers.readings(user!, params.id) }),
  });

  defineRoute(ctx, {
    method: 'get',
    path: '/rivers/:id/scenarios',
    summary: "The river's flood scenarios: from the flood-frequency fit, seasonal high flows and typed flows",
    tags: ['scenarios'],
    access: { roles: READERS },
    params: idParams,
    response: z.object({ items: z.array(scenarioSchema) }),
    errors: [404],
    handler: async ({ user, params }) => ({ items: await rivers.scenarios(user!, params.id) }),
  });

  defineRoute(ctx, {
    method: 'post',
    path: '/rivers/:id/scenarios',
    summary: 'Add a typed flow scenario',
    tags: ['scenarios'],
    access: { roles: READERS },
    params: idParams,
    body: scenarioCreateSchema,
    response: scenarioSchema,
    successStatus: 201,
    errors: [404],
    handler: ({ user, params, body }) => rivers.createScenario(user!, params.id, body),
  });

  defineRoute(ctx, {
    method: 'patch',
    path: '/scenarios/:id',
    summary: "Rename a scenario or change its flood duration",
    tags: ['scenarios'],
    access: { roles: READERS },
    params: scenarioParams,
    body: scenarioUpdateSchema,
    response: scenarioSchema,
    errors: [404],
    handler: ({ user, params, body }) => rivers.updateScenario(user!, params.id, body),
  });

  defineRoute(ctx, {
    method: 'delete',
    path: '/scenarios/:id',
    summary: 'Delete a typed scenario',
    tags: ['scenarios'],
    access: { roles: READERS },
    params: scenarioParams,
    response: null,
    errors: [404],
    handler: async ({ user, params }) => {
      await rivers.deleteScenario(user!, params.id);
      return undefined;
    },
  });

  defineRoute(ctx, {
    method: 'get',
    path: '/scenarios/:id/plume',
    summary: "A scenario's plume numbers (g′, f, regime, y_s, H0, W0, U0, c_p, reach), warnings, assumptions and profiles, from the saved settings",
    tags: ['scenarios'],
    access: { roles: READERS },
    params: scenarioParams,
    response: scenarioPlumeSchema,
    errors: [404, 422],
    handler: ({ user, params }) => rivers.scenarioPlume(user!, params.id),
  });

  defineRoute(ctx, {
    method: 'post',
    path: '/rivers/:id/screening-runs',
    operationId: 'startScreeningRun',
    summary: "Re-screen every lease of the river now (normally automatic after a change)",
    tags: ['screenings'],
    access: { roles: ['adviser', 'regulator', 'grower'] },
    params: idParams,
    response: screeningRunStartedSchema,
    successStatus: 202,
    errors: [404],
    handler: async ({ user, params }) => {
      const river = await rivers.load(user!, params.id);
      if (river.owner_id !== user!.id && !(user!.role === 'regulator' && river.jurisdiction_id === user!.jurisdictionId)) {
        throw new ForbiddenError("Only the river's creator or a regulator of its jurisdiction can start a screening run.");
      }
      return { runId: await jobs.enqueueRiver(params.id) };
    },
  });
}
