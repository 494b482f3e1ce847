import type { NextFunction, Request, Response } from 'express';
import multer from 'multer';
import { z } from 'zod';
import {
  calibrationCreateSchema,
  calibrationListSchema,
  calibrationSchema,
  comparisonQuerySchema,
  comparisonSchema,
  sampleListQuerySchema,
  sampleListSchema,
  sampleUploadResultSchema,
  stationListSchema,
  stationUploadResultSchema,
} from '#shared/schemas/monitoring';
import { formatBytes } from '#shared/geometry/upload-limits';
import { exportFormatSchema, layerExportCsvSchema, layerExportGeoJsonSchema } from '#shared/schemas/exports';
import { defineRoute, type RouteContext, uploadedFile } from '../http/route';
import { AppError, ValidationError } from '../lib/errors';
import { exportResponse, sendExport, stationsLayer } from '../services/exports.service';
import type { MonitoringService } from '../services/monitoring.service';

/** Who uploads monitoring data: growers, advisers and regulators (admins manage accounts, not data). */
const UPLOADERS = ['grower', 'adviser', 'regulator'] as const;
/** Who may compare, fit, apply or roll back (row-level rules in the service). */
const CALIBRATORS = ['grower', 'adviser', 'regulator', 'admin'] as const;
const MAX_BYTES = 20 * 1024 * 1024;

const riverParams = z.object({ id: z.uuid({ error: 'id must be a river id (UUID)' }) });
const calibrationParams = z.object({ id: z.uuid({ error: 'id must be a calibration id (UUID)' }) });

/** multer in memory for one file, with its errors turned into clear messages. */
function oneFile(what: string) {
  const upload = multer({ storage: multer.memoryStorage(), limits: { fileSize: MAX_BYTES, files: 1, fields: 5 } }).single('file');
  return (req: Request, res: Response, next: NextFunction) => {
    if (!req.is('multipart/form-data')) {
      next(new AppError(415, 'unsupported_media_type', `Send the ${what} as multipart/form-data with the file in a field named "file".`));
      return;
    }
    upload(req, res, (err: unknown) => {
      if (err instanceof multer.MulterError) {
        next(
          err.code === 'LIMIT_FILE_SIZE'
            ? new AppError(
                413,
                'file_too_large',
                `The file is larger than ${formatBytes(MAX_BYTES)}, the most this server takes for ${what}. Split it and upload the parts.`,
              )
            : new ValidationError(`The upload form is not right (${err.message}). Send one file in a field named "file".`),
        );
        return;
      }
      if (err) {
        next(new ValidationError('The upload could not be read as multipart/form-data. Try again.'));
        return;
      }
      if (!req.file) {
        next(new ValidationError('file: attach the file in a form field named "file".'));
        return;
      }
      next();
    });
  };
}

export function registerMonitoringRoutes(ctx: RouteContext, monitoring: MonitoringService): void {
  defineRoute(ctx, {
    method: 'get',
    path: '/stations',
    summary: 'Monitoring stations you can see (yours, and your authority’s), with their sample counts',
    tags: ['monitoring'],
    access: { roles: CALIBRATORS },
    response: stationListSchema,
    handler: async ({ user }) => ({ items: await monitoring.listStations(user!) }),
  });

  defineRoute(ctx, {
    method: 'get',
    path: '/stations/export',
    operationId: 'exportStations',
    summary: 'Download the monitoring stations you can see as CSV, GeoJSON, GeoPackage (readme table) or KML (document description)',
    tags: ['monitoring'],
    access: { roles: CALIBRATORS },
    query: z.strictObject({ format: exportFormatSchema }),
    response: exportResponse('The monitoring stations', layerExportCsvSchema, layerExportGeoJsonSchema),
    handler: async ({ user, query, res }) => {
      const items = await monitoring.listStations(user!);
      await sendExport(res, stationsLayer(items), query.format, `brackline-stations-${new Date().toISOString().slice(0, 10)}`, 'Station');
      return undefined;
    },
  });

  defineRoute(ctx, {
    method: 'post',
    path: '/stations',
    operationId: 'uploadStations',
    summary:
      'Upload monitoring stations (points): a zipped shapefile, GeoJSON, KML/KMZ (pins), GPX (waypoints), GeoPackage, or CSV with a code and lon/lat (or x/y with epsg). Same codes are updated.',
    tags: ['monitoring'],
    access: { roles: UPLOADERS },
    middleware: [oneFile('stations')],
    bodyContentType: 'multipart/form-data',
    body: z.object({
      file: uploadedFile('The file (.zip, .geojson, .csv, .kml, .kmz, .gpx or .gpkg)'),
      epsg: z.coerce
        .number({ error: 'epsg must be an EPSG code such as 32624' })
        .int({ error: 'epsg must be a whole EPSG code' })
        .min(1024)
        .max(999_999)
        .optional(),
    }),
    response: stationUploadResultSchema,
    successStatus: 201,
    errors: [413, 415, 422],
    handler: ({ user, body, req }) => monitoring.uploadStations(user!, req.file!, body.epsg),
  });

  defineRoute(ctx, {
    method: 'get',
    path: '/samples',
    summary: 'Samples at stations you can see, newest first',
    tags: ['monitoring'],
    access: { roles: CALIBRATORS },
    query: sampleListQuerySchema,
    response: sampleListSchema,
    handler: ({ user, query }) => monitoring.listSamples(user!, query),
  });

  defineRoute(ctx, {
    method: 'post',
    path: '/samples',
    operationId: 'uploadSamples',
    summary:
      'Upload samples (CSV: station, date-time, salinity, indicator with unit and method, optional temperature); detection limits such as <2 or >1600 are kept as censored values. Same station and time are updated.',
    tags: ['monitoring'],
    access: { roles: UPLOADERS },
    middleware: [oneFile('samples')],
    bodyContentType: 'multipart/form-data',
    body: z.object({ file: uploadedFile('The CSV file') }),
    response: sampleUploadResultSchema,
    successStatus: 201,
    errors: [413, 415, 422],
    handler: ({ user, req }) => monitoring.uploadSamples(user!, req.file!),
  });

  defineRoute(ctx, {
    method: 'get',
    path: '/rivers/:id/comparison',
    operationId: 'getRiverComparison',
    summary:
      "The river's plume against the samples in it: observed and predicted salinity and indicator, residuals, bias, RMSE and skill; samples outside every plume listed apart",
    tags: ['monitoring'],
    access: { roles: CALIBRATORS },
    params: riverParams,
    query: comparisonQuerySchema,
    response: comparisonSchema,
    errors: [404, 422],
    handler: ({ user, params, query }) => monitoring.comparison(user!, params.id, query.lagDays),
  });

  defineRoute(ctx, {
    method: 'get',
    path: '/rivers/:id/calibrations',
    summary: "The river's calibrations, newest first (yours; all of them for those who may change the river)",
    tags: ['monitoring'],
    access: { roles: CALIBRATORS },
    params: riverParams,
    response: calibrationListSchema,
    errors: [404],
    handler: async ({ user, params }) => ({ items: await monitoring.list(user!, params.id) }),
  });

  defineRoute(ctx, {
    method: 'post',
    path: '/rivers/:id/calibrations',
    operationId: 'fitCalibration',
    summary:
      'Fit the mixing length and T90 (optionally the alongshore share and near-field fraction) to the samples in the plume; the river is not changed until applied',
    tags: ['monitoring'],
    access: { roles: CALIBRATORS },
    params: riverParams,
    body: calibrationCreateSchema,
    response: calibrationSchema,
    successStatus: 201,
    errors: [404, 422],
    handler: ({ user, params, body }) => monitoring.fit(user!, params.id, body),
  });

  defineRoute(ctx, {
    method: 'post',
    path: '/calibrations/:id/apply',
    summary:
      "Write a calibration's fitted values into the river's settings and re-screen its leases (the river's creator, a regulator of its jurisdiction or an admin)",
    tags: ['monitoring'],
    access: { roles: CALIBRATORS },
    params: calibrationParams,
    response: calibrationSchema,
    errors: [404, 409],
    handler: ({ user, params }) => monitoring.apply(user!, params.id),
  });

  defineRoute(ctx, {
    method: 'post',
    path: '/calibrations/:id/rollback',
    summary: 'Restore the river settings an applied calibration replaced, and re-screen (same people as apply)',
    tags: ['monitoring'],
    access: { roles: CALIBRATORS },
    params: calibrationParams,
    response: calibrationSchema,
    errors: [404, 409],
    handler: ({ user, params }) => monitoring.rollback(user!, params.id),
  });
}
