import type { NextFunction, Request, Response } from 'express';
import multer from 'multer';
import { z } from 'zod';
import { searchCrs } from '#shared/geometry/crs-catalogue';
import { formatBytes } from '#shared/geometry/upload-limits';
import {
  importConfirmBodySchema,
  importCrsBodySchema,
  importFeaturePageSchema,
  importLayerBodySchema,
  importPreviewSchema,
  importResponseSchema,
  uploadKindSchema,
} from '#shared/schemas/upload';
import { previewImportFeatures } from '../db/repositories/import-features.repo';
import type { Database } from '../db/client';
import { defineRoute, type RouteContext, uploadedFile } from '../http/route';
import { AppError, ValidationError } from '../lib/errors';
import type { ImportsService } from '../services/imports.service';

const UPLOADERS = ['grower', 'adviser', 'regulator'] as const;
const idParams = z.object({ id: z.uuid({ error: 'id must be an upload id (UUID)' }) });

/** multer in memory, with its own errors turned into clear messages. */
function multipartFile(maxBytes: number) {
  const upload = multer({ storage: multer.memoryStorage(), limits: { fileSize: maxBytes, files: 1, fields: 10 } }).single('file');
  return (req: Request, res: Response, next: NextFunction) => {
    if (!req.is('multipart/form-data')) {
      next(new AppError(415, 'unsupported_media_type', 'Send the file as multipart/form-data with a field named "file" and a field "kind" (lease, coast or zone).'));
      return;
    }
    upload(req, res, (err: unknown) => {
      if (err instanceof multer.MulterError) {
        if (err.code === 'LIMIT_FILE_SIZE') {
          next(
            new AppError(
              413,
              'file_too_large',
              `The file is larger than ${formatBytes(maxBytes)}; this server takes at most ${formatBytes(maxBytes)} per upload (setting UPLOAD_MAX_BYTES). Split it into smaller files, or zip it if it is not zipped.`,
            ),
          );
        } else {
          next(new ValidationError(`The upload form is not right (${err.message}). Send one file in a field named "file".`));
        }
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

export function registerImportRoutes(ctx: RouteContext, db: Database, imports: ImportsService, maxBytes: number): void {
  defineRoute(ctx, {
    method: 'post',
    path: '/imports',
    operationId: 'uploadImport',
    summary: 'Upload leases, a coastline or closure zones (zipped shapefile, GeoJSON, KML/KMZ, GPX or GeoPackage); returns the preview',
    tags: ['imports'],
    access: { roles: UPLOADERS },
    middleware: [multipartFile(maxBytes)],
    bodyContentType: 'multipart/form-data',
    body: z.object({
      kind: uploadKindSchema,
      file: uploadedFile('The file (.zip shapefile, .geojson, .kml, .kmz, .gpx or .gpkg)'),
      layer: z.string().min(1).max(500).optional().describe('Read only this layer (a KML folder path, GeoPackage table or shapefile basename)'),
      tracksAsPolygons: z
        .enum(['true', 'false'], { error: "tracksAsPolygons must be 'true' or 'false'" })
        .optional()
        .describe("'true' when the user confirms that each GPX track or route walks round one area (lease and zone uploads)"),
    }),
    response: importResponseSchema,
    successStatus: 201,
    errors: [413, 415, 422],
    handler: ({ user, body, req }) =>
      imports.create(user!, body.kind, req.file!, { ...(body.layer ? { layer: body.layer } : {}), tracksAsPolygons: body.tracksAsPolygons === 'true' }),
  });

  defineRoute(ctx, {
    method: 'post',
    path: '/imports/:id/layer',
    operationId: 'chooseImportLayer',
    summary: 'Pick one layer of an upload holding several (KML folders, GeoPackage tables, shapefiles in a zip), or null for all; returns the new preview',
    tags: ['imports'],
    access: { roles: UPLOADERS },
    params: idParams,
    body: importLayerBodySchema,
    response: importResponseSchema,
    errors: [404, 409, 422],
    handler: ({ user, params, body }) => imports.pickLayer(user!, params.id, body.layer),
  });

  defineRoute(ctx, {
    method: 'post',
    path: '/imports/:id/crs',
    operationId: 'setImportCrs',
    summary: "Choose the coordinate system (EPSG code) of an upload whose .prj was missing or unreadable",
    tags: ['imports'],
    access: { roles: UPLOADERS },
    params: idParams,
    body: importCrsBodySchema,
    response: importResponseSchema,
    errors: [404, 409, 422],
    handler: ({ user, params, body }) => imports.setCrs(user!, params.id, body.epsg),
  });

  defineRoute(ctx, {
    method: 'get',
    path: '/imports/:id',
    summary: 'An upload and its preview',
    tags: ['imports'],
    access: { roles: UPLOADERS },
    params: idParams,
    response: importResponseSchema,
    errors: [404],
    handler: ({ user, params }) => imports.get(user!, params.id),
  });

  defineRoute(ctx, {
    method: 'get',
    path: '/imports/:id/features',
    operationId: 'listImportFeatures',
    summary: 'A page of the staged features of an upload, in file order (the preview holds only the first ones)',
    tags: ['imports'],
    access: { roles: UPLOADERS },
    params: idParams,
    query: z.strictObject({
      offset: z.coerce.number({ error: 'offset must be a whole number from 0' }).int().min(0).default(0),
      limit: z.coerce.number({ error: 'limit must be a whole number from 1 to 1000' }).int().min(1).max(1000).default(200),
    }),
    response: importFeaturePageSchema,
    errors: [404, 409],
    handler: ({ user, params, query }) => imports.listFeatures(user!, params.id, query),
  });

  defineRoute(ctx, {
    method: 'get',
    path: '/imports/:id/preview',
    summary: 'The staged features of an upload as GeoJSON, for the preview map',
    tags: ['imports'],
    access: { roles: UPLOADERS },
    params: idParams,
    response: importPreviewSchema,
    errors: [404],
    handler: async ({ user, params }) => {
      await imports.get(user!, params.id);
      return previewImportFeatures(db, params.id);
    },
  });

  defineRoute(ctx, {
    method: 'post',
    path: '/imports/:id/confirm',
    summary: 'Save an upload: leases (with attribute mapping and a choice for duplicate lease ids), a coastline or closure zones',
    tags: ['imports'],
    access: { roles: UPLOADERS },
    params: idParams,
    body: importConfirmBodySchema,
    response: z.object({ created: z.number(), updated: z.number(), ids: z.array(z.string()) }),
    errors: [404, 409, 422],
    handler: ({ user, params, body }) => imports.confirm(user!, params.id, body),
  });

  defineRoute(ctx, {
    method: 'get',
    path: '/crs',
    operationId: 'searchCrs',
    summary: 'Search coordinate systems by name or EPSG code (for uploads without a usable .prj)',
    tags: ['imports'],
    access: { roles: 'any' },
    query: z.strictObject({ q: z.string().trim().min(1, { error: 'q: type part of a name or an EPSG code' }).max(80), limit: z.coerce.number().int().min(1).max(50).default(20) }),
    response: z.object({ items: z.array(z.object({ code: z.number(), name: z.string(), kind: z.string(), area: z.string().optional() })) }),
    handler: ({ query }) => ({ items: searchCrs(imports.crsCatalogue(), query.q, query.limit).map(({ bbox: _b, ...r }) => r) }),
  });
}
