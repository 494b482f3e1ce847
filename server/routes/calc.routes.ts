/**
 * The science engine as a stateless calculator API: open without sign-in, rate-limited,
 * SI units, unknown fields refused. The same shared functions run in the browser for previews.
 */
import { coriolisParameter } from '#shared/physics/coriolis';
import { computePlume } from '#shared/physics/compute-plume';
import { seawaterDensity } from '#shared/physics/eos80';
import { PlumeRequestSchema, plumeResultSchema } from '#shared/schemas/plume';
import { WaterRequestSchema, WaterResponseSchema } from '#shared/schemas/water';
import { defineRoute, type RouteContext } from '../http/route';
import { registerHydrologyCalcRoutes } from './calc-hydrology.routes';
import { engineCall } from './engine-call';

export function registerCalcRoutes(ctx: RouteContext): void {
  defineRoute(ctx, {
    method: 'post',
    path: '/calc/water',
    operationId: 'calculateWater',
    summary: 'Density of water (UNESCO EOS-80) and, with a latitude, the Coriolis parameter',
    tags: ['calculator'],
    access: { public: true },
    body: WaterRequestSchema,
    response: WaterResponseSchema,
    errors: [429],
    handler: ({ body }) => ({
      density: seawaterDensity(body.salinity, body.temperature, body.pressureDbar ?? 0),
      ...(body.latitude !== undefined ? { coriolis: coriolisParameter(body.latitude) } : {}),
    }),
  });

  defineRoute(ctx, {
    method: 'post',
    path: '/calc/plume',
    operationId: 'calculatePlume',
    summary: 'Rotating river plume for one river and one flow: regime, bulge, coastal current, reach',
    tags: ['calculator'],
    access: { public: true },
    body: PlumeRequestSchema,
    response: plumeResultSchema,
    errors: [429],
    handler: ({ body }) => engineCall(() => computePlume(body)),
  });

  registerHydrologyCalcRoutes(ctx);
}
