// Tube stock lists: a club's list, kept by its admins and started from the common sizes the first
// time anyone reads it (a list emptied on purpose stays empty; "add the common sizes" brings back the
// missing ones), and each builder's own sizes. Club list changes are audited in the club's log.
import type { DataSource, EntityManager } from 'typeorm';
import type { StockListWire, StockTubeBody, StockTubePatch, StockTubeWire } from '../contracts/tube-stock';
import { COMMON_STOCK } from '../domain/common-stock';
import { tubeSectionProperties, tubeSizeProblems } from '../domain/tube';
import { allows } from '../domain/access-policy';
import { StockTube } from '../entities';
import type { ClubRole } from '../entities';
import { ConflictError, NotFoundError, ValidationError } from '../errors';
import { enforce, rolesAnywhere } from './access';
import type { AuditService } from './audit.service';

/** Enough for any real stock list; stops a runaway script filling the table. */
export const STOCK_LIST_LIMIT = 400;

const SAME_MM = 1e-6;

export function stockTubeView(t: StockTube): StockTubeWire {
  return {
    id: t.id, list: t.clubId ? 'club' : 'mine', label: t.label, odMm: t.odMm, wallMm: t.wallMm, material: t.material, process: t.process,
    grade: t.grade, yieldMpa: t.yieldMpa, yieldSource: t.yieldSource, common: t.common,
    massPerMetreKg: tubeSectionProperties({ odMm: t.odMm, wallMm: t.wallMm }, t.material).massPerMetreKg,
    updatedAt: t.updatedAt.toISOString(),
  };
}

const sizeText = (t: Pick<StockTube, 'odMm' | 'wallMm'>) => `${Math.round(t.odMm * 100) / 100} × ${Math.round(t.wallMm * 100) / 100} mm`;

function defaultLabel(t: Pick<StockTube, 'odMm' | 'wallMm' | 'material' | 'process'>): string {
  const words = { mild_steel: 'mild steel', chromoly_4130: '4130', other: 'other material' }[t.material];
  return `${sizeText(t)} ${t.process.toUpperCase()} ${words}`;
}

type ListKey = { clubId: string } | { ownerId: string };
const whereList = (key: ListKey) => ('clubId' in key ? { clubId: key.clubId } : { ownerId: key.ownerId });

export type TubeStockService = ReturnType<typeof createTubeStockService>;

export function createTubeStockService(ds: DataSource, deps: { audit: AuditService }) {
  /**
   * Starts a club's list from the common sizes, once; safe under concurrent first reads when `em` is a
   * transaction: a second reader's insert of the seed row waits for the first one's commit, sizes and all.
   */
  async function ensureSeeded(em: EntityManager, clubId: string): Promise<void> {
    const inserted: unknown[] = await em.query(`INSERT INTO club_stock_seeds (club_id) VALUES ($1) ON CONFLICT DO NOTHING RETURNING club_id`, [clubId]);
    if (inserted.length === 0) return;
    await em.getRepository(StockTube).insert(COMMON_STOCK.map((c) => ({
      clubId, ownerId: null, label: c.label, odMm: c.odMm, wallMm: c.wallMm, material: c.material, process: c.process,
      grade: c.grade ?? null, yieldMpa: c.yieldMpa ?? null, yieldSource: c.yieldSource ?? null, common: true,
    })));
  }

  async function rows(em: EntityManager, key: ListKey): Promise<StockTube[]> {
    return em.getRepository(StockTube).find({ where: whereList(key), order: { odMm: 'ASC', wallMm: 'ASC', material: 'ASC', process: 'ASC', createdAt: 'ASC' } });
  }

  function refuseDuplicate(existing: StockTube[], t: Pick<StockTube, 'odMm' | 'wallMm' | 'material' | 'process'>, exceptId?: string): void {
    const twin = existing.find((e) => e.id !== exceptId && Math.abs(e.odMm - t.odMm) < SAME_MM && Math.abs(e.wallMm - t.wallMm) < SAME_MM && e.material === t.material && e.process === t.process);
    if (twin) throw new ConflictError(`This size is already on the list as “${twin.label}”.`, { tubeId: twin.id });
  }

  async function add(key: ListKey, body: StockTubeBody): Promise<StockTube> {
    return ds.transaction(async (tx) => {
      // Serialise additions to one list so the duplicate and size checks see each other.
      await tx.query(`SELECT pg_advisory_xact_lock(hashtext($1))`, [`stock:${'clubId' in key ? key.clubId : key.ownerId}`]);
      if ('clubId' in key) await ensureSeeded(tx, key.clubId);
      const existing = await rows(tx, key);
      if (existing.length >= STOCK_LIST_LIMIT) throw new ConflictError(`A stock list holds at most ${STOCK_LIST_LIMIT} sizes; remove some first.`);
      refuseDuplicate(existing, body);
      const repo = tx.getRepository(StockTube);
      return repo.save(repo.create({
        ...whereList(key), ...('clubId' in key ? { ownerId: null } : { clubId: null }),
        label: body.label ?? defaultLabel(body), odMm: body.odMm, wallMm: body.wallMm, material: body.material, process: body.process,
        grade: body.grade ?? null, yieldMpa: body.yieldMpa ?? null, yieldSource: body.yieldSource ?? null, common: false,
      }));
    });
  }

  async function update(key: ListKey, tubeId: string, patch: StockTubePatch): Promise<{ before: StockTube; after: StockTube }> {
    return ds.transaction(async (tx) => {
      const repo = tx.getRepository(StockTube);
      const row = await repo.findOne({ where: { id: tubeId, ...whereList(key) }, lock: { mode: 'pessimistic_write' } });
      if (!row) throw new NotFoundError('Stock size not found.');
      const before = { ...row };
      const next = { ...row, ...Object.fromEntries(Object.entries(patch).filter(([, v]) => v !== undefined)) } as StockTube;
      // The combined size must still be a tube: a new wall against the old OD, say.
      const problems = tubeSizeProblems(next);
      if (problems.length > 0) throw new ValidationError(problems.map((p) => ({ path: patch[p.field] !== undefined ? p.field : (p.field === 'wallMm' ? 'odMm' : 'wallMm'), message: p.message })));
      refuseDuplicate(await rows(tx, key), next, row.id);
      // A size someone changed is theirs now, not a common one.
      return { before, after: await repo.save({ ...next, common: false }) };
    });
  }

  async function remove(key: ListKey, tubeId: string): Promise<StockTube> {
    const repo = ds.getRepository(StockTube);
    const row = await repo.findOneBy({ id: tubeId, ...whereList(key) });
    if (!row) throw new NotFoundError('Stock size not found.');
    await repo.delete({ id: row.id });
    return row;
  }

  const auditDetails = (t: StockTube) => ({ label: t.label, odMm: t.odMm, wallMm: t.wallMm, material: t.material, process: t.process });

  /** The access policy's `self.builder`: own sizes are kept by whoever builds for some club. */
  async function requireBuilderSomewhere(userId: string): Promise<void> {
    enforce('self.builder', { actorId: userId, rolesAnywhere: await rolesAnywhere(ds.manager, userId) }, {
      notFound: 'Stock size not found.', forbidden: 'Your own stock sizes are for builders; you hold no builder role in any club.',
    });
  }

  return {
    ensureSeeded: (clubId: string) => ds.transaction((tx) => ensureSeeded(tx, clubId)),

    async listClub(clubId: string, userId: string, roles: readonly ClubRole[]): Promise<StockListWire> {
      await ds.transaction((tx) => ensureSeeded(tx, clubId));
      return { tubes: (await rows(ds.manager, { clubId })).map(stockTubeView), canEdit: allows('club.admin', { actorId: userId, roles }) };
    },

    async addClub(clubId: string, actorId: string, body: StockTubeBody): Promise<StockTubeWire> {
      const row = await add({ clubId }, body);
      await deps.audit.record({ clubId, actorId, action: 'tube_stock.added', entity: { type: 'stock_tube', id: row.id }, details: auditDetails(row) });
      return stockTubeView(row);
    },

    async updateClub(clubId: string, tubeId: string, actorId: string, patch: StockTubePatch): Promise<StockTubeWire> {
      const { before, after } = await update({ clubId }, tubeId, patch);
      await deps.audit.record({ clubId, actorId, action: 'tube_stock.changed', entity: { type: 'stock_tube', id: after.id }, details: { before: auditDetails(before), after: auditDetails(after) } });
      return stockTubeView(after);
    },

    async removeClub(clubId: string, tubeId: string, actorId: string): Promise<void> {
      const row = await remove({ clubId }, tubeId);
      await deps.audit.record({ clubId, actorId, action: 'tube_stock.removed', entity: { type: 'stock_tube', id: row.id }, details: auditDetails(row) });
    },

    /** Adds the common sizes the club's list lacks (after some were removed); returns how many. */
    async addCommonSizes(clubId: string, actorId: string): Promise<{ added: number; list: StockListWire }> {
      const added = await ds.transaction(async (tx) => {
        await tx.query(`SELECT pg_advisory_xact_lock(hashtext($1))`, [`stock:${clubId}`]);
        await ensureSeeded(tx, clubId);
        const existing = await rows(tx, { clubId });
        const missing = COMMON_STOCK.filter((c) => !existing.some((e) => Math.abs(e.odMm - c.odMm) < SAME_MM && Math.abs(e.wallMm - c.wallMm) < SAME_MM && e.material === c.material && e.process === c.process));
        const room = STOCK_LIST_LIMIT - existing.length;
        if (missing.length > room) throw new ConflictError(`Adding the ${missing.length} missing common sizes would pass the list's limit of ${STOCK_LIST_LIMIT}.`);
        if (missing.length > 0)
          await tx.getRepository(StockTube).insert(missing.map((c) => ({
            clubId, ownerId: null, label: c.label, odMm: c.odMm, wallMm: c.wallMm, material: c.material, process: c.process,
            grade: c.grade ?? null, yieldMpa: c.yieldMpa ?? null, yieldSource: c.yieldSource ?? null, common: true,
          })));
        return missing.length;
      });
      if (added > 0) await deps.audit.record({ clubId, actorId, action: 'tube_stock.common_added', entity: { type: 'club', id: clubId }, details: { added } });
      return { added, list: { tubes: (await rows(ds.manager, { clubId })).map(stockTubeView), canEdit: true } };
    },

    async listMine(userId: string): Promise<StockListWire> {
      const canEdit = allows('self.builder', { actorId: userId, rolesAnywhere: await rolesAnywhere(ds.manager, userId) });
      return { tubes: (await rows(ds.manager, { ownerId: userId })).map(stockTubeView), canEdit };
    },

    async addMine(userId: string, body: StockTubeBody): Promise<StockTubeWire> {
      await requireBuilderSomewhere(userId);
      return stockTubeView(await add({ ownerId: userId }, body));
    },

    async updateMine(userId: string, tubeId: string, patch: StockTubePatch): Promise<StockTubeWire> {
      await requireBuilderSomewhere(userId);
      return stockTubeView((await update({ ownerId: userId }, tubeId, patch)).after);
    },

    async removeMine(userId: string, tubeId: string): Promise<void> {
      await remove({ ownerId: userId }, tubeId);
    },

    /** The stock a sheet's chooser uses: its club's list and its builder's own sizes. */
    async stockFor(clubId: string, ownerId: string): Promise<{ club: StockTube[]; mine: StockTube[] }> {
      await ds.transaction((tx) => ensureSeeded(tx, clubId));
      const [club, mine] = await Promise.all([rows(ds.manager, { clubId }), rows(ds.manager, { ownerId })]);
      return { club, mine };
    },
  };
}
