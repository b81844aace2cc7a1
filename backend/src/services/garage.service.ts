// The builder's cars (each sheet with its latest verdict and where it stands in review), and loading a
// build sheet for someone: the access policy's `sheet.read` and `sheet.edit` (domain/access-policy.ts)
// decide — its car's owner edits; the stewards and admins of the sheet's club read. Everyone else gets
// the same 404 as for a sheet that does not exist, so nobody learns which ids are in use.
import type { DataSource, EntityManager } from 'typeorm';
import type { CarWire, CreateCarBody, ListQuery, SheetAccess, SheetReviewWire, SheetSummaryWire, UpdateCarBody } from '../contracts/garage';
import { BuildSheet, Car } from '../entities';
import { ConflictError, NotFoundError } from '../errors';
import { enforce, rolesIn } from './access';
import { sheetReviews } from './garage/sheet-reviews';

const sheetRules = { read: 'sheet.read', edit: 'sheet.edit', submit: 'submission.create' } as const;
const sheetWords = {
  read: { notFound: 'Build sheet not found.' },
  edit: { notFound: 'Build sheet not found.', forbidden: 'Only the builder who owns this car can change its build sheets.' },
  // Submitting a saved check of the sheet: its caller rewords the 404 as the check run's.
  submit: { notFound: 'Build sheet not found.', forbidden: 'Only the builder who saved this check can submit it.' },
} as const;

export interface SheetAccessResult {
  sheet: BuildSheet;
  car: Car;
  access: SheetAccess;
}

const iso = (d: Date | null) => (d ? d.toISOString() : null);

export function sheetSummaryView(s: BuildSheet, review: SheetReviewWire | null = null): SheetSummaryWire {
  if (!s.club) throw new Error('sheetSummaryView needs the club relation loaded');
  return {
    id: s.id,
    name: s.name,
    club: { id: s.club.id, name: s.club.name },
    classId: s.classId,
    currentRevision: s.currentRevision,
    archivedAt: iso(s.archivedAt),
    latestCheckRunId: s.latestCheckRunId,
    latestVerdict: s.latestVerdict,
    latestCheckedRevision: s.latestCheckedRevision,
    updatedAt: s.updatedAt.toISOString(),
    review,
  };
}

export function carView(c: Car, sheets: BuildSheet[], reviews: ReadonlyMap<string, SheetReviewWire> = new Map()): CarWire {
  return {
    id: c.id,
    name: c.name,
    make: c.make,
    model: c.model,
    year: c.year,
    chassisType: c.chassisType,
    raceNumber: c.raceNumber,
    archivedAt: iso(c.archivedAt),
    createdAt: c.createdAt.toISOString(),
    updatedAt: c.updatedAt.toISOString(),
    buildSheets: sheets.map((s) => sheetSummaryView(s, reviews.get(s.id) ?? null)),
  };
}

/**
 * Loads a sheet for `userId` or throws: 404 when they may not see it, 403 when they may see it but
 * `need` is edit (or submit, a check of it). `lock` takes a row lock on the sheet (inside a
 * transaction) so saves serialise.
 */
export async function sheetFor(
  em: EntityManager, sheetId: string, userId: string, need: 'read' | 'edit' | 'submit', lock = false,
): Promise<SheetAccessResult> {
  const sheet = await em.getRepository(BuildSheet).findOne({ where: { id: sheetId }, ...(lock ? { lock: { mode: 'pessimistic_write' as const } } : {}) });
  const car = sheet ? await em.getRepository(Car).findOneBy({ id: sheet.carId }) : null;
  if (!sheet || !car) throw new NotFoundError('Build sheet not found.');
  const owner = car.ownerId === userId;
  // The owner's roles in the club do not matter to any sheet rule: spare the query.
  const roles = owner ? null : await rolesIn(em, userId, sheet.clubId);
  enforce(sheetRules[need], { actorId: userId, ownerId: car.ownerId, roles }, sheetWords[need]);
  return { sheet, car, access: owner ? 'owner' : 'reviewer' };
}

export type GarageService = ReturnType<typeof createGarageService>;

export function createGarageService(ds: DataSource, options: { now?: () => Date } = {}) {
  const now = options.now ?? (() => new Date());
  async function ownCar(em: EntityManager, carId: string, userId: string, lock = false): Promise<Car> {
    const car = await em.getRepository(Car).findOne({ where: { id: carId }, ...(lock ? { lock: { mode: 'pessimistic_write' as const } } : {}) });
    // Another builder's car is not found, never forbidden.
    if (!car) throw new NotFoundError('Car not found.');
    enforce('car.owner', { actorId: userId, ownerId: car.ownerId }, { notFound: 'Car not found.' });
    return car;
  }

  async function sheetsOf(em: EntityManager, carIds: string[], show: ListQuery['show'] = 'all'): Promise<Map<string, BuildSheet[]>> {
    const byCar = new Map<string, BuildSheet[]>(carIds.map((id) => [id, []]));
    if (carIds.length === 0) return byCar;
    const qb = em.getRepository(BuildSheet).createQueryBuilder('s').leftJoinAndSelect('s.club', 'club').where('s.car_id IN (:...carIds)', { carIds });
    if (show === 'active') qb.andWhere('s.archived_at IS NULL');
    if (show === 'archived') qb.andWhere('s.archived_at IS NOT NULL');
    for (const s of await qb.orderBy('s.created_at', 'ASC').addOrderBy('s.id', 'ASC').getMany()) byCar.get(s.carId)?.push(s);
    return byCar;
  }

  async function view(em: EntityManager, car: Car): Promise<CarWire> {
    const sheets = (await sheetsOf(em, [car.id])).get(car.id) ?? [];
    return carView(car, sheets, await sheetReviews(em, sheets.map((s) => s.id), now()));
  }

  return {
    ownCar: (carId: string, userId: string) => ownCar(ds.manager, carId, userId),

    /** The caller's cars, each with its sheets and their latest verdicts. Archived sheets show with `show=all`. */
    async list(userId: string, query: ListQuery): Promise<CarWire[]> {
      const qb = ds.getRepository(Car).createQueryBuilder('c').where('c.owner_id = :userId', { userId });
      if (query.show === 'active') qb.andWhere('c.archived_at IS NULL');
      if (query.show === 'archived') qb.andWhere('c.archived_at IS NOT NULL');
      const cars = await qb.orderBy('lower(c.name)', 'ASC').addOrderBy('c.created_at', 'ASC').getMany();
      const sheets = await sheetsOf(ds.manager, cars.map((c) => c.id), query.show === 'active' ? 'active' : 'all');
      const reviews = await sheetReviews(ds.manager, [...sheets.values()].flat().map((s) => s.id), now());
      return cars.map((c) => carView(c, sheets.get(c.id) ?? [], reviews));
    },

    async get(carId: string, userId: string): Promise<CarWire> {
      return view(ds.manager, await ownCar(ds.manager, carId, userId));
    },

    async create(userId: string, body: CreateCarBody): Promise<CarWire> {
      const repo = ds.getRepository(Car);
      const car = await repo.save(
        repo.create({
          ownerId: userId, name: body.name, make: body.make ?? null, model: body.model ?? null, year: body.year ?? null,
          chassisType: body.chassisType, raceNumber: body.raceNumber ?? null, archivedAt: null,
        }),
      );
      return carView(car, []);
    },

    async update(carId: string, userId: string, body: UpdateCarBody): Promise<CarWire> {
      return ds.transaction(async (tx) => {
        const car = await ownCar(tx, carId, userId, true);
        const changes = Object.fromEntries(Object.entries(body).filter(([, v]) => v !== undefined));
        Object.assign(car, changes);
        await tx.getRepository(Car).save(car);
        return view(tx, car);
      });
    },

    async setArchived(carId: string, userId: string, archived: boolean): Promise<CarWire> {
      return ds.transaction(async (tx) => {
        const car = await ownCar(tx, carId, userId, true);
        // Archiving twice keeps the first date: it says when the car left the garage.
        if (archived && !car.archivedAt) car.archivedAt = new Date();
        if (!archived) car.archivedAt = null;
        await tx.getRepository(Car).save(car);
        return view(tx, car);
      });
    },

    /** Only a car without build sheets may be deleted; one with sheets is archived instead. */
    async remove(carId: string, userId: string): Promise<void> {
      await ds.transaction(async (tx) => {
        const car = await ownCar(tx, carId, userId, true);
        const sheets = await tx.getRepository(BuildSheet).countBy({ carId: car.id });
        if (sheets > 0) {
          throw new ConflictError(`This car has ${sheets} build sheet${sheets === 1 ? '' : 's'}, so it cannot be deleted. Archive it instead.`, { buildSheets: sheets });
        }
        await tx.getRepository(Car).delete({ id: car.id });
      });
    },
  };
}
