/**
 * One way to declare an API route: the zod schemas validate the request, the access rule
 * is checked before the handler runs, and the same declaration feeds the OpenAPI document.
 * Routes are therefore never missing from /api/v1/openapi.json, and never unguarded.
 */
import type { OpenAPIRegistry, ResponseConfig, ZodMediaTypeObject } from '@asteasolutions/zod-to-openapi';
import type { NextFunction, Request, RequestHandler, Response, Router } from 'express';
import { gzipSync } from 'node:zlib';
import { z } from 'zod';
import type { Role } from '#shared/schemas/roles';
import { AppError, ForbiddenError, UnauthenticatedError, ValidationError } from '../lib/errors';
import { describeZodError } from './zod-issues';
import type { ResultCache } from '../cache/result-cache';

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

/** A plain JSON Schema object (for bodies zod does not describe, such as binary files). */
export type SchemaObject = Exclude<NonNullable<ZodMediaTypeObject['schema']>, z.ZodType>;

/**
 * What a route answers on success:
 * - a zod schema: a JSON body (application/json) at `successStatus` (200 unless given);
 * - `{ content }`: a body that is not JSON (CSV, vector tiles, GeoJSON downloads), one schema per media type;
 *   a zod schema or a plain JSON Schema object such as `BINARY_BODY`;
 * - `null`: 204 No Content (the handler returns undefined).
 */
export type ResponseSpec = z.ZodType | { content: Record<string, z.ZodType | SchemaObject>; description?: string } | null;

/** A binary body (vector tiles, files) in the OpenAPI document. */
export const BINARY_BODY: SchemaObject = { type: 'string', format: 'binary' };

/**
 * The file field of a multipart body, documented as binary. multer takes the file out of the body (req.file),
 * so the field is optional to the validation; the upload middleware refuses a request without it.
 */
export function uploadedFile(description: string) {
  return z.unknown().optional().meta({ type: 'string', format: 'binary', description });
}

export interface RouteSpec<B extends z.ZodType, Q extends z.ZodType, P extends z.ZodType> {
  method: 'get' | 'post' | 'put' | 'patch' | 'delete';
  /** Express-style path under /api/v1, e.g. '/leases/:id'. */
  path: string;
  /**
   * The operation's name in the OpenAPI document and in generated clients. Derived from the method and
   * path when left out (GET /leases → listLeases, GET /leases/:id → getLease, POST /rivers/:id/scenarios →
   * createRiverScenario); give one where the derived name reads badly. Unique across the API.
   */
  operationId?: string;
  summary: string;
  tags: string[];
  access: Access;
  /**
   * Security other than the session cookie, for a public route that checks a credential of its own
   * (documented only; the route or its service checks it). Open routes get `security: []`.
   */
  security?: Record<string, string[]>[];
  body?: B;
  /** Media type of the body when it is not JSON (documented only). */
  bodyContentType?: string;
  /**
   * A request body the handler's service validates itself (e.g. after checking a token, or JSON or CSV):
   * documented here, one schema per media type. Use `body` whenever defineRoute can validate it.
   */
  requestContent?: Record<string, z.ZodType>;
  query?: Q;
  params?: P;
  /** Required: every route declares what it answers (see ResponseSpec). */
  response: ResponseSpec;
  successStatus?: number;
  /** Extra error statuses the route can return, for the document. */
  errors?: number[];
  /** Other answers whose body is not the error body (e.g. the health check's 503), for the document. */
  otherResponses?: Record<number, { description: string; schema: z.ZodType }>;
  /** Runs after the access check and before validation (e.g. multipart parsing). */
  middleware?: RequestHandler[];
  /** Returns the JSON body; return undefined after writing the response yourself. */
  handler: (ctx: HandlerContext<z.infer<B>, z.infer<Q>, z.infer<P>>) => Promise<unknown> | unknown;
}

/** A documented operation, as the contract tests read it (see declaredRoutes). */
export interface DeclaredRoute {
  method: RouteSpec<z.ZodType, z.ZodType, z.ZodType>['method'];
  /** Express-style path under the base path. */
  path: string;
  /** Path in the OpenAPI document ({param} form, with the base path). */
  openApiPath: string;
  operationId: string;
  access: Access;
  body?: z.ZodType;
  requestContent?: Record<string, z.ZodType>;
  query?: z.ZodType;
  params?: z.ZodType;
  response: ResponseSpec;
  successStatus: number;
  /** Mounted outside the API router (documented with documentRoute). */
  external: boolean;
  /** The handler's source, read by the contract test to find bodies or queries read without a schema. */
  handlerSource: string;
}

export interface RouteContext {
  router: Router;
  registry: OpenAPIRegistry;
  /** Resolves the signed-in user (or null) for a request. */
  resolveUser: (req: Request) => Promise<CurrentUser | null>;
  basePath: string;
  /**
   * Check every JSON answer against the route's declared response schema (as it goes over the wire) and
   * answer 500 `response_contract` when it does not match. On in tests (NODE_ENV=test), so every API and
   * browser test also proves the document tells the truth; off in production.
   */
  checkResponses?: boolean;
  /** Answers of the heavy list routes, kept until what they read changes. */
  resultCache: ResultCache;
}

/** The one error body (server/lib/errors.ts → middleware/error-handler.ts), a component of the document. */
const errorBody = z
  .object({
    error: z.object({
      code: z.string().describe('Stable machine-readable code, e.g. validation_error, unauthenticated, not_found'),
      message: z.string().describe('What is wrong and how to fix it'),
      details: z
        .unknown()
        .optional()
        .describe('More about the problem when there is more: the fields at fault for a validation error, or the rows of a refused upload'),
    }),
  })
  .meta({ id: 'Error' });

const declared = new WeakMap<OpenAPIRegistry, DeclaredRoute[]>();

/** Every operation declared on a registry, in declaration order (read by tests/server/routes/api-contract.test.ts). */
export function declaredRoutes(registry: OpenAPIRegistry): readonly DeclaredRoute[] {
  return declared.get(registry) ?? [];
}

const IRREGULAR_SINGULAR: Record<string, string> = { crs: 'crs', status: 'status', settings: 'settings', news: 'news' };
/** Action words that name the operation themselves (POST /imports/:id/confirm → confirmImport). */
const ACTION_SEGMENTS = new Set(['accept', 'apply', 'confirm', 'decline', 'rollback']);

function camel(segment: string): string {
  return segment.replace(/-([a-z0-9])/g, (_m, c: string) => c.toUpperCase());
}
function pascal(segment: string): string {
  const c = camel(segment);
  return c.charAt(0).toUpperCase() + c.slice(1);
}
function singular(segment: string): string {
  if (segment in IRREGULAR_SINGULAR) return IRREGULAR_SINGULAR[segment];
  if (segment.endsWith('ies')) return `${segment.slice(0, -3)}y`;
  if (segment.endsWith('ss') || segment.endsWith('us') || !segment.endsWith('s')) return segment;
  return segment.slice(0, -1);
}

/**
 * The operationId a route gets when it names none: a verb from the method (get an item, list a
 * collection, create, update, replace, delete) and the path's fixed segments, singular except a listed
 * collection. Path parameters add nothing. Examples: GET /leases → listLeases; GET /leases/:id →
 * getLease; POST /rivers/:id/scenarios → createRiverScenario; PATCH /admin/users/:id → updateAdminUser;
 * POST /imports/:id/confirm → confirmImport.
 */
export function deriveOperationId(method: RouteSpec<z.ZodType, z.ZodType, z.ZodType>['method'], path: string): string {
  const parts = path.split('/').filter(Boolean);
  const endsWithParam = parts.length > 0 && parts[parts.length - 1].startsWith(':');
  const fixed = parts.filter((p) => !p.startsWith(':'));
  if (fixed.length === 0) throw new Error(`Cannot derive an operationId for ${method.toUpperCase()} ${path}: give operationId.`);
  const last = fixed[fixed.length - 1];
  if (method === 'post' && !endsWithParam && ACTION_SEGMENTS.has(last)) {
    return camel(last) + fixed.slice(0, -1).map((p) => pascal(singular(p))).join('');
  }
  const nouns = fixed.map((p) => pascal(singular(p)));
  if (method === 'get') {
    // A collection (the path ends in a plural word, not a parameter) is listed; anything else is got.
    const listed = !endsWithParam && singular(last) !== last;
    if (listed) return `list${nouns.slice(0, -1).join('')}${pascal(last)}`;
    return `get${nouns.join('')}`;
  }
  const verb = { post: 'create', patch: 'update', put: 'replace', delete: 'delete' }[method];
  if (method === 'put' && !endsWithParam) return `${verb}${nouns.slice(0, -1).join('')}${pascal(last)}`;
  return `${verb}${nouns.join('')}`;
}

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

type DocumentedSpec = Omit<RouteSpec<z.ZodType, z.ZodType, z.ZodType>, 'handler' | 'middleware'> & {
  /** Base path of the document's path when it is not the API's (e.g. '/api' for /api/health). */
  basePath?: string;
};

function toOpenApiPath(basePath: string, path: string): string {
  return `${basePath}${path.replace(/:([A-Za-z0-9_]+)/g, '{$1}')}`;
}

/** Registers one operation in the OpenAPI document and in the list the contract tests walk. */
function register(ctx: Pick<RouteContext, 'registry' | 'basePath'>, spec: DocumentedSpec, handlerSource: string, external: boolean): DeclaredRoute {
  const basePath = spec.basePath ?? ctx.basePath;
  const openApiPath = toOpenApiPath(basePath, spec.path);
  const operationId = spec.operationId ?? deriveOperationId(spec.method, spec.path);
  const list = declared.get(ctx.registry) ?? [];
  declared.set(ctx.registry, list);
  const clash = list.find((r) => r.operationId === operationId);
  if (clash) {
    throw new Error(
      `operationId ${operationId} of ${spec.method.toUpperCase()} ${openApiPath} is already used by ${clash.method.toUpperCase()} ${clash.openApiPath}: give one of them an explicit operationId.`,
    );
  }
  const successStatus = spec.response === null ? 204 : (spec.successStatus ?? 200);
  if (spec.response === null && spec.successStatus !== undefined && spec.successStatus !== 204) {
    throw new Error(`${spec.method.toUpperCase()} ${openApiPath} answers no content (response: null), so its success status is 204, not ${spec.successStatus}.`);
  }
  const responses: Record<string, ResponseConfig> = {};
  if (spec.response === undefined) {
    // Only reachable around the types; the contract test names the route.
    responses[String(successStatus)] = { description: 'Success (no response declared)' };
  } else if (spec.response === null) {
    responses['204'] = { description: 'Done; no content' };
  } else if (spec.response instanceof z.ZodType) {
    responses[String(successStatus)] = { description: 'Success', content: { 'application/json': { schema: spec.response } } };
  } else {
    responses[String(successStatus)] = {
      description: spec.response.description ?? 'Success',
      content: Object.fromEntries(Object.entries(spec.response.content).map(([type, schema]) => [type, { schema }])),
    };
  }
  for (const [status, other] of Object.entries(spec.otherResponses ?? {})) {
    responses[status] = { description: other.description, content: { 'application/json': { schema: other.schema } } };
  }
  // 400 when there is something to validate; 401/403 from the access rule.
  const takesInput = Boolean(spec.body || spec.requestContent || spec.query || spec.params);
  const errorStatuses = new Set([...(takesInput ? [400] : []), ...(spec.errors ?? [])]);
  if (!('public' in spec.access)) {
    errorStatuses.add(401);
    if (spec.access.roles !== 'any') errorStatuses.add(403);
  }
  for (const status of [...errorStatuses].sort((a, b) => a - b)) {
    responses[String(status)] = { description: ERROR_DESCRIPTIONS[status] ?? 'Error', content: { 'application/json': { schema: errorBody } } };
  }
  const requestBody = spec.body
    ? { content: { [spec.bodyContentType ?? 'application/json']: { schema: spec.body } }, required: true }
    : spec.requestContent
      ? { content: Object.fromEntries(Object.entries(spec.requestContent).map(([type, schema]) => [type, { schema }])), required: true }
      : undefined;
  ctx.registry.registerPath({
    method: spec.method,
    path: openApiPath,
    operationId,
    summary: spec.summary,
    tags: spec.tags,
    // Open routes say so (`[]`); guarded ones need the session cookie; a few check a credential of their own.
    security: 'public' in spec.access ? (spec.security ?? []) : [{ session: [] }],
    // Which roles may call it: documented for API users and read by the access-control tests.
    ...('roles' in spec.access && spec.access.roles !== 'any' ? { 'x-roles': [...spec.access.roles] } : {}),
    request: {
      ...(requestBody ? { body: requestBody } : {}),
      ...(spec.query ? { query: spec.query as never } : {}),
      ...(spec.params ? { params: spec.params as never } : {}),
    },
    responses,
  });
  const route: DeclaredRoute = {
    method: spec.method,
    path: spec.path,
    openApiPath,
    operationId,
    access: spec.access,
    body: spec.body,
    requestContent: spec.requestContent,
    query: spec.query,
    params: spec.params,
    response: spec.response,
    successStatus,
    external,
    handlerSource,
  };
  list.push(route);
  return route;
}

const ERROR_DESCRIPTIONS: Record<number, string> = {
  400: 'The request is not valid; the message names the field',
  401: 'Not signed in, or the credential is missing or wrong',
  403: 'Your role or ownership does not allow this',
  404: 'Not found, or not yours to see',
  409: 'Conflicts with the current state',
  413: 'Too large',
  415: 'Wrong content type',
  422: 'Understood but cannot be done with these values',
  429: 'Too many requests; wait and try again',
  502: 'The payment service answered with an error',
  503: 'A service this needs is not available; try again later',
};

/**
 * A JSON answer already serialised (server/cache/result-cache.ts keeps answers as text): sent as it is, so a kept
 * answer is not serialised again for every caller.
 */
export class JsonText {
  readonly text: string;
  #gzipped: Buffer | undefined;
  constructor(text: string) {
    this.text = text;
  }
  /** The text gzipped, made once: a kept answer is compressed for its first caller only, not for every one. */
  gzipped(): Buffer {
    this.#gzipped ??= gzipSync(this.text);
    return this.#gzipped;
  }
}

/** Below this many characters an answer is sent as it is (compression's own threshold in app.ts). */
const GZIP_FROM_CHARS = 1024;

/** Sends a serialised answer, gzipped once and kept when the client accepts gzip (every browser does). */
function sendJsonText(req: Request, res: Response, status: number, answer: JsonText): void {
  res.status(status).type('application/json');
  if (answer.text.length < GZIP_FROM_CHARS) {
    res.send(answer.text);
    return;
  }
  res.vary('Accept-Encoding');
  if (req.acceptsEncodings('gzip', 'identity') !== 'gzip') {
    res.send(answer.text);
    return;
  }
  res.setHeader('Content-Encoding', 'gzip');
  res.send(answer.gzipped());
}

/** Fails when a JSON answer, as serialised, does not match the declared schema (see RouteContext.checkResponses). */
function checkResponse(method: string, path: string, response: ResponseSpec, result: unknown): void {
  if (!(response instanceof z.ZodType)) {
    throw new AppError(500, 'response_contract', `${method.toUpperCase()} ${path} returned JSON but declares a ${Object.keys(response?.content ?? {}).join(' or ')} body.`);
  }
  const wire: unknown = JSON.parse(result instanceof JsonText ? result.text : JSON.stringify(result));
  const parsed = response.safeParse(wire);
  if (!parsed.success) {
    const issues = parsed.error.issues.slice(0, 5).map((i) => `${i.path.join('.') || '(body)'}: ${i.message}`);
    throw new AppError(
      500,
      'response_contract',
      `${method.toUpperCase()} ${path} answered a body that does not match its declared response schema: ${issues.join('; ')}. Fix the schema or the handler.`,
      parsed.error.issues.slice(0, 20),
    );
  }
}

/**
 * Documents an operation mounted outside the API router (the payment webhook, which needs the raw body;
 * the health check). It is held to the same contract rules as defineRoute's routes.
 */
export function documentRoute(ctx: Pick<RouteContext, 'registry' | 'basePath'>, spec: DocumentedSpec): void {
  register(ctx, spec, '', true);
}

export function defineRoute<
  B extends z.ZodType = z.ZodUnknown,
  Q extends z.ZodType = z.ZodUnknown,
  P extends z.ZodType = z.ZodUnknown,
>(ctx: RouteContext, spec: RouteSpec<B, Q, P>): void {
  register(ctx, spec, spec.handler.toString(), false);

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
      if (spec.response === null) throw new Error(`${spec.method.toUpperCase()} ${spec.path} is declared with no content (response: null) but returned a body.`);
      if (ctx.checkResponses) checkResponse(spec.method, spec.path, spec.response, result);
      if (result instanceof JsonText) sendJsonText(req, res, spec.successStatus ?? 200, result);
      else res.status(spec.successStatus ?? 200).json(result);
    } catch (err) {
      next(err);
    }
  });
}
