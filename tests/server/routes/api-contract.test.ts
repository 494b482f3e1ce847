/**
 * The API contract, from the route registry and the OpenAPI document (so a route added by anyone is held
 * to it the day it is added):
 * - every route declares its request schemas (for the path parameters, body and query it reads) and its
 *   response (a JSON schema, a schema per media type for CSV / tiles / GeoJSON downloads, or 204);
 * - every operation has a unique, readable operationId and a security declaration ([] when open);
 * - a standard OpenAPI linter (Redocly CLI, recommended rules) finds no error in the document;
 * - TypeScript types generated from it (openapi-typescript) typecheck a small client that calls real
 *   operations, and that client talks to the running app.
 * The rules are written up in DEVELOPERS.md (decision "An honest API contract").
 */
import { execFile } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { promisify } from 'node:util';
import { OpenAPIRegistry } from '@asteasolutions/zod-to-openapi';
import express from 'express';
import openapiTS from 'openapi-typescript';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { z } from 'zod';
import { type DeclaredRoute, declaredRoutes, defineRoute, deriveOperationId, type RouteContext } from '../../../server/http/route';
import { seedDemoRegion } from '../../../server/db/seed-demo-region';
import { errorHandler } from '../../../server/middleware/error-handler';
import { NO_RESULT_CACHE } from '../../../server/cache/result-cache';
import { createTestApp, DEMO_PASSWORD, type TestApp } from '../../helpers/test-app';

const run = promisify(execFile);
const ROOT = path.resolve(import.meta.dirname, '../../..');
const BIN = (name: string) => path.join(ROOT, 'node_modules', '.bin', name);

type OpenApiOperation = {
  operationId?: string;
  security?: Record<string, string[]>[];
  responses: Record<string, { content?: Record<string, { schema?: unknown }> }>;
};
type OpenApiDocument = { paths: Record<string, Record<string, OpenApiOperation>>; components?: { securitySchemes?: Record<string, unknown> } };

let t: TestApp;
let doc: OpenApiDocument;
let routes: readonly DeclaredRoute[];
let work: string;

beforeAll(async () => {
  t = await createTestApp();
  // The client below lists the grower's leases and rivers: the demo region gives it some whatever ran before.
  await seedDemoRegion(t.db.db);
  doc = (await request(t.app).get('/api/v1/openapi.json').expect(200)).body;
  routes = t.app.locals.apiRoutes;
  work = mkdtempSync(path.join(tmpdir(), 'brackline-contract-'));
}, 180_000);
afterAll(async () => {
  rmSync(work, { recursive: true, force: true });
  await t.close();
});

/** The names a handler takes from its context: `({ user, body, req }) => …` → user, body, req. */
function handlerNames(source: string): string[] {
  const m = /^\s*(?:async\s*)?(?:function\s*\w*\s*)?\(\s*\{([^}]*)\}/.exec(source);
  return m ? m[1].split(',').map((s) => s.trim().split(':')[0].trim()).filter(Boolean) : [];
}

/** Everything wrong with the declared routes, one sentence each (empty when the contract holds). */
function contractProblems(list: readonly DeclaredRoute[]): string[] {
  const problems: string[] = [];
  const ids = new Map<string, string>();
  for (const r of list) {
    const name = `${r.method.toUpperCase()} ${r.openApiPath}`;
    // Response.
    if (r.response === undefined) problems.push(`${name}: no response declared (give response: a zod schema, { content }, or null for 204)`);
    else if (r.response === null) {
      if (r.successStatus !== 204) problems.push(`${name}: response null must answer 204`);
    } else if (!(r.response instanceof z.ZodType)) {
      const content = Object.entries(r.response.content ?? {});
      if (content.length === 0) problems.push(`${name}: response content lists no media type`);
      for (const [type, schema] of content) if (!schema) problems.push(`${name}: ${type} has no schema`);
    }
    // Path parameters.
    const pathParams = [...r.path.matchAll(/:([A-Za-z0-9_]+)/g)].map((m) => m[1]).sort();
    const declaredParams = r.params instanceof z.ZodObject ? Object.keys(r.params.shape).sort() : [];
    if (pathParams.length && !r.params) problems.push(`${name}: path parameters ${pathParams.join(', ')} have no params schema`);
    else if (pathParams.join(',') !== declaredParams.join(',')) {
      problems.push(`${name}: params schema declares [${declaredParams.join(', ')}] but the path has [${pathParams.join(', ')}]`);
    }
    // Body and query the handler reads.
    const names = handlerNames(r.handlerSource);
    const readsReq = (what: string) => names.includes('req') && new RegExp(`\\breq\\.${what}\\b`).test(r.handlerSource);
    const readsBody = names.includes('body') || readsReq('body') || readsReq('file');
    if (readsBody && !r.body && !r.requestContent) problems.push(`${name}: reads a request body but declares no body schema (body or requestContent)`);
    if ((names.includes('query') || readsReq('query')) && !r.query) problems.push(`${name}: reads the query but declares no query schema`);
    if (readsReq('params')) problems.push(`${name}: reads req.params; declare params and use the validated params`);
    // operationId.
    if (!/^[a-z][A-Za-z0-9]*$/.test(r.operationId)) problems.push(`${name}: operationId ${r.operationId} is not lower camel case`);
    const other = ids.get(r.operationId);
    if (other) problems.push(`${name}: operationId ${r.operationId} is also used by ${other}`);
    ids.set(r.operationId, name);
  }
  return problems;
}

describe('operationId derivation', () => {
  it.each([
    ['get', '/leases', 'listLeases'],
    ['get', '/leases/:id', 'getLease'],
    ['post', '/rivers', 'createRiver'],
    ['post', '/rivers/:id/scenarios', 'createRiverScenario'],
    ['get', '/rivers/:id/scenarios', 'listRiverScenarios'],
    ['patch', '/admin/users/:id', 'updateAdminUser'],
    ['delete', '/leases/:id', 'deleteLease'],
    ['post', '/imports/:id/confirm', 'confirmImport'],
    ['post', '/calibrations/:id/apply', 'applyCalibration'],
    ['get', '/alert-rules/zones', 'listAlertRuleZones'],
    ['get', '/zones/:id/notices', 'listZoneNotices'],
    ['get', '/billing/subscription', 'getBillingSubscription'],
    ['get', '/public/status/:jurisdiction', 'getPublicStatus'],
    ['put', '/advisers/:id/leases', 'replaceAdviserLeases'],
  ] as const)('%s %s → %s', (method, p, id) => {
    expect(deriveOperationId(method, p)).toBe(id);
  });
});

describe('every route declares its contract (route registry)', () => {
  it('lists every operation of the document, and nothing else', () => {
    const fromRoutes = routes.map((r) => `${r.method} ${r.openApiPath}`).sort();
    const fromDoc = Object.entries(doc.paths).flatMap(([p, item]) => Object.keys(item).map((m) => `${m} ${p}`)).sort();
    // An operation in the document but not in the registry was registered around defineRoute/documentRoute.
    expect(fromDoc).toEqual(fromRoutes);
    expect(routes.length).toBeGreaterThan(100);
  });

  it('has request schemas for what each route reads, a response, and a unique readable operationId', () => {
    expect(contractProblems(routes)).toEqual([]);
  });

  it('finds the faults it looks for (a route without them is caught)', () => {
    const ctx: RouteContext = { router: express.Router(), registry: new OpenAPIRegistry(), basePath: '/api/v1', resolveUser: async () => null, resultCache: NO_RESULT_CACHE };
    const loose = (spec: Record<string, unknown>) =>
      defineRoute(ctx, { summary: 'x', tags: ['x'], access: { roles: 'any' }, response: z.object({}), ...spec } as never);
    loose({ method: 'get', path: '/things/:id', handler: ({ params }: { params: unknown }) => params });
    loose({ method: 'post', path: '/things', handler: ({ body }: { body: unknown }) => body });
    loose({ method: 'get', path: '/stuff', handler: ({ req }: { req: { query: unknown } }) => req.query });
    loose({ method: 'get', path: '/nothing', response: undefined, handler: () => ({}) });
    expect(contractProblems(declaredRoutes(ctx.registry))).toEqual([
      'GET /api/v1/things/{id}: path parameters id have no params schema',
      'POST /api/v1/things: reads a request body but declares no body schema (body or requestContent)',
      'GET /api/v1/stuff: reads the query but declares no query schema',
      'GET /api/v1/nothing: no response declared (give response: a zod schema, { content }, or null for 204)',
    ]);
    expect(() => loose({ method: 'get', path: '/things', operationId: 'getThing', handler: () => ({}) })).toThrow(/getThing/);
  });

  it('answers 500 response_contract in tests when a handler returns what its schema does not allow', async () => {
    const router = express.Router();
    const ctx: RouteContext = { router, registry: new OpenAPIRegistry(), basePath: '', resolveUser: async () => null, checkResponses: true, resultCache: NO_RESULT_CACHE };
    defineRoute(ctx, { method: 'get', path: '/wrong', summary: 'x', tags: ['x'], access: { public: true }, response: z.object({ n: z.number() }), handler: () => ({ n: 'one' }) });
    defineRoute(ctx, { method: 'get', path: '/right', summary: 'x', tags: ['x'], access: { public: true }, response: z.object({ at: z.string() }), handler: () => ({ at: new Date(0) }) });
    const app = express().use(router).use(errorHandler);
    const wrong = await request(app).get('/wrong').expect(500);
    expect(wrong.body.error.code).toBe('response_contract');
    expect(wrong.body.error.message).toMatch(/GET \/wrong .*n: /);
    // Checked as it goes over the wire: a Date is sent as an ISO 8601 string.
    await request(app).get('/right').expect(200, { at: '1970-01-01T00:00:00.000Z' });
  });

  it('gives every operation a security declaration: [] when open, the session cookie or a credential of its own otherwise', () => {
    const schemes = Object.keys(doc.components?.securitySchemes ?? {});
    for (const [p, item] of Object.entries(doc.paths)) {
      for (const [method, op] of Object.entries(item)) {
        expect(Array.isArray(op.security), `${method.toUpperCase()} ${p}`).toBe(true);
        for (const requirement of op.security ?? []) for (const scheme of Object.keys(requirement)) expect(schemes).toContain(scheme);
      }
    }
    const open = routes.filter((r) => 'public' in r.access).map((r) => r.operationId);
    // The open ones: health, sign-up and reset, invitations, the calculators, the public status page, the payment webhook.
    expect(open).toEqual(
      expect.arrayContaining(['getHealth', 'signUp', 'calculatePlume', 'calculateFloodFrequency', 'getPublicStatus', 'receiveBillingWebhook']),
    );
    expect(doc.paths['/api/v1/calc/plume'].post.security).toEqual([]);
    expect(doc.paths['/api/v1/gauges/{id}/readings'].post.security).toEqual([{ gaugeToken: [] }]);
    expect(doc.paths['/api/v1/leases'].get.security).toEqual([{ session: [] }]);
  });

  it('gives every success response a schema (204 has no body)', () => {
    for (const [p, item] of Object.entries(doc.paths)) {
      for (const [method, op] of Object.entries(item)) {
        const success = Object.entries(op.responses).filter(([status]) => status.startsWith('2'));
        expect(success.length, `${method.toUpperCase()} ${p}`).toBe(1);
        for (const [status, res] of success) {
          if (status === '204') {
            expect(res.content, `${method.toUpperCase()} ${p} 204`).toBeUndefined();
            continue;
          }
          const content = Object.entries(res.content ?? {});
          expect(content.length, `${method.toUpperCase()} ${p} ${status} has no content`).toBeGreaterThan(0);
          for (const [type, media] of content) expect(media.schema, `${method.toUpperCase()} ${p} ${status} ${type}`).toBeTruthy();
        }
      }
    }
  });

  it('declares the non-JSON answers with their media types', () => {
    const tile = doc.paths['/api/v1/tiles/leases/{z}/{x}/{y}'].get.responses['200'].content!;
    expect(tile['application/vnd.mapbox-vector-tile'].schema).toEqual({ type: 'string', format: 'binary' });
    const exported = doc.paths['/api/v1/leases/export'].get.responses['200'].content!;
    expect(Object.keys(exported).sort()).toEqual(['application/geo+json', 'application/geopackage+sqlite3', 'application/vnd.google-earth.kml+xml', 'text/csv']);
    expect(exported['application/geopackage+sqlite3'].schema).toMatchObject({ type: 'string', format: 'binary' });
    expect(doc.paths['/api/v1/leases/{id}'].delete.responses['204']).toBeDefined();
  });
});

describe('a standard OpenAPI linter (Redocly CLI, recommended rules)', () => {
  it('finds no error, and no warning beyond those explained here', async () => {
    const file = path.join(work, 'openapi.json');
    writeFileSync(file, JSON.stringify(doc, null, 1));
    // Telemetry and the update check off: the linter runs offline.
    const env = { ...process.env, REDOCLY_TELEMETRY: 'off', REDOCLY_SUPPRESS_UPDATE_NOTICE: 'true', NO_COLOR: '1' };
    const out = await run(BIN('redocly'), ['lint', file, '--extends=recommended', '--format=json'], { env, maxBuffer: 32 * 1024 * 1024 }).catch(
      (err: { stdout: string }) => err,
    );
    const report = JSON.parse(out.stdout) as { totals: { errors: number; warnings: number }; problems: { ruleId: string; severity: string; message: string; location: { pointer: string }[] }[] };
    const seen = report.problems.map((p) => `${p.severity} ${p.ruleId} ${p.location[0]?.pointer}`);
    expect(report.totals.errors, seen.join('\n')).toBe(0);
    // Known and accepted: the project has chosen no licence to state, and the health and readiness checks
    // (under /api, outside /api/v1) take no input, so they have no 4xx answer. Anything else is a new
    // warning: fix it rather than allow it here.
    const accepted = (p: string) => p === 'warn info-license #/info' || /^warn operation-4xx-response #\/paths\/~1api~1(?!v1~1)[^/]+\/get\/responses$/.test(p);
    expect(seen.filter((p) => !accepted(p))).toEqual([]);
    expect(seen).toContain('warn info-license #/info');
  }, 60_000);
});

describe('types generated from the document (openapi-typescript)', () => {
  it('typecheck a small client that calls real operations, and that client works against the app', async () => {
    writeFileSync(path.join(work, 'api.ts'), await openapiTS(doc as never, {}));
    writeFileSync(path.join(work, 'client.ts'), CLIENT);
    writeFileSync(
      path.join(work, 'tsconfig.json'),
      JSON.stringify({
        compilerOptions: { strict: true, noEmit: true, target: 'ES2022', module: 'ESNext', moduleResolution: 'bundler', lib: ['ES2022', 'DOM'], types: [], skipLibCheck: false },
        files: ['api.ts', 'client.ts'],
      }),
    );
    const tsc = await run(BIN('tsc'), ['-p', path.join(work, 'tsconfig.json')], { cwd: work }).catch((err: { stdout: string; stderr: string; code: number }) => err);
    expect(`${tsc.stdout}${tsc.stderr}`.trim()).toBe('');

    // The same client, run against the app over real HTTP.
    const base = await t.listen();
    const client = (await import(path.join(work, 'client.ts'))) as { demo: (base: string, cookie: string) => Promise<Record<string, unknown>> };
    const result = await client.demo(base, await sessionCookie(base, 'grower@brackline.test'));
    expect(result.plumeTurnsTo).toBe('right'); // 40° N: the coast is on the right of a northern-hemisphere plume (science.md, turning direction, a)
    expect(result.leaseCount).toBeGreaterThan(0);
    expect(result.firstLeaseArea).toBeGreaterThan(0);
    expect(result.riverCount).toBeGreaterThan(0);
    expect(result.hundredYear).toBeGreaterThan(560); // common practice: a 1 % flood fitted to ten years lies above their largest peak
  }, 120_000);
});

/** Signs in through Auth.js with plain fetch (as a generated client's user would) and returns the Cookie header. */
async function sessionCookie(base: string, email: string): Promise<string> {
  const jar = new Map<string, string>();
  const keep = (res: Response) => {
    for (const c of res.headers.getSetCookie()) {
      const [pair] = c.split(';');
      const i = pair.indexOf('=');
      jar.set(pair.slice(0, i), pair.slice(i + 1));
    }
  };
  const header = () => [...jar].map(([k, v]) => `${k}=${v}`).join('; ');
  const csrf = await fetch(`${base}/auth/csrf`);
  keep(csrf);
  const { csrfToken } = (await csrf.json()) as { csrfToken: string };
  const res = await fetch(`${base}/auth/callback/credentials`, {
    method: 'POST',
    redirect: 'manual',
    headers: { 'Content-Type': 'application/x-www-form-urlencoded', Cookie: header(), 'X-Auth-Return-Redirect': '1' },
    body: new URLSearchParams({ csrfToken, email, password: DEMO_PASSWORD }),
  });
  keep(res);
  return header();
}

/**
 * A small typed client over the generated `paths`: the path, its parameters, the JSON body and the answer
 * are all typed from the document. The @ts-expect-error lines prove the types are real (a blob of
 * `unknown` would let them pass, and tsc would then report the unused directives).
 */
const CLIENT = `import type { paths } from './api';

type Method = 'get' | 'post' | 'put' | 'patch' | 'delete';
type Op<P extends keyof paths, M extends Method> = M extends keyof paths[P] ? NonNullable<paths[P][M]> : never;
type Parameters_<O> = O extends { parameters: infer X } ? X : unknown;
type JsonBody<O> = O extends { requestBody?: { content: { 'application/json': infer B } } } ? B : never;
type Json<R> = R extends { content: { 'application/json': infer J } } ? J : never;
type Ok<O> = O extends { responses: infer R }
  ? 200 extends keyof R ? Json<R[200]> : 201 extends keyof R ? Json<R[201]> : 202 extends keyof R ? Json<R[202]> : 204 extends keyof R ? undefined : never
  : never;

export async function call<P extends keyof paths, M extends Method & keyof paths[P]>(
  base: string,
  method: M,
  path: P,
  init: Parameters_<Op<P, M>> & { body?: JsonBody<Op<P, M>>; cookie?: string },
): Promise<Ok<Op<P, M>>> {
  const { path: pathParams, query, body, cookie } = init as { path?: Record<string, string | number>; query?: Record<string, unknown>; body?: unknown; cookie?: string };
  let url = String(path).replace(/\\{(\\w+)\\}/g, (_m, k: string) => encodeURIComponent(String(pathParams?.[k])));
  const search = new URLSearchParams(Object.entries(query ?? {}).filter(([, v]) => v !== undefined).map(([k, v]) => [k, String(v)]));
  if ([...search].length) url += '?' + search.toString();
  const res = await fetch(base + url, {
    method: method.toUpperCase(),
    headers: { ...(body !== undefined ? { 'Content-Type': 'application/json' } : {}), ...(cookie ? { Cookie: cookie } : {}) },
    body: body === undefined ? undefined : JSON.stringify(body),
  });
  if (!res.ok) throw new Error(method + ' ' + url + ' answered ' + res.status + ': ' + (await res.text()));
  return (res.status === 204 ? undefined : await res.json()) as Ok<Op<P, M>>;
}

export async function demo(base: string, cookie: string) {
  const plume = await call(base, 'post', '/api/v1/calc/plume', {
    body: { latitude: 40, discharge: 500, mouthWidth: 300, mouthDepth: 5, reducedGravity: 0.15 },
  });
  const regime: string = plume.regime;
  const turnsTo: 'right' | 'left' | 'none' = plume.turnsTo;
  const fit = await call(base, 'post', '/api/v1/calc/flood-frequency', { body: { annualPeaks: [120, 340, 210, 560, 180, 290, 410, 150, 230, 380] } });
  const hundredYear: number | undefined = fit.gev.quantiles.find((q) => q.aep === 0.01)?.discharge;

  const leases = await call(base, 'get', '/api/v1/leases', { query: { sort: 'leaseId', withGeometry: 'false' }, cookie });
  const first = leases.items[0];
  const area: number = first.areaM2;
  const lease = await call(base, 'get', '/api/v1/leases/{id}', { path: { id: first.id }, cookie });
  const worst: 'low' | 'moderate' | 'high' | 'severe' | null = lease.worstRating;
  const screenings = await call(base, 'get', '/api/v1/screenings', { query: { leaseId: first.id, limit: 10 }, cookie });
  const rating: 'low' | 'moderate' | 'high' | 'severe' | undefined = screenings.items[0]?.rating;

  const rivers = await call(base, 'get', '/api/v1/rivers', { cookie });
  const river = rivers.items.find((r) => r.hasFlowRecord) ?? rivers.items[0];
  const scenarios = await call(base, 'get', '/api/v1/rivers/{id}/scenarios', { path: { id: river.id }, cookie });
  const scenario = scenarios.items[0];
  const kind: 'aep' | 'seasonal' | 'manual' | undefined = scenario?.kind;
  const plumeOfScenario = scenario ? await call(base, 'get', '/api/v1/scenarios/{id}/plume', { path: { id: scenario.id }, cookie }) : undefined;
  const crossShoreKm: number | undefined = plumeOfScenario?.profiles.crossShore[0]?.offshoreKm;

  // Typed here, not sent (their answers depend on what other tests leave in the database): a footprint
  // (needs a coast), a path parameter with a JSON body, and an answer with no content.
  const footprint = (riverId: string, scenarioId: string) => call(base, 'get', '/api/v1/footprints', { query: { riverId, scenarioId }, cookie });
  const geometryTypeOf = (fc: Awaited<ReturnType<typeof footprint>>): string => fc.features[0].geometry.type;
  const addScenario = (riverId: string) =>
    call(base, 'post', '/api/v1/rivers/{id}/scenarios', { path: { id: riverId }, body: { name: 'Typed flow', discharge: 300, durationHours: 48 }, cookie });
  const removeScenario = async (id: string): Promise<undefined> => call(base, 'delete', '/api/v1/scenarios/{id}', { path: { id }, cookie });

  // @ts-expect-error a scenario needs durationHours
  const _missing = () => call(base, 'post', '/api/v1/rivers/{id}/scenarios', { path: { id: river.id }, body: { name: 'x', discharge: 1 }, cookie });
  // @ts-expect-error leases have areaM2, not areaHa
  const _wrongField: number = first.areaHa;
  // @ts-expect-error the lease list takes no query parameter "colour"
  const _wrongQuery = () => call(base, 'get', '/api/v1/leases', { query: { colour: 'red' }, cookie });
  // @ts-expect-error a GeoJSON geometry's type is text, not a number
  const _notANumber = (fc: Awaited<ReturnType<typeof footprint>>): number => fc.features[0].geometry.type;
  void [_missing, _wrongField, _wrongQuery, _notANumber, regime, hundredYear, worst, kind, crossShoreKm, rating, geometryTypeOf, addScenario, removeScenario];

  return { plumeTurnsTo: turnsTo, leaseCount: leases.items.length, firstLeaseArea: area, riverCount: rivers.items.length, hundredYear };
}
`;
