import { z } from 'zod';
import { inboxListSchema, inboxQuerySchema } from '#shared/schemas/inbox';
import { defineRoute, type RouteContext } from '../http/route';
import { NotFoundError } from '../lib/errors';
import type { createInboxService } from '../services/inbox.service';

type InboxService = ReturnType<typeof createInboxService>;
const idParams = z.object({ id: z.uuid({ error: 'id must be a message id (UUID)' }) });

export function registerInboxRoutes(ctx: RouteContext, inbox: InboxService): void {
  defineRoute(ctx, {
    method: 'get',
    path: '/inbox',
    operationId: 'listInboxMessages',
    summary: 'Your in-app messages (closure notices, alerts, invitations, notes), newest first',
    tags: ['inbox'],
    access: { roles: 'any' },
    query: inboxQuerySchema,
    response: inboxListSchema,
    handler: async ({ user, query }) => {
      const { rows, unread } = await inbox.list(user!.id, query.limit);
      return {
        unread,
        items: rows.map((r) => ({
          id: r.id,
          kind: r.kind,
          title: r.title,
          body: r.body,
          link: r.link,
          createdAt: r.createdAt.toISOString(),
          readAt: r.readAt ? r.readAt.toISOString() : null,
        })),
      };
    },
  });

  defineRoute(ctx, {
    method: 'post',
    path: '/inbox/:id/read',
    operationId: 'markInboxMessageRead',
    summary: 'Mark one of your messages read',
    tags: ['inbox'],
    access: { roles: 'any' },
    params: idParams,
    response: null,
    errors: [404],
    handler: async ({ user, params }) => {
      if (!(await inbox.markRead(user!.id, params.id)))
        throw new NotFoundError('No such message in your inbox. Reload the inbox and try again.');
      return undefined;
    },
  });
}
