// Photos on build sheets. An upload is all or nothing: every file is read and re-encoded first (the
// type comes from the bytes), then stored, and only then are the rows written in one transaction;
// if that transaction fails the stored files are removed again, so no half-saved upload and no
// orphan file is left behind. Who sees photos follows the sheet: the owner, and the club's
// stewards and admins; only the owner changes them.
import { randomUUID } from 'node:crypto';
import type { DataSource } from 'typeorm';
import { PHOTO_LIMITS, photoMetaSchema, type PhotoWire, type UpdatePhotoBody } from '../contracts/garage';
import { BuildSheet, BuildSheetRevision, Photo } from '../entities';
import { ConflictError, NotFoundError, ValidationError, type FieldIssue } from '../errors';
import type { Logger } from '../logger';
import { fieldIssues } from '../middleware/validate';
import { sheetFor } from './garage.service';
import { processUploadedImage, UnsupportedImageError, type ProcessedImage } from './photos/image-pipeline';
import { readStoredPhoto, type PhotoStorage } from './photos/photo-storage';

export interface UploadedFile {
  originalName: string;
  bytes: Buffer;
}

/** Per-file form fields as multipart delivers them: one value, several, or none. */
export interface UploadFields {
  captions?: string | string[];
  memberIds?: string | string[];
  areas?: string | string[];
}

export function photoView(p: Photo): PhotoWire {
  return {
    id: p.id,
    buildSheetId: p.buildSheetId,
    memberId: p.memberId,
    area: p.area,
    caption: p.caption,
    widthPx: p.widthPx,
    heightPx: p.heightPx,
    byteSize: p.byteSize,
    createdAt: p.createdAt.toISOString(),
    imageUrl: `/api/photos/${p.id}/image`,
    thumbnailUrl: `/api/photos/${p.id}/thumbnail`,
  };
}

const asList = (v: string | string[] | undefined): string[] | undefined => (v === undefined ? undefined : Array.isArray(v) ? v : [v]);

export type PhotoService = ReturnType<typeof createPhotoService>;

export function createPhotoService(ds: DataSource, storage: PhotoStorage, logger?: Logger) {
  async function memberIdsOfLatest(sheet: BuildSheet): Promise<Set<string>> {
    const rev = await ds.getRepository(BuildSheetRevision).findOneByOrFail({ buildSheetId: sheet.id, number: sheet.currentRevision });
    return new Set(rev.specification.members.map((m) => m.id));
  }

  async function countOf(sheetId: string): Promise<number> {
    return ds.getRepository(Photo).countBy({ buildSheetId: sheetId });
  }

  function refuseOverLimit(current: number, adding: number): void {
    if (current + adding > PHOTO_LIMITS.photosPerSheet) {
      throw new ConflictError(
        `A build sheet holds at most ${PHOTO_LIMITS.photosPerSheet} photos. This one has ${current}, so at most ${Math.max(0, PHOTO_LIMITS.photosPerSheet - current)} more can be added.`,
        { limit: PHOTO_LIMITS.photosPerSheet, current },
      );
    }
  }

  async function removeQuietly(keys: string[]): Promise<void> {
    for (const key of keys) {
      await storage.remove(key).catch((err: unknown) => logger?.error('photo file could not be removed', { key, err: String(err) }));
    }
  }

  async function photoFor(photoId: string, userId: string, need: 'read' | 'edit'): Promise<Photo> {
    const photo = await ds.getRepository(Photo).findOneBy({ id: photoId });
    if (!photo) throw new NotFoundError('Photo not found.');
    try {
      await sheetFor(ds.manager, photo.buildSheetId, userId, need);
    } catch (err) {
      if (err instanceof NotFoundError) throw new NotFoundError('Photo not found.');
      throw err;
    }
    return photo;
  }

  return {
    /** Refuses early (before a large body is read) when the caller may not add photos to the sheet. */
    async assertCanUpload(sheetId: string, userId: string): Promise<void> {
      const { sheet } = await sheetFor(ds.manager, sheetId, userId, 'edit');
      if (sheet.archivedAt) throw new ConflictError('This build sheet is archived. Unarchive it before adding photos.');
      refuseOverLimit(await countOf(sheet.id), 1);
    },

    async list(sheetId: string, userId: string): Promise<PhotoWire[]> {
      await sheetFor(ds.manager, sheetId, userId, 'read');
      const photos = await ds.getRepository(Photo).find({ where: { buildSheetId: sheetId }, order: { createdAt: 'ASC', id: 'ASC' } });
      return photos.map(photoView);
    },

    async upload(sheetId: string, userId: string, files: UploadedFile[], fields: UploadFields): Promise<PhotoWire[]> {
      const { sheet } = await sheetFor(ds.manager, sheetId, userId, 'edit');
      if (sheet.archivedAt) throw new ConflictError('This build sheet is archived. Unarchive it before adding photos.');
      if (files.length === 0) throw new ValidationError([{ path: 'photos', message: 'Choose at least one photo.' }]);

      // Per-file fields: either left out, or given once per file in the order of the files.
      const lists = { captions: asList(fields.captions), memberIds: asList(fields.memberIds), areas: asList(fields.areas) };
      const issues: FieldIssue[] = [];
      for (const [name, list] of Object.entries(lists)) {
        if (list && list.length !== files.length) issues.push({ path: name, message: `Give one value per photo (${files.length}), in the order of the photos; an empty value means none.` });
      }
      if (issues.length) throw new ValidationError(issues);
      const members = await memberIdsOfLatest(sheet);
      const metas = files.map((_f, i) => {
        const parsed = photoMetaSchema.safeParse({ caption: lists.captions?.[i], memberId: lists.memberIds?.[i], area: lists.areas?.[i] });
        const rawMemberId = lists.memberIds?.[i]?.trim();
        if (rawMemberId && !members.has(rawMemberId)) issues.push({ path: `photos.${i}.memberId`, message: `No member of the latest revision has the id "${rawMemberId}".` });
        if (!parsed.success) {
          issues.push(...fieldIssues(parsed.error, `photos.${i}`).filter((p) => p.path !== `photos.${i}.memberId` || !rawMemberId || members.has(rawMemberId)));
          return null;
        }
        const { caption, memberId, area } = parsed.data;
        return { caption, memberId, area: area ?? (memberId !== null ? ('members' as const) : ('general' as const)) };
      });
      if (issues.length) throw new ValidationError(issues);
      refuseOverLimit(await countOf(sheet.id), files.length);

      // 1. Read every file; one bad file refuses the whole upload, naming each bad one.
      const processed: ProcessedImage[] = [];
      for (const [i, file] of files.entries()) {
        try {
          processed.push(await processUploadedImage(file.bytes));
        } catch (err) {
          if (!(err instanceof UnsupportedImageError)) throw err;
          issues.push({ path: `photos.${i}`, message: `"${file.originalName}": ${err.message}` });
        }
      }
      if (issues.length) throw new ValidationError(issues, 'Some files are not photos Cagewright can use. Nothing was saved.');

      // 2. Store the files; 3. write the rows. Either failing removes what was stored.
      const stored: string[] = [];
      // One millisecond apart, so the sheet lists an upload's photos in the order they were chosen.
      const uploadedAt = Date.now();
      const rows = processed.map((img, i) => {
        const id = randomUUID();
        return {
          id, buildSheetId: sheet.id, createdAt: new Date(uploadedAt + i), ...metas[i]!, storageKey: `sheets/${sheet.id}/${id}.jpg`, thumbnailKey: `sheets/${sheet.id}/${id}.thumb.jpg`,
          widthPx: img.widthPx, heightPx: img.heightPx, byteSize: img.full.length, uploadedById: userId, img,
        };
      });
      try {
        for (const row of rows) {
          await storage.put(row.storageKey, row.img.full);
          stored.push(row.storageKey);
          await storage.put(row.thumbnailKey, row.img.thumbnail);
          stored.push(row.thumbnailKey);
        }
        const saved = await ds.transaction(async (tx) => {
          // Lock the sheet so two uploads at once cannot both pass the per-sheet limit.
          await tx.getRepository(BuildSheet).findOne({ where: { id: sheet.id }, lock: { mode: 'pessimistic_write' } });
          refuseOverLimit(await tx.getRepository(Photo).countBy({ buildSheetId: sheet.id }), rows.length);
          await tx.getRepository(Photo).insert(rows.map(({ img: _img, ...row }) => row));
          return tx.getRepository(Photo).find({ where: rows.map((r) => ({ id: r.id })), order: { createdAt: 'ASC' } });
        });
        const order = new Map<string, number>(rows.map((r, i) => [r.id, i]));
        return saved.sort((a, b) => order.get(a.id)! - order.get(b.id)!).map(photoView);
      } catch (err) {
        await removeQuietly(stored);
        throw err;
      }
    },

    async bytes(photoId: string, userId: string, which: 'image' | 'thumbnail'): Promise<{ photo: Photo; bytes: Buffer }> {
      const photo = await photoFor(photoId, userId, 'read');
      return { photo, bytes: await readStoredPhoto(storage, which === 'image' ? photo.storageKey : photo.thumbnailKey) };
    },

    async update(photoId: string, userId: string, body: UpdatePhotoBody): Promise<PhotoWire> {
      const photo = await photoFor(photoId, userId, 'edit');
      if (body.memberId) {
        const sheet = await ds.getRepository(BuildSheet).findOneByOrFail({ id: photo.buildSheetId });
        if (!(await memberIdsOfLatest(sheet)).has(body.memberId)) {
          throw new ValidationError([{ path: 'memberId', message: `No member of the latest revision has the id "${body.memberId}".` }]);
        }
      }
      if (body.caption !== undefined) photo.caption = body.caption;
      if (body.memberId !== undefined) photo.memberId = body.memberId;
      if (body.area !== undefined) photo.area = body.area;
      await ds.getRepository(Photo).save(photo);
      return photoView(photo);
    },

    /** Deletes the row, then its files (a file left by a failed removal is logged, never served). */
    async remove(photoId: string, userId: string): Promise<void> {
      const photo = await photoFor(photoId, userId, 'edit');
      await ds.getRepository(Photo).delete({ id: photo.id });
      await removeQuietly([photo.storageKey, photo.thumbnailKey]);
    },

    /** Thumbnails of a sheet's photos, for the PDF report (no access check: the caller has done it). */
    async thumbnailsOf(sheetId: string): Promise<{ photo: Photo; thumbnail: Buffer }[]> {
      const photos = await ds.getRepository(Photo).find({ where: { buildSheetId: sheetId }, order: { createdAt: 'ASC', id: 'ASC' } });
      const out: { photo: Photo; thumbnail: Buffer }[] = [];
      for (const photo of photos) {
        try {
          out.push({ photo, thumbnail: await storage.get(photo.thumbnailKey) });
        } catch (err) {
          logger?.warn('photo thumbnail missing from storage', { photoId: photo.id, err: String(err) });
        }
      }
      return out;
    },
  };
}
