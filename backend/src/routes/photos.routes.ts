// Photos of a build sheet (docs/api.md, "Garage"). Uploads are multipart (field `photos`, up to 10
// files of 15 MB each, with `captions`, `memberIds` and `areas` once per file in file order), read
// into memory by multer only after the caller is known to be allowed to add photos to the sheet.
import type { RequestHandler } from 'express';
import { Router } from 'express';
import multer from 'multer';
import { PHOTO_LIMITS, photoParamsSchema, sheetParamsSchema, updatePhotoBodySchema } from '../contracts/garage';
import { AppError, ValidationError } from '../errors';
import { servicesOf, signedInUserId } from '../middleware/guards';
import { parseOrThrow } from '../middleware/validate';
import type { Services } from '../services';
import type { UploadFields } from '../services/photos.service';
import { mountRoutes, route, type RouteTableRouter } from './route-table';

const megabytes = PHOTO_LIMITS.bytesPerFile / (1024 * 1024);

const receive = multer({
  storage: multer.memoryStorage(),
  limits: {
    fileSize: PHOTO_LIMITS.bytesPerFile,
    files: PHOTO_LIMITS.filesPerRequest,
    fields: 3 * PHOTO_LIMITS.filesPerRequest + 5,
    fieldSize: 2000,
  },
}).array('photos');

/** Multer's and busboy's refusals, in the one error shape. Nothing is kept from a refused upload. */
export function uploadError(err: unknown): AppError {
  if (err instanceof multer.MulterError) {
    switch (err.code) {
      case 'LIMIT_FILE_SIZE':
        return new AppError(413, 'payload_too_large', `Each photo may be at most ${megabytes} MB. Nothing was saved.`);
      case 'LIMIT_FILE_COUNT':
        return new ValidationError([{ path: 'photos', message: `At most ${PHOTO_LIMITS.filesPerRequest} photos per upload. Nothing was saved.` }]);
      case 'LIMIT_UNEXPECTED_FILE':
        return new ValidationError([{ path: err.field ?? 'photos', message: 'Send photos in the form field "photos".' }]);
      default:
        return new ValidationError([{ path: err.field ?? 'photos', message: `${err.message}. Nothing was saved.` }]);
    }
  }
  // busboy: "Unexpected end of form", "Malformed part header", a missing boundary.
  return new ValidationError([{ path: 'photos', message: 'The upload was cut off or is not a well-formed form. Nothing was saved; please try again.' }]);
}

const receivePhotos: RequestHandler = (req, res, next) => {
  receive(req, res, (err?: unknown) => next(err ? uploadError(err) : undefined));
};

/** Answers 404/403/409 before a large body is read. */
const mayUpload: RequestHandler = (req, _res, next) => {
  const { sheetId } = parseOrThrow(sheetParamsSchema, req.params, 'params');
  servicesOf(req).photos.assertCanUpload(sheetId, signedInUserId(req)).then(() => next(), next);
};

const imageCache = 'private, max-age=31536000, immutable';

export function createPhotosRouter({ services }: { services: Services }): RouteTableRouter {
  const { photos } = services;
  const serve = (which: 'image' | 'thumbnail') =>
    route({
      method: 'get', path: `/photos/:photoId/${which}`, access: 'sheet.read', params: photoParamsSchema,
      handler: async ({ req, res, params }) => {
        const { photo, bytes } = await photos.bytes(params.photoId, signedInUserId(req), which);
        // The bytes under a photo id never change (an edit changes the caption, a new photo gets a new id).
        res.setHeader('Content-Type', 'image/jpeg');
        res.setHeader('Cache-Control', imageCache);
        res.setHeader('ETag', `"${photo.id}-${which}"`);
        res.setHeader('Content-Disposition', `inline; filename="photo-${photo.id}${which === 'thumbnail' ? '-thumbnail' : ''}.jpg"`);
        res.end(bytes);
      },
    });
  return mountRoutes(Router(), [
    route({
      method: 'get', path: '/build-sheets/:sheetId/photos', access: 'sheet.read', params: sheetParamsSchema,
      handler: async ({ req, res, params }) => {
        res.json({ photos: await photos.list(params.sheetId, signedInUserId(req)) });
      },
    }),
    route({
      method: 'post', path: '/build-sheets/:sheetId/photos', access: 'sheet.edit', before: [mayUpload, receivePhotos], params: sheetParamsSchema,
      handler: async ({ req, res, params }) => {
        const files = ((req.files as Express.Multer.File[] | undefined) ?? []).map((f) => ({ originalName: f.originalname, bytes: f.buffer }));
        const body = (req.body ?? {}) as UploadFields;
        const saved = await photos.upload(params.sheetId, signedInUserId(req), files, { captions: body.captions, memberIds: body.memberIds, areas: body.areas });
        res.status(201).json({ photos: saved });
      },
    }),
    serve('image'),
    serve('thumbnail'),
    route({
      method: 'patch', path: '/photos/:photoId', access: 'sheet.edit', params: photoParamsSchema, body: updatePhotoBodySchema,
      handler: async ({ req, res, params, body }) => {
        res.json({ photo: await photos.update(params.photoId, signedInUserId(req), body) });
      },
    }),
    route({
      method: 'delete', path: '/photos/:photoId', access: 'sheet.edit', params: photoParamsSchema,
      handler: async ({ req, res, params }) => {
        await photos.remove(params.photoId, signedInUserId(req));
        res.status(204).end();
      },
    }),
  ]);
}
