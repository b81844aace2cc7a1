// The build journal: the stages a cage's build has reached, per build sheet, each with a date, a note
// and photos. Who sees it follows the sheet (its builder; the club's stewards and admins read it,
// which is how a steward sees it on the review page); only the builder changes it. Photos go through
// the sheet photos' pipeline and storage (type read from the bytes, re-encoded, metadata dropped,
// thumbnail) but are counted on their own, so they never use up the sheet's 60 photos. Stage changes
// are written to the club's activity log.
import { randomUUID } from 'node:crypto';
import type { DataSource } from 'typeorm';
import {
  JOURNAL_LIMITS, JOURNAL_STAGES, JOURNAL_STAGE_HINTS, JOURNAL_STAGE_LABELS,
  type CreateJournalEntryBody, type JournalEntryWire, type JournalPhotoWire, type JournalWire, type UpdateJournalEntryBody, type UpdateJournalPhotoBody,
} from '../contracts/journal';
import { FABRICATION_CAUTION } from '../contracts/tube-stock';
import { BuildSheet, JournalEntry, JournalPhoto, User } from '../entities';
import { ConflictError, NotFoundError, ValidationError, type FieldIssue } from '../errors';
import type { Logger } from '../logger';
import type { AuditService } from './audit.service';
import { sheetFor } from './garage.service';
import { processUploadedImage, UnsupportedImageError, type ProcessedImage } from './photos/image-pipeline';
import { readStoredPhoto, type PhotoStorage } from './photos/photo-storage';
import type { UploadedFile } from './photos.service';

const stageOrder = new Map<string, number>(JOURNAL_STAGES.map((s, i) => [s, i]));

function photoView(p: JournalPhoto): JournalPhotoWire {
  return {
    id: p.id, entryId: p.entryId, caption: p.caption, widthPx: p.widthPx, heightPx: p.heightPx, createdAt: p.createdAt.toISOString(),
    imageUrl: `/api/journal-photos/${p.id}/image`, thumbnailUrl: `/api/journal-photos/${p.id}/thumbnail`,
  };
}

function entryView(e: JournalEntry, photos: JournalPhoto[], author: User | null): JournalEntryWire {
  return {
    id: e.id, buildSheetId: e.buildSheetId, stage: e.stage, happenedOn: e.happenedOn, note: e.note,
    createdBy: author ? { id: author.id, displayName: author.displayName } : null,
    createdAt: e.createdAt.toISOString(), updatedAt: e.updatedAt.toISOString(), photos: photos.map(photoView),
  };
}

const asList = (v: string | string[] | undefined): string[] | undefined => (v === undefined ? undefined : Array.isArray(v) ? v : [v]);

export type JournalService = ReturnType<typeof createJournalService>;

export function createJournalService(ds: DataSource, deps: { storage: PhotoStorage; audit: AuditService; logger?: Logger }) {
  const { storage, audit } = deps;

  async function removeQuietly(keys: string[]): Promise<void> {
    for (const key of keys) await storage.remove(key).catch((err: unknown) => deps.logger?.error('journal photo file could not be removed', { key, err: String(err) }));
  }

  /** The entry and its sheet for `userId`: 404 for an entry they may not see, 403 to change one they only read. */
  async function entryFor(entryId: string, userId: string, need: 'read' | 'edit') {
    const entry = await ds.getRepository(JournalEntry).findOneBy({ id: entryId });
    if (!entry) throw new NotFoundError('Journal entry not found.');
    try {
      const found = await sheetFor(ds.manager, entry.buildSheetId, userId, need);
      if (need === 'edit' && found.sheet.archivedAt) throw new ConflictError('This build sheet is archived. Unarchive it before changing its journal.');
      return { entry, ...found };
    } catch (err) {
      if (err instanceof NotFoundError) throw new NotFoundError('Journal entry not found.');
      throw err;
    }
  }

  async function photoFor(photoId: string, userId: string, need: 'read' | 'edit') {
    const photo = await ds.getRepository(JournalPhoto).findOneBy({ id: photoId });
    if (!photo) throw new NotFoundError('Photo not found.');
    try {
      await entryFor(photo.entryId, userId, need);
    } catch (err) {
      if (err instanceof NotFoundError) throw new NotFoundError('Photo not found.');
      throw err;
    }
    return photo;
  }

  function refuseOverLimits(sheetCount: number, entryCount: number, adding: number): void {
    if (sheetCount + adding > JOURNAL_LIMITS.photosPerSheet)
      throw new ConflictError(
        `A build journal holds at most ${JOURNAL_LIMITS.photosPerSheet} photos. This one has ${sheetCount}, so at most ${Math.max(0, JOURNAL_LIMITS.photosPerSheet - sheetCount)} more can be added.`,
        { limit: JOURNAL_LIMITS.photosPerSheet, current: sheetCount },
      );
    if (entryCount + adding > JOURNAL_LIMITS.photosPerStage)
      throw new ConflictError(
        `A stage holds at most ${JOURNAL_LIMITS.photosPerStage} photos. This one has ${entryCount}, so at most ${Math.max(0, JOURNAL_LIMITS.photosPerStage - entryCount)} more can be added.`,
        { limit: JOURNAL_LIMITS.photosPerStage, current: entryCount },
      );
  }

  async function counts(entry: JournalEntry): Promise<{ sheet: number; entry: number }> {
    const repo = ds.getRepository(JournalPhoto);
    const [sheet, own] = await Promise.all([repo.countBy({ buildSheetId: entry.buildSheetId }), repo.countBy({ entryId: entry.id })]);
    return { sheet, entry: own };
  }

  async function oneEntry(entry: JournalEntry): Promise<JournalEntryWire> {
    const photos = await ds.getRepository(JournalPhoto).find({ where: { entryId: entry.id }, order: { createdAt: 'ASC', id: 'ASC' } });
    const author = entry.createdById ? await ds.getRepository(User).findOneBy({ id: entry.createdById }) : null;
    return entryView(entry, photos, author);
  }

  const stageWords = (stage: string) => JOURNAL_STAGE_LABELS[stage as keyof typeof JOURNAL_STAGE_LABELS] ?? stage;

  return {
    async get(sheetId: string, userId: string): Promise<JournalWire> {
      const { sheet, access } = await sheetFor(ds.manager, sheetId, userId, 'read');
      const entries = await ds.getRepository(JournalEntry).find({ where: { buildSheetId: sheet.id } });
      const photos = await ds.getRepository(JournalPhoto).find({ where: { buildSheetId: sheet.id }, order: { createdAt: 'ASC', id: 'ASC' } });
      const authorIds = [...new Set(entries.flatMap((e) => (e.createdById ? [e.createdById] : [])))];
      const authors = authorIds.length ? await ds.getRepository(User).find({ where: authorIds.map((id) => ({ id })) }) : [];
      entries.sort((a, b) => stageOrder.get(a.stage)! - stageOrder.get(b.stage)!);
      return {
        sheetId: sheet.id,
        entries: entries.map((e) => entryView(e, photos.filter((p) => p.entryId === e.id), authors.find((u) => u.id === e.createdById) ?? null)),
        stages: JOURNAL_STAGES.map((stage) => ({ stage, label: JOURNAL_STAGE_LABELS[stage], hint: JOURNAL_STAGE_HINTS[stage] })),
        limits: JOURNAL_LIMITS, photoCount: photos.length, canEdit: access === 'owner' && !sheet.archivedAt, caution: FABRICATION_CAUTION,
      };
    },

    async record(sheetId: string, userId: string, body: CreateJournalEntryBody): Promise<JournalEntryWire> {
      const entry = await ds.transaction(async (tx) => {
        const { sheet } = await sheetFor(tx, sheetId, userId, 'edit', true);
        if (sheet.archivedAt) throw new ConflictError('This build sheet is archived. Unarchive it before changing its journal.');
        const twin = await tx.getRepository(JournalEntry).findOneBy({ buildSheetId: sheet.id, stage: body.stage });
        if (twin) throw new ConflictError(`“${stageWords(body.stage)}” is already in the journal (${twin.happenedOn}); change that entry instead.`, { entryId: twin.id });
        const repo = tx.getRepository(JournalEntry);
        const saved = await repo.save(repo.create({ buildSheetId: sheet.id, stage: body.stage, happenedOn: body.happenedOn, note: body.note, createdById: userId }));
        await audit.record({
          clubId: sheet.clubId, actorId: userId, action: 'journal.stage_recorded', entity: { type: 'build_sheet', id: sheet.id },
          details: { stage: body.stage, happenedOn: body.happenedOn, sheetName: sheet.name },
        }, { manager: tx });
        return saved;
      });
      return oneEntry(entry);
    },

    async update(entryId: string, userId: string, body: UpdateJournalEntryBody): Promise<JournalEntryWire> {
      const { entry, sheet } = await entryFor(entryId, userId, 'edit');
      const before = { happenedOn: entry.happenedOn, note: entry.note };
      if (body.happenedOn !== undefined) entry.happenedOn = body.happenedOn;
      if (body.note !== undefined) entry.note = body.note;
      await ds.transaction(async (tx) => {
        await tx.getRepository(JournalEntry).save(entry);
        await audit.record({
          clubId: sheet.clubId, actorId: userId, action: 'journal.stage_changed', entity: { type: 'build_sheet', id: sheet.id },
          details: { stage: entry.stage, sheetName: sheet.name, before, after: { happenedOn: entry.happenedOn, note: entry.note } },
        }, { manager: tx });
      });
      return oneEntry(entry);
    },

    /** Removes a stage with its photos (the client confirms first). */
    async remove(entryId: string, userId: string): Promise<void> {
      const { entry, sheet } = await entryFor(entryId, userId, 'edit');
      const photos = await ds.getRepository(JournalPhoto).findBy({ entryId: entry.id });
      await ds.transaction(async (tx) => {
        await tx.getRepository(JournalEntry).delete({ id: entry.id });
        await audit.record({
          clubId: sheet.clubId, actorId: userId, action: 'journal.stage_removed', entity: { type: 'build_sheet', id: sheet.id },
          details: { stage: entry.stage, happenedOn: entry.happenedOn, sheetName: sheet.name, photos: photos.length },
        }, { manager: tx });
      });
      await removeQuietly(photos.flatMap((p) => [p.storageKey, p.thumbnailKey]));
    },

    /** Refuses early (before a large body is read) when the caller may not add photos to the entry. */
    async assertCanUpload(entryId: string, userId: string): Promise<void> {
      const { entry } = await entryFor(entryId, userId, 'edit');
      const c = await counts(entry);
      refuseOverLimits(c.sheet, c.entry, 1);
    },

    async upload(entryId: string, userId: string, files: UploadedFile[], captions: string | string[] | undefined): Promise<JournalPhotoWire[]> {
      const { entry, sheet } = await entryFor(entryId, userId, 'edit');
      if (files.length === 0) throw new ValidationError([{ path: 'photos', message: 'Choose at least one photo.' }]);
      const list = asList(captions);
      if (list && list.length !== files.length) throw new ValidationError([{ path: 'captions', message: `Give one caption per photo (${files.length}), in the order of the photos; an empty one means none.` }]);
      const issues: FieldIssue[] = [];
      list?.forEach((c, i) => c.trim().length > 300 && issues.push({ path: `photos.${i}.caption`, message: 'At most 300 characters' }));
      if (issues.length) throw new ValidationError(issues);
      const c = await counts(entry);
      refuseOverLimits(c.sheet, c.entry, files.length);

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

      const stored: string[] = [];
      const uploadedAt = Date.now();
      const rows = processed.map((img, i) => {
        const id = randomUUID();
        return {
          id, entryId: entry.id, buildSheetId: entry.buildSheetId, caption: list?.[i]?.trim() ?? '', createdAt: new Date(uploadedAt + i),
          storageKey: `journal/${entry.buildSheetId}/${id}.jpg`, thumbnailKey: `journal/${entry.buildSheetId}/${id}.thumb.jpg`,
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
          // The sheet's row lock serialises uploads, so two at once cannot both pass the limits.
          await tx.getRepository(BuildSheet).findOne({ where: { id: entry.buildSheetId }, lock: { mode: 'pessimistic_write' } });
          const repo = tx.getRepository(JournalPhoto);
          // One after the other: a transaction is one connection, which runs one query at a time.
          const sheetCount = await repo.countBy({ buildSheetId: entry.buildSheetId });
          const entryCount = await repo.countBy({ entryId: entry.id });
          refuseOverLimits(sheetCount, entryCount, rows.length);
          await repo.insert(rows.map(({ img: _img, ...row }) => row));
          await audit.record({
            clubId: sheet.clubId, actorId: userId, action: 'journal.photos_added', entity: { type: 'build_sheet', id: sheet.id },
            details: { stage: entry.stage, sheetName: sheet.name, count: rows.length },
          }, { manager: tx });
          return repo.find({ where: rows.map((r) => ({ id: r.id })), order: { createdAt: 'ASC' } });
        });
        return saved.map(photoView);
      } catch (err) {
        await removeQuietly(stored);
        throw err;
      }
    },

    async bytes(photoId: string, userId: string, which: 'image' | 'thumbnail'): Promise<{ photo: JournalPhoto; bytes: Buffer }> {
      const photo = await photoFor(photoId, userId, 'read');
      return { photo, bytes: await readStoredPhoto(storage, which === 'image' ? photo.storageKey : photo.thumbnailKey) };
    },

    async updatePhoto(photoId: string, userId: string, body: UpdateJournalPhotoBody): Promise<JournalPhotoWire> {
      const photo = await photoFor(photoId, userId, 'edit');
      photo.caption = body.caption;
      await ds.getRepository(JournalPhoto).save(photo);
      return photoView(photo);
    },

    async removePhoto(photoId: string, userId: string): Promise<void> {
      const photo = await photoFor(photoId, userId, 'edit');
      await ds.getRepository(JournalPhoto).delete({ id: photo.id });
      await removeQuietly([photo.storageKey, photo.thumbnailKey]);
    },
  };
}
