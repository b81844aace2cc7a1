// The build journal (docs/api.md, "Build journal"). Reading follows the build sheet (its builder, the
// club's stewards and admins); only the builder records, changes and removes stages and photos.
// Photos are multipart (field `photos`, up to 10 files of 15 MB, `captions` once per file), read into
// memory only after the caller is known to be allowed to add them.
import type { RequestHandler } from 'express';
import { Router } from 'express';
import multer from 'multer';
import { PHOTO_LIMITS, sheetParamsSchema } from '../contracts/garage';
import {
  createJournalEntryBodySchema, journalEntryParamsSchema, journalPhotoParamsSchema, updateJournalEntryBodySchema, updateJournalPhotoBodySchema,
} from '../contracts/journal';
import { servicesOf, signedInUserId } from '../middleware/guards';
import { parseOrThrow } from '../middleware/validate';
import type { Services } from '../services';
import { uploadError } from './photos.routes';
import { mountRoutes, route, type RouteTableRouter } from './route-table';

const receive = multer({
  storage: multer.memoryStorage(),
  limits: { fileSize: PHOTO_LIMITS.bytesPerFile, files: PHOTO_LIMITS.filesPerRequest, fields: PHOTO_LIMITS.filesPerRequest + 5, fieldSize: 2000 },
}).array('photos');

const receivePhotos: RequestHandler = (req, res, next) => {
  receive(req, res, (err?: unknown) => next(err ? uploadError(err) : undefined));
};

const mayUpload: RequestHandler = (req, _res, next) => {
  const { entryId } = parseOrThrow(journalEntryParamsSchema, req.params, 'params');
  servicesOf(req).journal.assertCanUpload(entryId, signedInUserId(req)).then(() => next(), next);
};

export function createJournalRouter({ services }: { services: Services }): RouteTableRouter {
  const { journal } = services;
  const serve = (which: 'image' | 'thumbnail') =>
    route({
      method: 'get', path: `/journal-photos/:photoId/${which}`, access: 'sheet.read', params: journalPhotoParamsSchema,
      handler: async ({ req, res, params }) => {
        const { photo, bytes } = await journal.bytes(params.photoId, signedInUserId(req), which);
        res.setHeader('Content-Type', 'image/jpeg');
        res.setHeader('Cache-Control', 'private, max-age=31536000, immutable');
        res.setHeader('ETag', `"${photo.id}-${which}"`);
        res.end(bytes);
      },
    });
  return mountRoutes(Router(), [
    route({
      method: 'get', path: '/build-sheets/:sheetId/journal', access: 'sheet.read', params: sheetParamsSchema,
      handler: async ({ req, res, params }) => {
        res.json(await journal.get(params.sheetId, signedInUserId(req)));
      },
    }),
    route({
      method: 'post', path: '/build-sheets/:sheetId/journal', access: 'sheet.edit', params: sheetParamsSchema, body: createJournalEntryBodySchema,
      handler: async ({ req, res, params, body }) => {
        res.status(201).json({ entry: await journal.record(params.sheetId, signedInUserId(req), body) });
      },
    }),
    route({
      method: 'patch', path: '/journal-entries/:entryId', access: 'sheet.edit', params: journalEntryParamsSchema, body: updateJournalEntryBodySchema,
      handler: async ({ req, res, params, body }) => {
        res.json({ entry: await journal.update(params.entryId, signedInUserId(req), body) });
      },
    }),
    route({
      method: 'delete', path: '/journal-entries/:entryId', access: 'sheet.edit', params: journalEntryParamsSchema,
      handler: async ({ req, res, params }) => {
        await journal.remove(params.entryId, signedInUserId(req));
        res.status(204).end();
      },
    }),
    route({
      method: 'post', path: '/journal-entries/:entryId/photos', access: 'sheet.edit', before: [mayUpload, receivePhotos], params: journalEntryParamsSchema,
      handler: async ({ req, res, params }) => {
        const files = ((req.files as Express.Multer.File[] | undefined) ?? []).map((f) => ({ originalName: f.originalname, bytes: f.buffer }));
        const body = (req.body ?? {}) as { captions?: string | string[] };
        res.status(201).json({ photos: await journal.upload(params.entryId, signedInUserId(req), files, body.captions) });
      },
    }),
    serve('image'),
    serve('thumbnail'),
    route({
      method: 'patch', path: '/journal-photos/:photoId', access: 'sheet.edit', params: journalPhotoParamsSchema, body: updateJournalPhotoBodySchema,
      handler: async ({ req, res, params, body }) => {
        res.json({ photo: await journal.updatePhoto(params.photoId, signedInUserId(req), body) });
      },
    }),
    route({
      method: 'delete', path: '/journal-photos/:photoId', access: 'sheet.edit', params: journalPhotoParamsSchema,
      handler: async ({ req, res, params }) => {
        await journal.removePhoto(params.photoId, signedInUserId(req));
        res.status(204).end();
      },
    }),
  ]);
}
