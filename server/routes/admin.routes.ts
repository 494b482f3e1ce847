import { desc, eq, sql } from 'drizzle-orm';
import { z } from 'zod';
import { invitationCreateSchema } from '#shared/schemas/auth';
import { ROLES } from '#shared/schemas/roles';
import type { Database } from '../db/client';
import { auditEntries, jurisdictions, outboxMessages, users } from '../db/schema';
import { defineRoute, type RouteContext } from '../http/route';
import { NotFoundError } from '../lib/errors';
import type { AccountsService } from '../services/accounts.service';

const idParams = z.object({ id: z.string().min(1) });
const uuidParams = z.object({ id: z.uuid({ error: 'id must be a UUID' }) });
const paging = z.strictObject({
  limit: z.coerce.number().int().min(1, { error: 'limit must be between 1 and 500' }).max(500, { error: 'limit must be between 1 and 500' }).default(50),
  offset: z.coerce.number().int().min(0, { error: 'offset must be 0 or more' }).default(0),
});

const userRow = z.object({
  id: z.string(),
  email: z.string(),
  name: z.string().nullable(),
  role: z.enum(ROLES),
  jurisdictionId: z.string().nullable(),
  disabled: z.boolean(),
  createdAt: z.string(),
});

export function registerAdminRoutes(ctx: RouteContext, db: Database, accounts: AccountsService): void {
  defineRoute(ctx, {
    method: 'get',
    path: '/admin/users',
    summary: 'List users',
    tags: ['admin'],
    access: { roles: ['admin'] },
    query: paging,
    response: z.object({ items: z.array(userRow), total: z.number() }),
    handler: async ({ query }) => {
      const rows = await db.select().from(users).orderBy(users.email).limit(query.limit).offset(query.offset);
      const [{ total }] = await db.select({ total: sql<number>`count(*)::int` }).from(users);
      return {
        total,
        items: rows.map((u) => ({
          id: u.id,
          email: u.email,
          name: u.name,
          role: u.role,
          jurisdictionId: u.jurisdictionId,
          disabled: u.disabled,
          createdAt: u.createdAt.toISOString(),
        })),
      };
    },
  });

  defineRoute(ctx, {
    method: 'patch',
    path: '/admin/users/:id',
    summary: "Change a user's role (ends the user's sessions)",
    tags: ['admin'],
    access: { roles: ['admin'] },
    params: idParams,
    response: z.object({ message: z.string() }),
    body: z.strictObject({
      role: z.enum(ROLES, { error: `role must be one of ${ROLES.join(', ')}` }),
      jurisdictionId: z.uuid({ error: 'jurisdictionId must be a UUID' }).nullable().optional(),
    }),
    errors: [404],
    handler: async ({ user, params, body }) => {
      await accounts.changeRole(user!.id, params.id, body.role, body.jurisdictionId);
      return { message: 'Role changed. The user must sign in again.' };
    },
  });

  defineRoute(ctx, {
    method: 'post',
    path: '/admin/invitations',
    summary: 'Invite a person by e-mail with a role',
    tags: ['admin'],
    access: { roles: ['admin'] },
    body: invitationCreateSchema,
    response: z.object({ id: z.string() }),
    successStatus: 201,
    errors: [409],
    handler: ({ user, body }) => accounts.invite(user!.id, body),
  });

  defineRoute(ctx, {
    method: 'get',
    path: '/admin/outbox',
    operationId: 'listOutboxMessages',
    summary: 'Messages received by the local e-mail fake (development)',
    tags: ['admin'],
    access: { roles: ['admin'] },
    query: paging,
    response: z.object({
      items: z.array(z.object({ id: z.string(), receivedAt: z.string(), to: z.array(z.string()), subject: z.string().nullable() })),
      total: z.number(),
    }),
    handler: async ({ query }) => {
      const rows = await db
        .select({ id: outboxMessages.id, receivedAt: outboxMessages.receivedAt, to: outboxMessages.envelopeTo, subject: outboxMessages.subject })
        .from(outboxMessages)
        .orderBy(desc(outboxMessages.receivedAt))
        .limit(query.limit)
        .offset(query.offset);
      const [{ total }] = await db.select({ total: sql<number>`count(*)::int` }).from(outboxMessages);
      return { total, items: rows.map((r) => ({ ...r, receivedAt: r.receivedAt.toISOString() })) };
    },
  });

  defineRoute(ctx, {
    method: 'get',
    path: '/admin/outbox/:id',
    operationId: 'getOutboxMessage',
    summary: 'One message from the local e-mail fake',
    tags: ['admin'],
    access: { roles: ['admin'] },
    params: uuidParams,
    response: z.object({
      id: z.string(),
      receivedAt: z.string(),
      from: z.string().nullable(),
      to: z.array(z.string()),
      subject: z.string().nullable(),
      text: z.string().nullable(),
    }),
    errors: [404],
    handler: async ({ params }) => {
      const [m] = await db.select().from(outboxMessages).where(eq(outboxMessages.id, params.id)).limit(1);
      if (!m) throw new NotFoundError('No message with this id. It may have been cleared; reload the outbox.');
      return { id: m.id, receivedAt: m.receivedAt.toISOString(), from: m.envelopeFrom, to: m.envelopeTo, subject: m.subject, text: m.textBody };
    },
  });

  defineRoute(ctx, {
    method: 'get',
    path: '/admin/audit',
    operationId: 'listAdminAuditEntries',
    summary: 'The audit log, newest first',
    tags: ['admin'],
    access: { roles: ['admin'] },
    query: paging,
    response: z.object({
      items: z.array(
        z.object({
          id: z.string(),
          at: z.string().describe('ISO 8601'),
          actorId: z.string().nullable(),
          action: z.string().describe('e.g. river.update, notice.issue'),
          subjectType: z.string(),
          subjectId: z.string().nullable(),
          jurisdictionId: z.string().nullable(),
          before: z.record(z.string(), z.unknown()).nullable().describe('The changed values before (JSON object), when recorded'),
          after: z.record(z.string(), z.unknown()).nullable().describe('The changed values after (JSON object), when recorded'),
        }),
      ),
    }),
    handler: async ({ query }) => {
      const rows = await db.select().from(auditEntries).orderBy(desc(auditEntries.at)).limit(query.limit).offset(query.offset);
      return { items: rows.map((r) => ({ ...r, at: r.at.toISOString() })) };
    },
  });

  defineRoute(ctx, {
    method: 'get',
    path: '/jurisdictions',
    summary: 'Jurisdictions',
    tags: ['reference'],
    access: { roles: 'any' },
    response: z.object({ items: z.array(z.object({ id: z.string(), slug: z.string(), name: z.string() })) }),
    handler: async () => ({
      items: await db.select({ id: jurisdictions.id, slug: jurisdictions.slug, name: jurisdictions.name }).from(jurisdictions).orderBy(jurisdictions.name),
    }),
  });
}
