// A club's own settings: for now the time zone its dates are read in (an edition takes effect at
// midnight there). Every member reads them; admins change them, with an activity-log entry.
import type { DataSource, EntityManager } from 'typeorm';
import type { ClubSettingsBody, ClubSettingsWire } from '../contracts/clubs';
import { calendarDateIn } from '../domain/dates';
import { Club } from '../entities';
import { NotFoundError } from '../errors';
import type { AuditService } from './audit.service';

export type ClubSettingsService = ReturnType<typeof createClubSettingsService>;

export function createClubSettingsService(ds: DataSource, deps: { audit: AuditService; now: () => Date }) {
  /** The club's zone and its calendar date now. */
  async function calendar(clubId: string, em: EntityManager = ds.manager): Promise<ClubSettingsWire> {
    const club = await em.getRepository(Club).findOne({ where: { id: clubId }, select: { id: true, timeZone: true } });
    if (!club) throw new NotFoundError('Club not found.');
    return { timeZone: club.timeZone, today: calendarDateIn(deps.now(), club.timeZone) };
  }

  return {
    calendar,

    async update(clubId: string, userId: string, body: ClubSettingsBody): Promise<ClubSettingsWire> {
      await ds.transaction(async (tx) => {
        const club = await tx.getRepository(Club).findOne({ where: { id: clubId }, lock: { mode: 'pessimistic_write' } });
        if (!club) throw new NotFoundError('Club not found.');
        if (club.timeZone === body.timeZone) return;
        const before = club.timeZone;
        await tx.getRepository(Club).update({ id: clubId }, { timeZone: body.timeZone });
        await deps.audit.record(
          { clubId, actorId: userId, action: 'club.settings_changed', entity: { type: 'club', id: clubId }, details: { timeZone: { from: before, to: body.timeZone } } },
          { manager: tx },
        );
      });
      return calendar(clubId);
    },
  };
}
