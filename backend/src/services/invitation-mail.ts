// The invitation e-mail: queued through the outbox in the transaction that creates the invitation, so
// the person added gets their link by mail; the admin still sees the same link to copy and pass on.
import type { EntityManager } from 'typeorm';
import type { MailService } from './mail';
import { renderMail } from './mail';
import { rolesListText } from '../contracts/roles';
import { calendarDateIn, clockTimeIn, formatIsoDate } from '../domain/dates';


/** Queues the mail; returns its outbox id, which the activity log reads to say whether it went out. */
export async function mailInvitation(
  mail: MailService, em: EntityManager,
  input: { to: string; clubId: string; clubName: string; inviterName: string; roles: string[]; url: string; expiresAt: Date; timeZone: string },
): Promise<string> {
  const roles = rolesListText('and', input.roles);
  // The last day and time in the club's time zone, as the person invited reads it.
  const until = `${formatIsoDate(calendarDateIn(input.expiresAt, input.timeZone))}, ${clockTimeIn(input.expiresAt, input.timeZone)} (${input.timeZone})`;
  const { id } = await mail.enqueue(
    {
      to: input.to,
      kind: 'invitation.sent',
      related: { clubId: input.clubId },
      ...renderMail({
        subject: `${input.inviterName} invited you to ${input.clubName} on Cagewright`,
        greeting: 'Hello,',
        paragraphs: [
          `${input.inviterName} added you to ${input.clubName} as ${roles}.`,
          `Choose a password to join. The link works once, until ${until}.`,
        ],
        action: { label: 'Set your password and join', url: input.url },
        reason: `An admin of ${input.clubName} added this address. If you did not expect it, ignore this mail: nothing happens without the link.`,
      }),
    },
    { manager: em },
  );
  return id;
}
