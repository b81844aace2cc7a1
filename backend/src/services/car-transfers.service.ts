// Selling a car (issue 13 §3): the seller offers it by the buyer's e-mail address, the buyer accepts or
// declines it from their garage, the seller may withdraw the offer; a club admin may move a car of the club
// outright. Ownership is one column (`cars.owner_id`): the car's sheets, check runs, photos, journal and cage
// records follow it. The buyer must belong to every club the car has build sheets in (a car without sheets:
// to a club the seller belongs to), so the club's stewards keep seeing its sheets; a car with a review
// waiting moves only after the decision. Every step is in the activity log of each of the car's clubs and
// mails the person who should hear of it, in the step's own transaction.
import type { DataSource, EntityManager } from 'typeorm';
import type { AdminTransferBody, CarTransfersWire, CarTransferWire, ClubCarWire, OfferCarBody } from '../contracts/car-transfers';
import { Car, CarTransfer, User, type CarTransferState } from '../entities';
import { ConflictError, ForbiddenError, NotFoundError, ValidationError } from '../errors';
import type { AuditService } from './audit.service';
import { enforce, rolesIn } from './access';
import { renderMail, type MailService } from './mail';

export interface CarTransferDeps {
  audit: AuditService;
  mail: MailService;
  publicUrl: string;
}

interface ClubRef { id: string; name: string }

const listed = (words: string[]) => (words.length <= 1 ? (words[0] ?? '') : `${words.slice(0, -1).join(', ')} and ${words.at(-1)}`);

const CLOSED_WORDS: Record<Exclude<CarTransferState, 'offered'>, string> = {
  accepted: 'This offer has already been accepted: the car has moved.',
  declined: 'This offer was declined.',
  withdrawn: 'The seller withdrew this offer.',
  cancelled: 'This offer no longer stands: a club admin moved the car.',
  transferred: 'This car was moved by a club admin.',
};

export type CarTransferService = ReturnType<typeof createCarTransferService>;

export function createCarTransferService(ds: DataSource, deps: CarTransferDeps) {
  const garageUrl = `${deps.publicUrl}/garage`;

  /** The clubs the car has build sheets in. */
  async function clubsOfCar(em: EntityManager, carId: string): Promise<ClubRef[]> {
    return em.query(`SELECT DISTINCT c.id, c.name FROM build_sheets s JOIN clubs c ON c.id = s.club_id WHERE s.car_id = $1 ORDER BY c.name`, [carId]);
  }

  async function clubsOf(em: EntityManager, userId: string): Promise<ClubRef[]> {
    return em.query(`SELECT c.id, c.name FROM memberships m JOIN clubs c ON c.id = m.club_id WHERE m.user_id = $1 ORDER BY c.name`, [userId]);
  }

  /**
   * The clubs whose log records the move, or the refusal when `buyerId` may not take the car: they must
   * belong to each club the car has sheets in (without sheets: to one of the seller's clubs).
   */
  async function clubsForMove(em: EntityManager, carId: string, sellerId: string, buyerId: string | null, email: string, path: string): Promise<ClubRef[]> {
    const carClubs = await clubsOfCar(em, carId);
    const buyerClubs = new Set(buyerId ? (await clubsOf(em, buyerId)).map((c) => c.id) : []);
    if (carClubs.length > 0) {
      const missing = carClubs.filter((c) => !buyerClubs.has(c.id));
      if (missing.length > 0)
        throw new ValidationError([{
          path,
          message: `No member of ${listed(missing.map((c) => c.name))} has the e-mail address ${email}. The car has build sheets there, so its new owner must belong to ${missing.length === 1 ? 'that club' : 'those clubs'}: ask ${missing.length === 1 ? 'its admin' : 'their admins'} to invite them, then offer the car again. The car stays where it is.`,
        }]);
      return carClubs;
    }
    const shared = (await clubsOf(em, sellerId)).filter((c) => buyerClubs.has(c.id));
    if (shared.length === 0)
      throw new ValidationError([{ path, message: `None of your clubs has a member with the e-mail address ${email}. Ask your club's admin to invite them, then offer the car again. The car stays in your garage.` }]);
    return shared;
  }

  async function refuseOpenReview(em: EntityManager, car: Car): Promise<void> {
    const [row]: { n: number }[] = await em.query(`SELECT count(*)::int AS n FROM submissions WHERE car_id = $1 AND state IN ('pending', 'in_review')`, [car.id]);
    if (row!.n > 0)
      throw new ConflictError(`${car.name} has a submission waiting for a steward. Withdraw it, or wait for the decision, before the car changes hands.`, { reason: 'review_open' });
  }

  async function person(em: EntityManager, id: string) {
    const u = await em.getRepository(User).findOneByOrFail({ id });
    return { id: u.id, displayName: u.displayName, email: u.email };
  }

  async function view(em: EntityManager, t: CarTransfer): Promise<CarTransferWire> {
    const car = await em.getRepository(Car).findOneByOrFail({ id: t.carId });
    const [counts]: { sheets: number; records: number }[] = await em.query(
      `SELECT (SELECT count(*)::int FROM build_sheets WHERE car_id = $1) AS sheets, (SELECT count(*)::int FROM cage_records WHERE car_id = $1) AS records`,
      [car.id],
    );
    return {
      id: t.id, state: t.state,
      car: { id: car.id, name: car.name, make: car.make, model: car.model, year: car.year, raceNumber: car.raceNumber, sheets: counts!.sheets, records: counts!.records },
      from: await person(em, t.fromUserId), to: await person(em, t.toUserId),
      createdAt: t.createdAt.toISOString(), decidedAt: t.decidedAt ? t.decidedAt.toISOString() : null,
    };
  }

  async function log(em: EntityManager, clubs: ClubRef[], actorId: string, action: string, t: CarTransfer, car: Car, other: { id: string; displayName: string }, extra: Record<string, unknown> = {}) {
    for (const club of clubs)
      await deps.audit.record(
        { clubId: club.id, actorId, action, entity: { type: 'car_transfer', id: t.id }, details: { carId: car.id, carName: car.name, userId: other.id, otherName: other.displayName, ...extra } },
        { manager: em },
      );
  }

  async function mail(em: EntityManager, to: { email: string; displayName: string }, kind: string, t: CarTransfer, subject: string, paragraphs: string[]) {
    await deps.mail.enqueue(
      {
        to: to.email, kind, related: { transferId: t.id, carId: t.carId },
        ...renderMail({ subject, greeting: `Hello ${to.displayName},`, paragraphs, action: { label: 'Open your garage', url: garageUrl }, reason: 'You are one of the two people in this change of owner.' }),
      },
      { manager: em },
    );
  }

  /** The transfer row locked, with the policy asked; 404 for anyone but its two people. */
  async function transferFor(em: EntityManager, transferId: string, userId: string, rule: 'transfer.recipient' | 'transfer.sender', forbidden: string): Promise<CarTransfer> {
    const t = await em.getRepository(CarTransfer).findOne({ where: { id: transferId }, lock: { mode: 'pessimistic_write' } });
    if (!t) throw new NotFoundError('Transfer not found.');
    enforce(rule, { actorId: userId, ownerId: t.fromUserId, recipientId: t.toUserId }, { notFound: 'Transfer not found.', forbidden });
    if (t.state !== 'offered') throw new ConflictError(CLOSED_WORDS[t.state], { reason: 'not_open', state: t.state });
    return t;
  }

  async function lockedCar(em: EntityManager, carId: string): Promise<Car> {
    return em.getRepository(Car).findOneOrFail({ where: { id: carId }, lock: { mode: 'pessimistic_write' } });
  }

  const carWords = (car: Car) => `${car.name}${car.raceNumber ? ` (No. ${car.raceNumber})` : ''}`;

  async function close(em: EntityManager, t: CarTransfer, state: CarTransferState): Promise<void> {
    t.state = state;
    t.decidedAt = new Date();
    await em.getRepository(CarTransfer).save(t);
  }

  return {
    async offer(carId: string, userId: string, body: OfferCarBody): Promise<CarTransferWire> {
      return ds.transaction(async (tx) => {
        const car = await tx.getRepository(Car).findOne({ where: { id: carId }, lock: { mode: 'pessimistic_write' } });
        if (!car) throw new NotFoundError('Car not found.');
        enforce('car.owner', { actorId: userId, ownerId: car.ownerId }, { notFound: 'Car not found.' });
        const seller = await person(tx, userId);
        if (body.email === seller.email.toLowerCase())
          throw new ValidationError([{ path: 'email', message: 'That is your own address: this car is yours already. Give the buyer’s e-mail address.' }]);
        const open = await tx.getRepository(CarTransfer).findOneBy({ carId: car.id, state: 'offered' });
        if (open) {
          const to = await person(tx, open.toUserId);
          throw new ConflictError(`You have already offered ${car.name} to ${to.displayName}. Withdraw that offer first.`, { reason: 'already_offered', transferId: open.id });
        }
        const buyer = await tx.getRepository(User).createQueryBuilder('u').where('lower(u.email) = :email', { email: body.email }).getOne();
        const clubs = await clubsForMove(tx, car.id, userId, buyer?.id ?? null, body.email, 'email');
        await refuseOpenReview(tx, car);
        const t = await tx.getRepository(CarTransfer).save(tx.getRepository(CarTransfer).create({ carId: car.id, fromUserId: userId, toUserId: buyer!.id, state: 'offered', byAdminId: null, decidedAt: null }));
        await log(tx, clubs, userId, 'car.transfer_offered', t, car, buyer!);
        await mail(tx, buyer!, 'car.transfer_offered', t, `${seller.displayName} offers you ${car.name}`, [
          `${seller.displayName} offers you the car ${carWords(car)} on Cagewright, with its build sheets, checks and cage records.`,
          'Accept or decline it in your garage. Until you accept, the car stays with them.',
        ]);
        return view(tx, t);
      });
    },

    async list(userId: string): Promise<CarTransfersWire> {
      const repo = ds.getRepository(CarTransfer);
      const incoming = await repo.find({ where: { toUserId: userId, state: 'offered' }, order: { createdAt: 'ASC' } });
      const outgoing = await repo.find({ where: { fromUserId: userId, state: 'offered' }, order: { createdAt: 'ASC' } });
      return {
        incoming: await Promise.all(incoming.map((t) => view(ds.manager, t))),
        outgoing: await Promise.all(outgoing.map((t) => view(ds.manager, t))),
      };
    },

    async accept(transferId: string, userId: string): Promise<CarTransferWire> {
      return ds.transaction(async (tx) => {
        const t = await transferFor(tx, transferId, userId, 'transfer.recipient', 'Only the person the car is offered to can accept it.');
        const car = await lockedCar(tx, t.carId);
        if (car.ownerId !== t.fromUserId) {
          await close(tx, t, 'cancelled');
          throw new ConflictError(CLOSED_WORDS.cancelled, { reason: 'not_open', state: 'cancelled' });
        }
        const buyer = await person(tx, userId);
        const clubs = await clubsForMove(tx, car.id, t.fromUserId, userId, buyer.email, 'transferId');
        await refuseOpenReview(tx, car);
        car.ownerId = userId;
        // It arrives in the buyer's garage among the cars in use, whatever shelf the seller kept it on.
        car.archivedAt = null;
        await tx.getRepository(Car).save(car);
        await close(tx, t, 'accepted');
        const seller = await person(tx, t.fromUserId);
        await log(tx, clubs, userId, 'car.transfer_accepted', t, car, seller);
        await mail(tx, seller, 'car.transfer_accepted', t, `${buyer.displayName} accepted ${car.name}`, [
          `${buyer.displayName} accepted ${carWords(car)}. The car, its build sheets, checks and cage records are now in their garage, and no longer in yours.`,
        ]);
        return view(tx, t);
      });
    },

    async decline(transferId: string, userId: string): Promise<CarTransferWire> {
      return ds.transaction(async (tx) => {
        const t = await transferFor(tx, transferId, userId, 'transfer.recipient', 'Only the person the car is offered to can decline it.');
        const car = await lockedCar(tx, t.carId);
        await close(tx, t, 'declined');
        const seller = await person(tx, t.fromUserId);
        const buyer = await person(tx, userId);
        await log(tx, await sharedOr(tx, await clubsOfCar(tx, car.id), t), userId, 'car.transfer_declined', t, car, seller);
        await mail(tx, seller, 'car.transfer_declined', t, `${buyer.displayName} declined ${car.name}`, [
          `${buyer.displayName} declined your offer of ${carWords(car)}. The car stays in your garage.`,
        ]);
        return view(tx, t);
      });
    },

    async withdraw(transferId: string, userId: string): Promise<CarTransferWire> {
      return ds.transaction(async (tx) => {
        const t = await transferFor(tx, transferId, userId, 'transfer.sender', 'Only the seller who offered the car can withdraw the offer.');
        const car = await lockedCar(tx, t.carId);
        await close(tx, t, 'withdrawn');
        const buyer = await person(tx, t.toUserId);
        const seller = await person(tx, userId);
        await log(tx, await sharedOr(tx, await clubsOfCar(tx, car.id), t), userId, 'car.transfer_withdrawn', t, car, buyer);
        await mail(tx, buyer, 'car.transfer_withdrawn', t, `${seller.displayName} withdrew the offer of ${car.name}`, [
          `${seller.displayName} withdrew the offer of ${carWords(car)}. Nothing changes in your garage.`,
        ]);
        return view(tx, t);
      });
    },

    /** The club's cars (those with a build sheet in it), for its admins. */
    async clubCars(clubId: string, userId: string): Promise<ClubCarWire[]> {
      enforce('club.admin', { actorId: userId, roles: await rolesIn(ds.manager, userId, clubId) }, { notFound: 'Club not found.', forbidden: 'Only the club’s admins can move cars.' });
      const rows: { id: string; name: string; make: string | null; model: string | null; race_number: string | null; owner_id: string; owner_name: string; owner_email: string; sheets: number; open_offer: boolean }[] = await ds.query(
        `SELECT c.id, c.name, c.make, c.model, c.race_number, u.id AS owner_id, u.display_name AS owner_name, u.email AS owner_email,
                count(s.id)::int AS sheets, EXISTS (SELECT 1 FROM car_transfers t WHERE t.car_id = c.id AND t.state = 'offered') AS open_offer
           FROM cars c JOIN build_sheets s ON s.car_id = c.id AND s.club_id = $1 JOIN users u ON u.id = c.owner_id
          GROUP BY c.id, u.id ORDER BY lower(c.name), c.id`,
        [clubId],
      );
      return rows.map((r) => ({
        id: r.id, name: r.name, make: r.make, model: r.model, raceNumber: r.race_number,
        owner: { id: r.owner_id, displayName: r.owner_name, email: r.owner_email }, sheets: r.sheets, openOffer: r.open_offer,
      }));
    },

    /** A club admin moves a car of the club to another member at once (a sale both people told the club of). */
    async adminTransfer(clubId: string, carId: string, userId: string, body: AdminTransferBody): Promise<CarTransferWire> {
      return ds.transaction(async (tx) => {
        enforce('club.admin', { actorId: userId, roles: await rolesIn(tx, userId, clubId) }, { notFound: 'Club not found.', forbidden: 'Only the club’s admins can move cars.' });
        const car = await tx.getRepository(Car).findOne({ where: { id: carId }, lock: { mode: 'pessimistic_write' } });
        const carClubs = car ? await clubsOfCar(tx, car.id) : [];
        if (!car || !carClubs.some((c) => c.id === clubId)) throw new NotFoundError('Car not found.');
        const notMine: ClubRef[] = [];
        for (const c of carClubs) if (!((await rolesIn(tx, userId, c.id)) ?? []).includes('admin')) notMine.push(c);
        if (notMine.length)
          throw new ForbiddenError(`${car.name} also has build sheets in ${listed(notMine.map((c) => c.name))}, where you are not an admin. Its owner can offer it to the buyer instead.`);
        if (body.toUserId === car.ownerId) throw new ValidationError([{ path: 'toUserId', message: 'This member owns the car already.' }]);
        const target = await tx.getRepository(User).findOneBy({ id: body.toUserId });
        const clubs = await clubsForMove(tx, car.id, car.ownerId, target?.id ?? null, target?.email ?? 'that member', 'toUserId');
        await refuseOpenReview(tx, car);
        const open = await tx.getRepository(CarTransfer).findOne({ where: { carId: car.id, state: 'offered' }, lock: { mode: 'pessimistic_write' } });
        if (open) {
          await close(tx, open, 'cancelled');
          if (open.toUserId !== target!.id) {
            const wouldBe = await person(tx, open.toUserId);
            await mail(tx, wouldBe, 'car.transfer_cancelled', open, `The offer of ${car.name} no longer stands`, [`A club admin moved ${carWords(car)} to another member, so its offer to you no longer stands.`]);
          }
        }
        const from = await person(tx, car.ownerId);
        const to = await person(tx, target!.id);
        const admin = await person(tx, userId);
        const t = await tx.getRepository(CarTransfer).save(tx.getRepository(CarTransfer).create({ carId: car.id, fromUserId: from.id, toUserId: to.id, state: 'transferred', byAdminId: userId, decidedAt: new Date() }));
        car.ownerId = to.id;
        car.archivedAt = null;
        await tx.getRepository(Car).save(car);
        await log(tx, clubs, userId, 'car.transferred', t, car, to, { fromUserId: from.id, fromName: from.displayName });
        await mail(tx, to, 'car.transferred', t, `${car.name} is now in your garage`, [
          `${admin.displayName}, an admin of your club, moved ${carWords(car)} from ${from.displayName} to you, with its build sheets, checks and cage records.`,
        ]);
        await mail(tx, from, 'car.transferred', t, `${car.name} has moved to ${to.displayName}`, [
          `${admin.displayName}, an admin of your club, moved ${carWords(car)} to ${to.displayName}. It is no longer in your garage.`,
        ]);
        return view(tx, t);
      });
    },
  };

  /** The car's clubs, or (a car without sheets) the clubs its two people share: where the step is logged. */
  async function sharedOr(em: EntityManager, carClubs: ClubRef[], t: CarTransfer): Promise<ClubRef[]> {
    if (carClubs.length) return carClubs;
    const theirs = new Set((await clubsOf(em, t.toUserId)).map((c) => c.id));
    return (await clubsOf(em, t.fromUserId)).filter((c) => theirs.has(c.id));
  }
}
