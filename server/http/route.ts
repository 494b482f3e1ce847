/**
 * One way to declare an API route: the zod schemas validate the request, the access rule
 * is checked before the handler runs, and the same declaration feeds the OpenAPI document.
 * Routes are therefore never missing from /api/v1/openapi.json, and never unguarded.
 */
import type { OpenAPIRegistry } from '@asteasolutions/zod-to-openapi';
import type { NextFunction, Request, RequestHandler, Response, Router } from 'express';
import { z } from 'zod';
import type { Role } from '#shared/schemas/roles';
import { ForbiddenError, UnauthenticatedError, ValidationError } from '../lib/errors';
import { describeZodError } from './zod-issues';

export interface CurrentUser {
  id: string;
  email: string;
  name: string | null;
  role: Role;
  organisationId: string | null;
  jurisdictionId: string | null;
}

/** Who may call a route: anyone, any signed-in user, or the listed roles. */
export type Access = { public: true } | { roles: readonly Role[] | 'any' };

export interface HandlerContext<B, Q, P> {
  req: Request;
  res: Response;
  user: CurrentUser | null;
  body: B;
  query: Q;
  params: P;
}

export interface RouteSpec<B extends z.ZodType, Q extends z.ZodType, P extends z.ZodType> {
  method: 'get' | 'post' | 'put' | 'patch' | 'delete';
  /** Express-style path under /api/v1, e.g. '/leases/:id'. */
  path: string;
  summary: string;
  tags: string[];
  access: Access;
  body?: B;
  /** Media type of the body when it is not JSON (documented only). */
  bodyContentType?: string;
  query?: Q;
  params?: P;
  response?: z.ZodType;
  /** Media type(s) of a response that is a file rather than JSON (documented with `response` as its schema). */
  responseContentType?: string | readonly string[];
  successStatus?: number;
  /** Extra error statuses the route can return, for the document. */
  errors?: number[];
  /** Runs after the access check and before validation (e.g. multipart parsing). */
  middleware?: RequestHandler[];
  /** Returns the JSON body; return undefined after writing the response yourself. */
  handler: (ctx: HandlerContext<z.infer<B>, z.infer<Q>, z.infer<P>>) => Promise<unknown> | unknown;
}

export interface RouteContext {
  router: Router;
  registry: OpenAPIRegistry;
  /** Resolves the signed-in user (or null) for a request. */
  resolveUser: (req: Request) => Promise<CurrentUser | null>;
  basePath: string;
}

const errorBody = z.object({
  error: z.object({ code: z.string(), message: z.string(), details: z.unknown().optional() }),
});

function parseOrThrow<T extends z.ZodType>(schema: T | undefined, value: unknown, where: string): z.infer<T> {
  if (!schema) return value as z.infer<T>;
  const parsed = schema.safeParse(value);
  if (!parsed.success) {
    const { message, details } = describeZodError(parsed.error, where);
    throw new ValidationError(message, details);
  }
  return parsed.data;
}

export function checkAccess(access: Access, user: CurrentUser | null): void {
  if ('public' in access) return;
  if (!user) throw new UnauthenticatedError();
  if (access.roles !== 'any' && !access.roles.includes(user.role)) {
    throw new ForbiddenError(
      `Your role (${user.role}) cannot do this. It is for: ${access.roles.join(', ')}. Ask an administrator if you need access.`,
    );
  }
}

export function defineRoute<
  B extends z.ZodType = z.ZodUnknown,
  Q extends z.ZodType = z.ZodUnknown,
  P extends z.ZodType = z.ZodUnknown,
>(ctx: RouteContext, spec: RouteSpec<B, Q, P>): void {
  const openApiPath = `${ctx.basePath}${spec.path.replace(/:([A-Za-z0-9_]+)/g, '{$1}')}`;
  const responses: Record<string, { description: string; content?: Record<string, { schema: z.ZodType }> }> = {
    [String(spec.successStatus ?? 200)]: {
      description: 'Success',
      ...(spec.response
        ? {
            content: Object.fromEntries(
              [spec.responseContentType ?? 'application/json'].flat().map((type) => [type, { schema: spec.response as z.ZodType }]),
            ),
          }
        : {}),
    },
  };
  const errorStatuses = new Set([400, ...(spec.errors ?? [])]);
  if (!('public' in spec.access)) {
    errorStatuses.add(401);
    if (spec.access.roles !== 'any') errorStatuses.add(403);
  }
  for (const status of errorStatuses) {
    responses[String(status)] = { description: 'Error', content: { 'application/json': { schema: errorBody } } };
  }
  ctx.registry.registerPath({
    method: spec.method,
    path: openApiPath,
    summary: spec.summary,
    tags: spec.tags,
    ...('public' in spec.access ? {} : { security: [{ session: [] }] }),
    // Which roles may call it: documented for API users and read by the access-control tests.
    ...('roles' in spec.access && spec.access.roles !== 'any' ? { 'x-roles': [...spec.access.roles] } : {}),
    request: {
      ...(spec.body
        ? { body: { content: { [spec.bodyContentType ?? 'application/json']: { schema: spec.body } }, required: true } }
        : {}),
      ...(spec.query ? { query: spec.query as never } : {}),
      ...(spec.params ? { params: spec.params as never } : {}),
    },
    responses,
  });

  // The guard runs first, so nobody uploads or is validated before their role is checked.
  const guard = async (req: Request, res: Response, next: NextFunction) => {
    try {
      const user = await ctx.resolveUser(req);
      checkAccess(spec.access, user);
      res.locals.user = user;
      next();
    } catch (err) {
      next(err);
    }
  };
  ctx.router[spec.method](spec.path, guard, ...(spec.middleware ?? []), async (req: Request, res: Response, next: NextFunction) => {
    try {
      const user = res.locals.user as CurrentUser | null;
      const params = parseOrThrow(spec.params, req.params, 'path');
      const query = parseOrThrow(spec.query, req.query, 'query');
      const body = parseOrThrow(spec.body, req.body, 'body');
      const result = await spec.handler({ req, res, user, body, query, params });
      if (result === undefined) {
        if (!res.headersSent) res.status(204).end();
        return;
      }
      res.status(spec.successStatus ?? 200).json(result);
    } catch (err) {
      next(err);
    }
  });
}
