import type { RouteContext } from '../http/route';

/** Flood-frequency and flow-record calculators (wired when the hydrology engine lands). */
export function registerHydrologyCalcRoutes(_ctx: RouteContext): void {}
