/** Closure zones that are closed (or waiting to reopen) near the caller's leases, for the overview. */
import { z } from 'zod';
import { areaGeometrySchema } from './geojson';

export const ZONE_STATUSES = ['open', 'closed', 'reopening-pending'] as const;
export type ZoneStatus = (typeof ZONE_STATUSES)[number];

/** How far from a lease a closed zone still counts as "near" it, in metres (common practice: a bay-scale distance). */
export const NEARBY_CLOSURE_DISTANCE_M = 5000;

export const nearbyClosureSchema = z.object({
  zoneId: z.string(),
  zoneName: z.string(),
  status: z.enum(ZONE_STATUSES),
  since: z.string(),
  riverName: z.string().nullable(),
  leases: z
    .array(z.object({ leaseId: z.string(), leaseCode: z.string(), distanceM: z.number().describe('0 when the lease overlaps the zone') }))
    .describe('Your visible leases inside or within the nearby distance of the zone, nearest first'),
});
export type NearbyClosure = z.infer<typeof nearbyClosureSchema>;
export const nearbyClosureListSchema = z.object({ items: z.array(nearbyClosureSchema), distanceM: z.number() });
export type NearbyClosureList = z.infer<typeof nearbyClosureListSchema>;

/** Closure zones as GeoJSON for the exposure map: public plan values and status only. */
export const zoneMapSchema = z.object({
  type: z.literal('FeatureCollection'),
  features: z.array(
    z.object({
      type: z.literal('Feature'),
      properties: z.object({
        id: z.string(),
        name: z.string(),
        status: z.enum(ZONE_STATUSES),
        since: z.string(),
        riverName: z.string().nullable(),
        triggerFlow: z.number().nullable().describe("The management plan's trigger flow, m³/s"),
      }),
      geometry: areaGeometrySchema.describe('GeoJSON MultiPolygon in EPSG:4326'),
    }),
  ),
});
export type ZoneMap = z.infer<typeof zoneMapSchema>;

/** What the maps may draw beneath their vector layers: nothing (the default), or a raster basemap the user switches on. */
export const mapSettingsSchema = z.object({
  basemap: z
    .object({ url: z.string().describe('XYZ tile template with {z}, {x} and {y}'), attribution: z.string() })
    .nullable()
    .describe('null: vector layers only (works with no internet)'),
});
export type MapSettings = z.infer<typeof mapSettingsSchema>;
