/**
 * @module shared/schemas/plume
 * Request and response of the plume calculator. A request gives either the four water
 * properties (riverSalinity, riverTemperature, seaSalinity, seaTemperature) or reducedGravity.
 */

import { z } from 'zod';
import { TURNING_SIDES } from '../physics/coriolis';
import { PLUME_REGIMES } from '../physics/plume-regime';
import { numberField, optionalField, strictObjectError } from './physical-fields';
import { latitudeField, salinityField, temperatureField } from './water';

const WATER_FIELDS = ['riverSalinity', 'riverTemperature', 'seaSalinity', 'seaTemperature'] as const;
const EITHER_OR =
  'give either the four water properties (riverSalinity, riverTemperature, seaSalinity, seaTemperature) or reducedGravity';

/** Body of a plume request. Unknown fields are refused. */
export const PlumeRequestSchema = z
  .strictObject(
    {
      latitude: latitudeField(),
      discharge: numberField('discharge', 'm³/s', 'River discharge', { min: 0, exclusiveMin: true }),
      riverSalinity: optionalField(salinityField('riverSalinity')),
      riverTemperature: optionalField(temperatureField('riverTemperature')),
      seaSalinity: optionalField(salinityField('seaSalinity')),
      seaTemperature: optionalField(temperatureField('seaTemperature')),
      mouthWidth: numberField('mouthWidth', 'm', 'Width of the river mouth', { min: 0, exclusiveMin: true }),
      mouthDepth: numberField('mouthDepth', 'm', 'Depth of the river mouth (inflow depth)', {
        min: 0,
        exclusiveMin: true,
      }),
      shelfSlope: optionalField(
        numberField('shelfSlope', '', 'Bottom slope off the mouth, depth change per distance (0 = unknown)', {
          min: 0,
          max: 0.5,
        }),
      ),
      alongshoreShare: optionalField(
        numberField('alongshoreShare', '', 'Share of the discharge carried on into the coastal current (default 0.6)', {
          min: 0.3,
          max: 1,
        }),
      ),
      floodDurationHours: optionalField(
        numberField('floodDurationHours', 'h', 'Flood duration, for the reach along the coast', {
          min: 0,
          exclusiveMin: true,
        }),
      ),
      reducedGravity: optionalField(
        numberField('reducedGravity', 'm/s²', 'Reduced gravity g′, given instead of the four water properties', {
          min: 0,
          exclusiveMin: true,
        }),
      ),
    },
    strictObjectError('plume request'),
  )
  .superRefine((body, ctx) => {
    const given = WATER_FIELDS.filter((key) => body[key] !== undefined);
    if (body.reducedGravity !== undefined) {
      if (given.length > 0) {
        ctx.addIssue({
          code: 'custom',
          path: ['reducedGravity'],
          message: `${EITHER_OR}, not both (got reducedGravity and ${given.join(', ')})`,
        });
      }
      return;
    }
    const missing = WATER_FIELDS.filter((key) => body[key] === undefined);
    if (missing.length > 0) {
      ctx.addIssue({
        code: 'custom',
        path: given.length > 0 ? [missing[0]] : ['reducedGravity'],
        message: `${EITHER_OR} (missing: ${missing.join(', ')})`,
      });
    }
  });

/** A parsed plume request. */
export type PlumeRequest = z.infer<typeof PlumeRequestSchema>;

/** Regimes reported by the plume calculator. */
export const PlumeRegimeSchema = z
  .enum(PLUME_REGIMES)
  .describe('Plume regime after Yankovsky & Chapman (1997), or the equatorial fallback');

/** Side of the outflow (looking seaward) to which the plume turns. */
export const TurningSideSchema = z
  .enum(TURNING_SIDES)
  .describe('Side of the outflow, looking seaward, to which the plume turns');

/** Response of the plume calculator. These names must exist; extra fields are allowed. */
export const PlumeResponseSchema = z.looseObject({
  coriolis: z.number().describe('Coriolis parameter f, negative in the southern hemisphere (s⁻¹)'),
  reducedGravity: z.number().describe('Reduced gravity g′ (m s⁻²)'),
  regime: PlumeRegimeSchema,
  depth: z.number().describe('Coastal-current depth at the coast H0 (m)'),
  width: z.number().describe('Coastal-current width W0 (m)'),
  meanSpeed: z.number().describe('Mean speed of the coastal current U0 (m s⁻¹)'),
  noseSpeed: z.number().describe('Advance speed of the current’s nose, c_p on a slope or c_w (m s⁻¹)'),
  slopeWidth: z.number().optional().describe('Width over the sloping shelf W_p (m)'),
  bulgeOffshoreExtent: z.number().describe('Offshore distance of the bulge front y_s (m)'),
  bottomAttachmentDepth: z.number().describe('Bottom-attachment depth h_b (m)'),
  reach: z.number().optional().describe('Distance along the coast reached by the end of the flood (m)'),
  turnsTo: TurningSideSchema,
  deformationRadius: z.number().nullable().optional().describe('Internal deformation radius (m); null on the equator'),
  kelvinNumber: z.number().optional().describe('Kelvin number of the mouth (–)'),
  froudeNumber: z.number().optional().describe('Froude number of the mouth (–)'),
  warnings: z.array(z.string()).describe('Plain-English list of the model assumptions these inputs break'),
  assumptions: z.array(z.string()).optional().describe('Plain-English list of the assumptions behind every number'),
});

/** A plume response. */
export type PlumeResponse = z.infer<typeof PlumeResponseSchema>;

/**
 * Every number the plume chain returns (shared/physics/compute-plume.ts PlumeResult): the calculator's
 * answer and a scenario's plume. A superset of PlumeResponseSchema's contract fields.
 */
export const plumeResultSchema = z.object({
  coriolis: z.number().describe('Coriolis parameter f, negative in the southern hemisphere (s⁻¹)'),
  reducedGravity: z.number().describe('Reduced gravity g′ (m s⁻²)'),
  densityDifference: z.number().describe('Δρ = g′ρ0/g (kg m⁻³)'),
  riverDensity: z.number().optional().describe('River water surface density (kg m⁻³); absent when g′ was given'),
  seaDensity: z.number().optional().describe('Sea water surface density (kg m⁻³); absent when g′ was given'),
  regime: PlumeRegimeSchema,
  depth: z.number().describe('Coastal-current depth at the coast H0 (m)'),
  width: z.number().describe('Coastal-current width W0 (m)'),
  meanSpeed: z.number().describe('Mean speed of the coastal current U0 (m s⁻¹)'),
  noseSpeed: z.number().describe('Advance speed of the current’s nose, c_p on a slope or c_w (m s⁻¹)'),
  wallNoseSpeed: z.number().optional().describe('Wall-limit nose speed c_w (m s⁻¹)'),
  slopeSpeed: z.number().optional().describe('c_α = αg′/|f| (m s⁻¹), when a slope is known'),
  slopeWidth: z.number().optional().describe('Width over the sloping shelf W_p (m)'),
  bulgeOffshoreExtent: z.number().describe('Offshore distance of the bulge front y_s (m)'),
  bottomAttachmentDepth: z.number().describe('Bottom-attachment depth h_b (m)'),
  bottomFrontDistance: z.number().optional().describe('Offshore distance of the h_b isobath (m), when a slope is known'),
  reach: z.number().optional().describe('Distance along the coast reached by the end of the flood (m)'),
  turnsTo: TurningSideSchema,
  deformationRadius: z.number().nullable().describe('Internal deformation radius (m); null on the equator'),
  kelvinNumber: z.number().describe('Kelvin number of the mouth (–)'),
  froudeNumber: z.number().describe('Froude number of the mouth (–)'),
  rossbyNumber: z.number().nullable().describe('Rossby number of the inflow (–); null on the equator'),
  inflowVelocity: z.number().describe('Mean velocity through the mouth (m s⁻¹)'),
  alongshoreShare: z.number().describe('Share of the discharge carried on into the coastal current (–)'),
  alongshoreDischarge: z.number().describe('Discharge of the coastal current (m³/s)'),
  warnings: z.array(z.string()).describe('Plain-English list of the model assumptions these inputs break'),
  assumptions: z.array(z.string()).describe('Plain-English list of the assumptions behind every number'),
});
