/**
 * The regulator's workspace (issue #8): zones, trigger sweep, closure checks, notices, audit log,
 * and the public status page's data. Ownership (the regulator's own jurisdiction) is checked in
 * the zones service; a zone of another jurisdiction answers 404.
 */
import { z } from 'zod';
import {
  auditListSchema,
  auditQuerySchema,
  closureCheckResultSchema,
  closureCheckSchema,
  closureGaugeListSchema,
  noticeCreateSchema,
  noticeListSchema,
  noticeSchema,
  publicStatusSchema,
  sampleCreateSchema,
  sweepQuerySchema,
  triggerSweepSchema,
  zoneCreateSchema,
  zoneListSchema,
  zoneSampleSchema,
  zoneSchema,
  zoneUpdateSchema,
} from '#shared/schemas/zones';
import { exportFormatSchema, layerExportCsvSchema, layerExportGeoJsonSchema } from '#shared/schemas/exports';
import { defineRoute, type RouteContext } from '../http/route';
import { exportResponse, sendExport, zonesLayer } from '../services/exports.service';
import type { ZonesService } from '../services/zones.service';

const REGULATOR = ['regulator'] as const;
const idParams = z.object({ id: z.uuid({ error: 'id must be a zone id (UUID)' }) });

export function registerZoneRoutes(ctx: RouteContext, zones: ZonesService): void {
  defineRoute(ctx, {
    method: 'get',
    path: '/zones',
    summary: 'Closure zones of your jurisdiction with their river, gauge, trigger flow, minimum closure and status',
    tags: ['zones'],
    access: { roles: REGULATOR },
    query: z.strictObject({ withGeometry: z.enum(['true', 'false'], { error: 'withGeometry must be true or false' }).default('false') }),
    response: zoneListSchema,
    handler: ({ user, query }) => zones.list(user!, query.withGeometry === 'true'),
  });

  // Declared before /zones/:id so "export" is not taken for an id.
  defineRoute(ctx, {
    method: 'get',
    path: '/zones/export',
    operationId: 'exportZones',
    summary: 'Download the closure zones of your jurisdiction as CSV, GeoJSON, GeoPackage (readme table) or KML (document description)',
    tags: ['zones'],
    access: { roles: REGULATOR },
    query: z.strictObject({ format: exportFormatSchema }),
    response: exportResponse('The closure zones', layerExportCsvSchema, layerExportGeoJsonSchema),
    handler: async ({ user, query, res }) => {
      const { items } = await zones.list(user!, true);
      await sendExport(res, zonesLayer(items), query.format, `brackline-closure-zones-${new Date().toISOString().slice(0, 10)}`, 'Zone');
      return undefined;
    },
  });

  defineRoute(ctx, {
    method: 'post',
    path: '/zones',
    summary: 'Save a zone drawn on the map (GeoJSON polygon in longitude/latitude); uploads go through /imports with kind zone',
    tags: ['zones'],
    access: { roles: REGULATOR },
    body: zoneCreateSchema,
    response: zoneSchema,
    successStatus: 201,
    errors: [404, 422],
    handler: ({ user, body }) => zones.create(user!, body),
  });

  defineRoute(ctx, {
    method: 'get',
    path: '/zones/:id',
    summary: 'One closure zone with its geometry',
    tags: ['zones'],
    access: { roles: REGULATOR },
    params: idParams,
    response: zoneSchema,
    errors: [404],
    handler: ({ user, params }) => zones.get(user!, params.id),
  });

  defineRoute(ctx, {
    method: 'patch',
    path: '/zones/:id',
    summary:
      "Change a zone's plan values: name, river, gauge, trigger flow, minimum closure days, indicator standard (audited with before and after)",
    tags: ['zones'],
    access: { roles: REGULATOR },
    params: idParams,
    body: zoneUpdateSchema,
    response: zoneSchema,
    errors: [404, 422],
    handler: ({ user, params, body }) => zones.update(user!, params.id, body),
  });

  defineRoute(ctx, {
    method: 'get',
    path: '/zones/:id/trigger-sweep',
    operationId: 'getZoneTriggerSweep',
    summary:
      "Share of the zone where the modelled indicator is above the zone's standard, against river flow; the suggested trigger, its margin to the plan's and the AEP of each",
    tags: ['zones'],
    access: { roles: REGULATOR },
    params: idParams,
    query: sweepQuerySchema,
    response: triggerSweepSchema,
    errors: [404, 422],
    handler: ({ user, params, query }) => zones.triggerSweep(user!, params.id, query.share, query.steps),
  });

  defineRoute(ctx, {
    method: 'get',
    path: '/zones/:id/samples',
    summary: "A zone's sample results, newest first",
    tags: ['zones'],
    access: { roles: REGULATOR },
    params: idParams,
    response: z.object({ items: z.array(zoneSampleSchema) }),
    errors: [404],
    handler: ({ user, params }) => zones.listSamples(user!, params.id),
  });

  defineRoute(ctx, {
    method: 'post',
    path: '/zones/:id/samples',
    summary:
      "Enter a sample result for a zone; a result at or under the zone's standard taken after a closure makes the zone reopening-pending",
    tags: ['zones'],
    access: { roles: REGULATOR },
    params: idParams,
    body: sampleCreateSchema,
    response: zoneSampleSchema,
    successStatus: 201,
    errors: [404, 422],
    handler: ({ user, params, body }) => zones.addSample(user!, params.id, body),
  });

  defineRoute(ctx, {
    method: 'get',
    path: '/zones/:id/notices',
    summary: 'Notices that covered a zone, newest first',
    tags: ['zones', 'notices'],
    access: { roles: REGULATOR },
    params: idParams,
    response: noticeListSchema,
    errors: [404],
    handler: ({ user, params }) => zones.listNotices(user!, params.id),
  });

  defineRoute(ctx, {
    method: 'post',
    path: '/closure-checks',
    operationId: 'runClosureCheck',
    summary: 'Which zones and which held leases a flow (typed, or the latest gauge reading) puts in which bands',
    tags: ['closure-checks'],
    access: { roles: REGULATOR },
    body: closureCheckSchema,
    response: closureCheckResultSchema,
    errors: [404, 422],
    handler: ({ user, body }) => zones.closureCheck(user!, body),
  });

  defineRoute(ctx, {
    method: 'get',
    path: '/closure-checks/gauges',
    operationId: 'listClosureCheckGauges',
    summary: "Your jurisdiction's gauges with their latest reading (read only)",
    tags: ['closure-checks'],
    access: { roles: REGULATOR },
    response: closureGaugeListSchema,
    handler: ({ user }) => zones.gaugesOf(user!),
  });

  defineRoute(ctx, {
    method: 'get',
    path: '/notices',
    summary: 'Closure and reopening notices of your jurisdiction, newest first',
    tags: ['notices'],
    access: { roles: REGULATOR },
    response: noticeListSchema,
    handler: ({ user }) => zones.listNotices(user!),
  });

  defineRoute(ctx, {
    method: 'post',
    path: '/notices',
    operationId: 'issueNotice',
    summary:
      'Issue a closure or reopening notice for one or more zones: statuses change, every grower with a held lease there gets an e-mail and an in-app message',
    tags: ['notices'],
    access: { roles: REGULATOR },
    body: noticeCreateSchema,
    response: noticeSchema,
    successStatus: 201,
    errors: [404, 409],
    handler: ({ user, body }) => zones.issueNotice(user!, body),
  });

  defineRoute(ctx, {
    method: 'get',
    path: '/audit',
    operationId: 'listAuditEntries',
    summary: 'The audit log (append-only): a regulator reads its jurisdiction’s entries, an administrator all',
    tags: ['audit'],
    access: { roles: ['regulator', 'admin'] },
    query: auditQuerySchema,
    response: auditListSchema,
    handler: ({ user, query }) => zones.audit(user!, query),
  });

  defineRoute(ctx, {
    method: 'get',
    path: '/public/status/:jurisdiction',
    operationId: 'getPublicStatus',
    summary: "A jurisdiction's zone statuses and recent notices, for the public status page (no sign-in)",
    tags: ['public'],
    access: { public: true },
    params: z.object({
      jurisdiction: z
        .string()
        .regex(/^[a-z0-9-]{1,80}$/, { error: 'jurisdiction must be a short name of lower-case letters, digits and hyphens' }),
    }),
    response: publicStatusSchema,
    errors: [404],
    handler: ({ params }) => zones.publicStatus(params.jurisdiction),
  });
}
