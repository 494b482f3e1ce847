/**
 * Route by route, from the OpenAPI document (so a new route is covered the day it is added):
 * every guarded route refuses an anonymous caller with 401, and every role-restricted route
 * refuses each role it does not list with 403.
 */
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ROLES, type Role } from '../../../shared/schemas/roles';
import { createTestApp, signIn, type TestApp } from '../../helpers/test-app';

let t: TestApp;
let agents: Record<Role, ReturnType<typeof request.agent>>;
let operations: { method: string; path: string; url: string; guarded: boolean; forbiddenFor: Role[] }[];

const SAMPLE_PARAM = '00000000-0000-4000-8000-000000000000';

beforeAll(async () => {
  t = await createTestApp();
  agents = {} as typeof agents;
  for (const role of ROLES) agents[role] = (await signIn(t.app, `${role}@brackline.test`)).agent;
  const doc = (await request(t.app).get('/api/v1/openapi.json').expect(200)).body;
  operations = [];
  for (const [path, item] of Object.entries<Record<string, { security?: Record<string, unknown>[]; responses: Record<string, unknown> }>>(doc.paths)) {
    for (const [method, op] of Object.entries(item)) {
      const url = path.replace(/\{[^}]+\}/g, SAMPLE_PARAM);
      operations.push({
        method,
        path,
        url,
        // Guarded by the session cookie; a route with a credential of its own (a gauge's upload token)
        // is tested with that credential in its own file.
        guarded: Boolean(op.security?.some((s) => 'session' in s)),
        forbiddenFor: op.responses['403'] ? ROLES.filter((r) => (op as { 'x-roles'?: Role[] })['x-roles']?.includes(r) === false) : [],
      });
    }
  }
});
afterAll(async () => {
  await t.close();
});

describe('access control on every /api/v1 route', () => {
  it('the document lists the routes', () => {
    expect(operations.length).toBeGreaterThan(10);
  });

  it('refuses anonymous callers on every guarded route with 401', async () => {
    const guarded = operations.filter((o) => o.guarded);
    expect(guarded.length).toBeGreaterThan(5);
    for (const op of guarded) {
      const res = await request(t.app)[op.method as 'get'](op.url).send({});
      expect(res.status, `${op.method.toUpperCase()} ${op.path}`).toBe(401);
      expect(res.body.error.code).toBe('unauthenticated');
    }
  });

  it('refuses each role a route does not list with 403', async () => {
    let checked = 0;
    for (const op of operations.filter((o) => o.forbiddenFor.length > 0)) {
      for (const role of op.forbiddenFor) {
        const res = await agents[role][op.method as 'get'](op.url).send({});
        expect(res.status, `${role} → ${op.method.toUpperCase()} ${op.path}`).toBe(403);
        expect(res.body.error.message).toMatch(/cannot do this/);
        checked++;
      }
    }
    expect(checked).toBeGreaterThan(10);
  });

  it('lets a listed role through the guard (no 401/403)', async () => {
    for (const op of operations.filter((o) => o.forbiddenFor.length > 0 && o.method === 'get')) {
      const allowed = ROLES.find((r) => !op.forbiddenFor.includes(r))!;
      const res = await agents[allowed].get(op.url);
      expect([401, 403], `${allowed} → GET ${op.path}`).not.toContain(res.status);
    }
  });
});
