/**
 * @module shared/schemas/water
 * Request and response of the water-properties calculator: EOS-80 density of one water
 * sample and, optionally, the Coriolis parameter at a latitude.
 */

import { z } from 'zod';
import { numberField, optionalField, strictObjectError } from './physical-fields';

/** Practical salinity field, 0…42 (EOS-80 range, science.md §2.1). */
export const salinityField = (name: string) =>
  numberField(name, '(practical salinity, PSS-78)', `${name}, practical salinity`, { min: 0, max: 42 });

/** Temperature field, −2…40 °C on ITS-90 (EOS-80 range, science.md §2.1). */
export const temperatureField = (name: string) =>
  numberField(name, '°C (ITS-90)', `${name}, ITS-90`, { min: -2, max: 40 });

/** Latitude field, −90…90 degrees. */
export const latitudeField = () =>
  numberField('latitude', 'degrees', 'Latitude, north positive', { min: -90, max: 90 });

/** Body of a water-properties request. Unknown fields are refused. */
export const WaterRequestSchema = z.strictObject(
  {
    salinity: salinityField('salinity'),
    temperature: temperatureField('temperature'),
    pressureDbar: optionalField(
      numberField('pressureDbar', 'dbar', 'Sea pressure (0 at the surface)', { min: 0, max: 11000 }),
    ),
    latitude: optionalField(latitudeField()),
  },
  strictObjectError('water request'),
);

/** A parsed water-properties request. */
export type WaterRequest = z.infer<typeof WaterRequestSchema>;

/** Response of the water-properties calculator. */
export const WaterResponseSchema = z.object({
  density: z.number().describe('In-situ density from UNESCO EOS-80 (kg m⁻³)'),
  coriolis: z.number().optional().describe('Coriolis parameter f = 2Ω sin(latitude), when a latitude was given (s⁻¹)'),
});

/** A water-properties response. */
export type WaterResponse = z.infer<typeof WaterResponseSchema>;
