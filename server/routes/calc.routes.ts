import type { RouteContext } from '../http/route';

/** The science engine's calculator API (filled in when the engine lands). */
export function registerCalcRoutes(_ctx: RouteContext): void {}
