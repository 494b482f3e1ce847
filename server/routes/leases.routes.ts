import { z } from 'zod';
import {
  LEASE_EXPORT_CSV_COLUMNS,
  leaseExportCsvSchema,
  leaseExportGeoJsonSchema,
  leaseExportQuerySchema,
  leaseListQuerySchema,
  leaseListSchema,
  leaseSchema,
  leaseUpdateSchema,
} from '#shared/schemas/lease';
import { defineRoute, type RouteContext } from '../http/route';
import { exportResponse, leasesLayer, sendExport } from '../services/exports.service';
import { type LeasesService, toCsv } from '../services/leases.service';

const LEASE_READERS = ['grower', 'adviser', 'regulator'] as const;
const idParams = z.object({ id: z.uuid({ error: 'id must be a lease id (UUID)' }) });

export function registerLeaseRoutes(ctx: RouteContext, leases: LeasesService): void {
  defineRoute(ctx, {
    method: 'get',
    path: '/leases',
    summary: 'Leases you may see: your own, those shared with you, and for a regulator the held leases of the jurisdiction',
    tags: ['leases'],
    access: { roles: LEASE_READERS },
    query: leaseListQuerySchema,
    response: leaseListSchema,
    handler: ({ user, query }) => ctx.resultCache.answer('leases', user!, query, () => leases.list(user!, query)),
  });

  // Declared before /leases/:id so "export" is not taken for an id.
  defineRoute(ctx, {
    method: 'get',
    path: '/leases/export',
    operationId: 'exportLeases',
    summary:
      'Export the leases you may see as CSV (attributes, areas and the yearly rating with its two figures), GeoJSON, GeoPackage (with a readme table) or KML (with the model version and the cautions)',
    tags: ['leases'],
    access: { roles: LEASE_READERS },
    query: leaseExportQuerySchema,
    response: exportResponse('The leases', leaseExportCsvSchema, leaseExportGeoJsonSchema),
    handler: async ({ user, query, res }) => {
      const rows = await leases.exportRows(user!, query.status);
      const stamp = new Date().toISOString().slice(0, 10);
      if (query.format === 'gpkg' || query.format === 'kml') {
        await sendExport(res, leasesLayer(rows), query.format, `brackline-leases-${stamp}`, 'Lease id');
        return undefined;
      }
      if (query.format === 'geojson') {
        res.setHeader('Content-Type', 'application/geo+json');
        res.setHeader('Content-Disposition', `attachment; filename="brackline-leases-${stamp}.geojson"`);
        res.send(
          JSON.stringify({
            type: 'FeatureCollection',
            features: rows.map(({ geometry, ...props }) => ({ type: 'Feature', id: props.id, properties: props, geometry })),
          }),
        );
        return undefined;
      }
      res.setHeader('Content-Type', 'text/csv; charset=utf-8');
      res.setHeader('Content-Disposition', `attachment; filename="brackline-leases-${stamp}.csv"`);
      res.send(
        toCsv(
          [...LEASE_EXPORT_CSV_COLUMNS],
          rows.map((l) => [
            l.id,
            l.leaseId,
            l.holder,
            l.species,
            l.status,
            Math.round(l.areaM2 * 100) / 100,
            Math.round(l.areaM2 / 100) / 100,
            l.onLand,
            l.ownerName,
            l.createdAt,
            l.annualRating ?? null,
            l.closureDaysPerYear === null ? null : Math.round(l.closureDaysPerYear * 100) / 100,
            l.harmfulSalinityChancePerYear === null ? null : Math.round(l.harmfulSalinityChancePerYear * 10_000) / 10_000,
          ]),
        ),
      );
      return undefined;
    },
  });

  defineRoute(ctx, {
    method: 'get',
    path: '/leases/:id',
    summary: 'One lease with its geometry',
    tags: ['leases'],
    access: { roles: LEASE_READERS },
    params: idParams,
    response: leaseSchema,
    errors: [404],
    handler: ({ user, params }) => leases.get(user!, params.id),
  });

  defineRoute(ctx, {
    method: 'patch',
    path: '/leases/:id',
    summary: "Change a lease's attributes (its holder's account only)",
    tags: ['leases'],
    access: { roles: ['grower', 'adviser', 'regulator'] },
    params: idParams,
    body: leaseUpdateSchema,
    response: leaseSchema,
    errors: [404],
    handler: ({ user, params, body }) => leases.update(user!, params.id, body),
  });

  defineRoute(ctx, {
    method: 'delete',
    path: '/leases/:id',
    summary: "Delete a lease (its holder's account only)",
    tags: ['leases'],
    access: { roles: ['grower', 'adviser', 'regulator'] },
    params: idParams,
    response: null,
    errors: [404],
    handler: async ({ user, params }) => {
      await leases.remove(user!, params.id);
      return undefined;
    },
  });
}
