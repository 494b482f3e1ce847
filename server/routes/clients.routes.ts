import { z } from 'zod';
import { acceptInvitationSchema, adviserLeasesSchema, adviserLinkListSchema, clientInviteSchema, clientListSchema } from '#shared/schemas/clients';
import { defineRoute, type RouteContext } from '../http/route';
import type { ClientsService } from '../services/clients.service';

const idParams = z.object({ id: z.uuid({ error: 'id must be an invitation id (UUID)' }) });

export function registerClientRoutes(ctx: RouteContext, clients: ClientsService): void {
  defineRoute(ctx, {
    method: 'get',
    path: '/clients',
    summary: "Your clients (growers who accepted), their shared leases with ratings, and invitations still waiting",
    tags: ['clients'],
    access: { roles: ['adviser'] },
    response: clientListSchema,
    handler: ({ user }) => clients.listClients(user!),
  });

  defineRoute(ctx, {
    method: 'post',
    path: '/clients/invitations',
    summary: 'Invite a grower by e-mail to become your client (the same answer whether or not the e-mail has an account)',
    tags: ['clients'],
    access: { roles: ['adviser'] },
    body: clientInviteSchema,
    response: z.object({ invitationId: z.string(), email: z.string() }),
    successStatus: 201,
    errors: [409, 422],
    handler: ({ user, body }) => clients.invite(user!, body),
  });

  defineRoute(ctx, {
    method: 'delete',
    path: '/clients/invitations/:id',
    operationId: 'cancelClientInvitation',
    summary: 'Cancel an invitation that is still waiting (the adviser who sent it)',
    tags: ['clients'],
    access: { roles: ['adviser'] },
    params: idParams,
    response: null,
    errors: [404, 409],
    handler: async ({ user, params }) => {
      await clients.cancel(user!, params.id);
      return undefined;
    },
  });

  defineRoute(ctx, {
    method: 'get',
    path: '/advisers',
    summary: 'Invitations from advisers to your e-mail, and the advisers you share leases with',
    tags: ['clients'],
    access: { roles: ['grower'] },
    response: adviserLinkListSchema,
    handler: ({ user }) => clients.listAdvisers(user!),
  });

  defineRoute(ctx, {
    method: 'post',
    path: '/advisers/:id/accept',
    operationId: 'acceptAdviserInvitation',
    summary: 'Accept an adviser’s invitation and share the chosen leases (may be none yet)',
    tags: ['clients'],
    access: { roles: ['grower'] },
    params: idParams,
    body: acceptInvitationSchema,
    response: adviserLinkListSchema,
    errors: [404, 409],
    handler: ({ user, params, body }) => clients.accept(user!, params.id, body.leaseIds),
  });

  defineRoute(ctx, {
    method: 'post',
    path: '/advisers/:id/decline',
    operationId: 'declineAdviserInvitation',
    summary: 'Decline an adviser’s invitation',
    tags: ['clients'],
    access: { roles: ['grower'] },
    params: idParams,
    response: null,
    errors: [404, 409],
    handler: async ({ user, params }) => {
      await clients.decline(user!, params.id);
      return undefined;
    },
  });

  defineRoute(ctx, {
    method: 'put',
    path: '/advisers/:id/leases',
    operationId: 'setAdviserLeases',
    summary: 'Choose exactly which of your leases this adviser sees (the others stop being shared with them)',
    tags: ['clients'],
    access: { roles: ['grower'] },
    params: idParams,
    body: adviserLeasesSchema,
    response: adviserLinkListSchema,
    errors: [404, 409],
    handler: ({ user, params, body }) => clients.setLeases(user!, params.id, body.leaseIds),
  });

  defineRoute(ctx, {
    method: 'delete',
    path: '/advisers/:id',
    operationId: 'endAdviser',
    summary: 'Stop working with an adviser: they stop seeing every lease you shared with them',
    tags: ['clients'],
    access: { roles: ['grower'] },
    params: idParams,
    response: null,
    errors: [404, 409],
    handler: async ({ user, params }) => {
      await clients.end(user!, params.id);
      return undefined;
    },
  });
}
