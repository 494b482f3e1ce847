import { z } from 'zod';
import {
  alertListSchema,
  alertZoneListSchema,
  forecastResultSchema,
  forecastSchema,
  ruleCreateSchema,
  ruleListSchema,
  ruleSchema,
} from '#shared/schemas/alerts';
import { defineRoute, type RouteContext } from '../http/route';
import type { AlertsService } from '../services/alerts.service';

const ALERT_ROLES = ['grower', 'adviser', 'regulator'] as const;
const idParams = z.object({ id: z.uuid({ error: 'id must be an alert rule id (UUID)' }) });

export function registerAlertRoutes(ctx: RouteContext, alerts: AlertsService): void {
  defineRoute(ctx, {
    method: 'get',
    path: '/alert-rules',
    summary: 'Your alert rules',
    tags: ['alerts'],
    access: { roles: ALERT_ROLES },
    response: ruleListSchema,
    handler: ({ user }) => alerts.listRules(user!),
  });

  defineRoute(ctx, {
    method: 'get',
    path: '/alert-rules/zones',
    summary: 'Closure zones of your jurisdiction you can set trigger alerts on (regulators; free)',
    tags: ['alerts'],
    access: { roles: ['regulator'] },
    response: alertZoneListSchema,
    handler: ({ user }) => alerts.zones(user!),
  });

  defineRoute(ctx, {
    method: 'post',
    path: '/alert-rules',
    summary:
      "Set an alert: a lease entering a band of its flow sweep (Alerts plan), or a closure zone's trigger flow approached and passed (regulators, free)",
    tags: ['alerts'],
    access: { roles: ALERT_ROLES },
    body: ruleCreateSchema,
    response: ruleSchema,
    successStatus: 201,
    errors: [404, 422],
    handler: ({ user, body }) => alerts.createRule(user!, body),
  });

  defineRoute(ctx, {
    method: 'delete',
    path: '/alert-rules/:id',
    summary: 'Delete one of your alert rules',
    tags: ['alerts'],
    access: { roles: ALERT_ROLES },
    params: idParams,
    response: null,
    errors: [404],
    handler: async ({ user, params }) => {
      await alerts.deleteRule(user!, params.id);
      return undefined;
    },
  });

  defineRoute(ctx, {
    method: 'post',
    path: '/alert-rules/:id/forecast',
    operationId: 'checkAlertRuleForecast',
    summary: 'Check a forecast flow against a rule: alerts now (once per flow) if it reaches the rule’s flow',
    tags: ['alerts'],
    access: { roles: ALERT_ROLES },
    params: idParams,
    body: forecastSchema,
    response: forecastResultSchema,
    errors: [404],
    handler: ({ user, params, body }) => alerts.forecast(user!, params.id, body.discharge),
  });

  defineRoute(ctx, {
    method: 'get',
    path: '/alerts',
    summary: 'Your alerts, newest first, with their e-mail delivery state',
    tags: ['alerts'],
    access: { roles: ALERT_ROLES },
    response: alertListSchema,
    handler: ({ user }) => alerts.listAlerts(user!),
  });
}
