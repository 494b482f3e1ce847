import { z } from 'zod';
import { leaseNoteListSchema, leaseNoteSchema, leaseShareListSchema, noteCreateSchema, shareLeasesSchema, shareResultSchema } from '#shared/schemas/sharing';
import { defineRoute, type RouteContext } from '../http/route';
import type { SharingService } from '../services/sharing.service';

const LEASE_HOLDERS = ['grower', 'adviser', 'regulator'] as const;
const leaseId = z.uuid({ error: 'id must be a lease id (UUID)' });
const idParams = z.object({ id: leaseId });
const shareParams = z.object({ id: leaseId, userId: z.string().min(1).max(64, { error: 'userId must be a user id' }) });

export function registerSharingRoutes(ctx: RouteContext, sharing: SharingService): void {
  defineRoute(ctx, {
    method: 'post',
    path: '/leases/shares',
    operationId: 'shareLeases',
    summary: 'Share leases you hold with an adviser or regulator (by e-mail); sharing again changes nothing',
    tags: ['leases', 'sharing'],
    access: { roles: LEASE_HOLDERS },
    body: shareLeasesSchema,
    response: shareResultSchema,
    errors: [404, 422],
    handler: ({ user, body }) => sharing.share(user!, body),
  });

  defineRoute(ctx, {
    method: 'get',
    path: '/leases/:id/shares',
    summary: 'Whom a lease is shared with (its holder only)',
    tags: ['leases', 'sharing'],
    access: { roles: LEASE_HOLDERS },
    params: idParams,
    response: leaseShareListSchema,
    errors: [404],
    handler: ({ user, params }) => sharing.listShares(user!, params.id),
  });

  defineRoute(ctx, {
    method: 'delete',
    path: '/leases/:id/shares/:userId',
    operationId: 'revokeLeaseShare',
    summary: 'Stop sharing a lease with a user (its holder only)',
    tags: ['leases', 'sharing'],
    access: { roles: LEASE_HOLDERS },
    params: shareParams,
    response: null,
    errors: [404],
    handler: async ({ user, params }) => {
      await sharing.revoke(user!, params.id, params.userId);
      return undefined;
    },
  });

  defineRoute(ctx, {
    method: 'get',
    path: '/leases/:id/notes',
    summary: 'Notes on a lease, newest first (anyone who can see the lease)',
    tags: ['leases', 'notes'],
    access: { roles: LEASE_HOLDERS },
    params: idParams,
    response: leaseNoteListSchema,
    errors: [404],
    handler: ({ user, params }) => sharing.listNotes(user!, params.id),
  });

  defineRoute(ctx, {
    method: 'post',
    path: '/leases/:id/notes',
    summary: 'Write a note on a lease (its holder, or an adviser it is shared with)',
    tags: ['leases', 'notes'],
    access: { roles: ['grower', 'adviser'] },
    params: idParams,
    body: noteCreateSchema,
    response: leaseNoteSchema,
    successStatus: 201,
    errors: [404],
    handler: ({ user, params, body }) => sharing.addNote(user!, params.id, body.body),
  });
}
