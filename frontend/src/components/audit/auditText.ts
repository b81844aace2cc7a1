// How activity log entries read on screen: one sentence per entry ("Sam Reyes approved Escort Mk2,
// record TV-2026-0007"), made of text and links to what it names (a person → the club's member page, a
// car → its page, a sheet, a record, an edition → theirs). The server resolves the names (subjects); a
// thing the reader cannot open reads as plain text, or, for a car or person, links to this log filtered
// by it. Unknown actions (added by later features) still read sensibly from their raw name and subjects.
import type { RouteLocationRaw } from 'vue-router';
import type { AuditEntry } from '@/api/audit';
import type { AuditRefWire } from '@contracts/audit';
import { SUBMISSION_STATE_SHORT } from '@contracts/verdict-words';
import { formatIsoDate, isIsoDate } from '@domain/dates';
import { roleLabels } from '@/components/common/roles';
import type { Role } from '@/api/types';
import { JOURNAL_STAGE_LABELS, type JournalStage } from '@/api/journal';

export type SentencePart = { text: string; to?: RouteLocationRaw; title?: string };

export const actionLabels: Record<string, string> = {
  'membership.added': 'Member added',
  'membership.roles_changed': 'Roles changed',
  'membership.removed': 'Member removed',
  'invitation.accepted': 'Invitation accepted',
  'ruleset.rulebook_created': 'Rulebook created',
  'ruleset.draft_started': 'Rulebook draft started',
  'ruleset.draft_saved': 'Rulebook draft saved',
  'ruleset.imported': 'Ruleset file imported',
  'ruleset.draft_deleted': 'Rulebook draft deleted',
  'ruleset.published': 'Edition put in force',
  'ruleset.scheduled': 'Edition scheduled',
  'ruleset.in_force': 'Scheduled edition came into force',
  'ruleset.retired': 'Edition withdrawn',
  'ruleset.recheck_completed': 'Build sheets re-checked',
  'cage_record.issued': 'Cage record issued',
  'cage_record.revoked': 'Cage record revoked',
  'cage_record.inspected': 'Track inspection recorded',
  'cage_record.expiry_reminded': 'Expiry reminder e-mailed',
  'club.record_settings_changed': 'Cage record settings changed',
  'club.settings_changed': 'Club time zone changed',
  'submission.submit': SUBMISSION_STATE_SHORT.pending,
  'submission.resubmit': 'Resubmitted',
  'submission.claim': 'Review taken up',
  'submission.release': 'Review released',
  'submission.waive': 'Finding waived',
  'submission.remove_waiver': 'Waiver removed',
  'submission.approve': 'Approved',
  'submission.request_changes': SUBMISSION_STATE_SHORT.changes_requested,
  'submission.reject': 'Rejected',
  'submission.withdraw': 'Withdrawn',
  'submission.annotated': 'Finding annotated',
  'tube_stock.added': 'Stock size added',
  'tube_stock.changed': 'Stock size changed',
  'tube_stock.removed': 'Stock size removed',
  'tube_stock.common_added': 'Common stock sizes added back',
  'journal.stage_recorded': 'Build stage recorded',
  'journal.stage_changed': 'Build stage changed',
  'journal.stage_removed': 'Build stage removed',
  'journal.photos_added': 'Build journal photos added',
  'car.transfer_offered': 'Car offered to a new owner',
  'car.transfer_accepted': 'Car taken over',
  'car.transfer_declined': 'Car offer declined',
  'car.transfer_withdrawn': 'Car offer withdrawn',
  'car.transferred': 'Car moved by an admin',
};

/** `ruleset.version_published` → "Ruleset: version published" for actions without a label yet. */
export function actionLabel(action: string): string {
  const known = actionLabels[action];
  if (known) return known;
  const [area = '', ...rest] = action.split('.');
  const words = rest.join(' ').replace(/_/g, ' ');
  return `${area.charAt(0).toUpperCase()}${area.slice(1).replace(/_/g, ' ')}: ${words}`;
}

const text = (value: unknown): string => (typeof value === 'string' ? value : '');
const count = (value: unknown): number => (typeof value === 'number' && Number.isFinite(value) ? value : 0);
const plural = (n: number, one: string, many = `${one}s`) => `${n} ${n === 1 ? one : many}`;
const stageLabel = (value: unknown): string =>
  (JOURNAL_STAGE_LABELS[value as JournalStage] ?? text(value)).toLowerCase();

function listed(words: string[]): string {
  return words.length <= 1 ? (words[0] ?? '') : `${words.slice(0, -1).join(', ')} and ${words.at(-1)}`;
}
function roles(value: unknown): string {
  if (!Array.isArray(value)) return '';
  return listed(value.map((r) => roleLabels[r as Role] ?? String(r)));
}

export function actorName(entry: AuditEntry): string {
  return entry.actor ? entry.actor.displayName || entry.actor.email : 'System';
}

/** Builds the parts of one entry's sentence; each helper below adds a named thing as a link. */
class Sentence {
  readonly parts: SentencePart[] = [];
  constructor(private readonly clubId: string) {}

  say(...words: string[]): this {
    const joined = words.join('');
    if (joined) this.parts.push({ text: joined });
    return this;
  }

  /** Parts that are names (linked or not): the closing full stop never joins them. */
  private readonly names = new WeakSet<SentencePart>();

  private link(name: string, to: RouteLocationRaw | undefined, title?: string): this {
    const part = to ? { text: name, to, ...(title ? { title } : {}) } : { text: name };
    this.names.add(part);
    this.parts.push(part);
    return this;
  }

  /** A person: their row on the members page, else (no longer a member) their entries in this log. */
  person(ref: { id: string; name: string; open: boolean } | undefined, fallback = 'someone'): this {
    if (!ref) return this.say(fallback);
    if (ref.open)
      return this.link(
        ref.name,
        { name: 'club-members', params: { clubId: this.clubId }, hash: `#member-${ref.id}` },
        'Open on the members page',
      );
    if (!ref.id) return this.say(ref.name);
    return this.link(
      ref.name,
      { name: 'club-activity', params: { clubId: this.clubId }, query: { personId: ref.id } },
      'Everything logged about this person',
    );
  }

  actor(entry: AuditEntry): this {
    return entry.actor
      ? this.person({ id: entry.actor.id, name: actorName(entry), open: entry.actor.open })
      : this.say('The system');
  }

  /** A car: its page for its owner; for everyone else this log filtered by the car (only owners open car pages). */
  car(ref: AuditRefWire | undefined, fallback = 'a car'): this {
    if (!ref) return this.say(fallback);
    if (ref.open) return this.link(ref.name, { name: 'car', params: { carId: ref.id } }, 'Open the car');
    return this.link(
      ref.name,
      { name: 'club-activity', params: { clubId: this.clubId }, query: { carId: ref.id } },
      'Everything logged about this car',
    );
  }

  sheet(ref: AuditRefWire | undefined, fallback = 'a build sheet'): this {
    if (!ref) return this.say(fallback);
    return this.link(
      ref.name,
      ref.open ? { name: 'build-sheet', params: { sheetId: ref.id } } : undefined,
      'Open the build sheet',
    );
  }

  record(ref: AuditRefWire | undefined, fallback: unknown): this {
    if (!ref) return this.say(text(fallback) || 'a cage record');
    return this.link(
      ref.name,
      ref.open ? { name: 'cage-record', params: { recordId: ref.id } } : undefined,
      'Open the cage record',
    );
  }

  edition(ref: AuditRefWire | undefined): this {
    if (!ref) return this.say('a rulebook version');
    return this.link(
      ref.name,
      ref.open ? { name: 'rulebook-version', params: { versionId: ref.id } } : undefined,
      'Open this rulebook version',
    );
  }

  submission(entry: AuditEntry, words: string): this {
    const ref = entry.subjects.submission;
    return this.link(
      words,
      ref?.open ? { name: 'submission', params: { submissionId: ref.id } } : undefined,
      'Open the submission',
    );
  }

  stock(words: string): this {
    return this.link(words, { name: 'tube-stock', params: { clubId: this.clubId } }, 'Open the tube stock');
  }

  /** `: <note>` when the entry has one. */
  note(value: unknown): this {
    const n = text(value).trim();
    return n ? this.say(': ', n) : this;
  }

  end(): SentencePart[] {
    const last = this.parts.at(-1);
    if (last && !this.names.has(last)) {
      if (!/[.!?]$/.test(last.text)) last.text += '.';
    } else {
      this.parts.push({ text: '.' });
    }
    return this.parts;
  }
}

function invitationSentence(s: Sentence, entry: AuditEntry): void {
  const d = entry.details;
  const mail = entry.subjects.invitationMail;
  const as = roles(d.roles);
  if (mail?.status === 'sent') {
    s.actor(entry)
      .say(' e-mailed an invitation to ')
      .person(entry.subjects.person, text(d.email))
      .say(` to join as ${as}`);
    return;
  }
  s.actor(entry).say(' invited ').person(entry.subjects.person, text(d.email)).say(` as ${as}`);
  if (mail?.status === 'failed_permanently')
    s.say('; the invitation e-mail could not be delivered, so pass the link on another way');
  else if (mail) s.say('; the invitation e-mail is waiting in the outbox');
}

function stockLabel(value: unknown): string {
  return text((value as { label?: unknown } | undefined)?.label);
}

function recordSettings(d: Record<string, unknown>): string {
  const before = (d.before ?? {}) as { recordPrefix?: unknown; validityMonths?: unknown };
  const after = (d.after ?? {}) as { recordPrefix?: unknown; validityMonths?: unknown };
  const changes: string[] = [];
  if (before.recordPrefix !== after.recordPrefix)
    changes.push(`number prefix ${String(before.recordPrefix)} → ${String(after.recordPrefix)}`);
  if (before.validityMonths !== after.validityMonths)
    changes.push(`valid for ${String(before.validityMonths)} → ${String(after.validityMonths)} months`);
  return changes.length ? `: ${changes.join(', ')}` : '';
}

/** The words after the actor for a submission's event, with the car (and record) linked. */
function submissionSentence(s: Sentence, entry: AuditEntry): boolean {
  const d = entry.details;
  const { car, record, sheet } = entry.subjects;
  const verb = entry.action.slice('submission.'.length);
  switch (verb) {
    case 'submit':
      s.actor(entry).say(' sent ').car(car).say(' for review');
      if (sheet) s.say(', build sheet ').sheet(sheet);
      return true;
    case 'resubmit':
      if (d.from === null || d.from === undefined) {
        s.actor(entry).say(' resubmitted ').car(car).say(' for review after the changes asked');
        if (sheet) s.say(', build sheet ').sheet(sheet);
        if (text(d.returnedToName))
          s.say('; it went back to ')
            .person({ id: text(d.returnedToId), name: text(d.returnedToName), open: !!text(d.returnedToId) })
            .say(', who asked for them');
      } else {
        s.actor(entry)
          .say(' answered the changes asked on ')
          .car(car)
          .say(' with a ')
          .submission(entry, 'resubmission');
      }
      return true;
    case 'claim':
      s.actor(entry).say(' took up the review of ').car(car);
      return true;
    case 'release':
      if (d.from === 'changes_requested')
        s.actor(entry).say(' let any steward take the resubmission of ').car(car).note(d.note);
      else s.actor(entry).say(' put the review of ').car(car).say(' back in the queue').note(d.note);
      return true;
    case 'waive':
      s.actor(entry)
        .say(' waived a finding on ')
        .car(car)
        .note(text(d.note).replace(/^Waived \S+: /, ''));
      return true;
    case 'remove_waiver':
      s.actor(entry).say(' removed a waiver on ').car(car);
      return true;
    case 'approve':
      s.actor(entry).say(' approved ').car(car);
      if (record) s.say(', record ').record(record, d.recordNumber);
      return true;
    case 'request_changes':
      s.actor(entry).say(' asked for changes on ').car(car).note(d.note);
      return true;
    case 'reject':
      s.actor(entry).say(' rejected ').car(car).note(d.note);
      return true;
    case 'withdraw':
      s.actor(entry).say(' withdrew ').car(car).say(' from review').note(d.note);
      return true;
    case 'annotated':
      s.actor(entry)
        .say(' added a note to a finding of ')
        .car(car)
        .say(' in its ')
        .submission(entry, 'submission');
      return true;
    default:
      return false;
  }
}

/** Everything the entry names, for actions this screen has no sentence for. */
function genericSentence(s: Sentence, entry: AuditEntry): void {
  const { person, car, sheet, record, edition } = entry.subjects;
  s.actor(entry).say(': ', actionLabel(entry.action).replace(': ', ' ').toLowerCase());
  const named: ((x: Sentence) => Sentence)[] = [];
  if (person) named.push((x) => x.person(person));
  if (car) named.push((x) => x.car(car));
  if (sheet) named.push((x) => x.sheet(sheet));
  if (record) named.push((x) => x.record(record, undefined));
  if (edition) named.push((x) => x.edition(edition));
  named.forEach((add, i) => add(s.say(i === 0 ? ' (' : ', ')));
  if (named.length) s.say(')');
}

/** The sentence of one entry of the log of club `clubId`. */
export function auditSentence(entry: AuditEntry, clubId: string): SentencePart[] {
  const s = new Sentence(clubId);
  const d = entry.details;
  const { person, car, sheet, record, edition } = entry.subjects;
  if (entry.action.startsWith('submission.') && submissionSentence(s, entry)) return s.end();
  switch (entry.action) {
    case 'membership.added':
      if (d.invited) invitationSentence(s, entry);
      else
        s.actor(entry)
          .say(' added ')
          .person(person, text(d.email))
          .say(` as ${roles(d.roles)}`);
      break;
    case 'membership.roles_changed':
      s.actor(entry)
        .say(' changed the roles of ')
        .person(person, text(d.email))
        .say(` from ${roles(d.before)} to ${roles(d.after)}`);
      break;
    case 'membership.removed':
      s.actor(entry)
        .say(' removed ')
        .person(person, text(d.email))
        .say(` (${roles(d.roles)}) from the club`);
      break;
    case 'invitation.accepted':
      s.actor(entry).say(` accepted the invitation and joined as ${roles(d.roles)}`);
      break;
    case 'ruleset.rulebook_created':
      s.actor(entry)
        .say(' created a new rulebook, ')
        .edition(edition)
        .say(d.fromFile ? ', from a ruleset file' : '');
      break;
    case 'ruleset.draft_started':
      s.actor(entry)
        .say(' started a draft, ')
        .edition(edition)
        .say(typeof d.copiedFrom === 'number' ? `, copied from version ${d.copiedFrom}` : '');
      break;
    case 'ruleset.draft_saved':
      s.actor(entry).say(' saved the draft ').edition(edition);
      break;
    case 'ruleset.imported':
      s.actor(entry)
        .say(' imported a ruleset file into ')
        .edition(edition)
        .say(typeof d.requirementCount === 'number' ? ` (${plural(d.requirementCount, 'requirement')})` : '');
      break;
    case 'ruleset.draft_deleted':
      s.actor(entry).say(' deleted the draft ').edition(edition);
      break;
    case 'ruleset.published':
      s.actor(entry).say(' put ').edition(edition).say(' in force');
      if (text(d.effectiveDate)) s.say(` from ${text(d.effectiveDate)}`);
      if (typeof d.supersededVersion === 'number') s.say(`, replacing version ${d.supersededVersion}`);
      break;
    case 'ruleset.scheduled':
      s.actor(entry).say(' scheduled ').edition(edition);
      if (text(d.effectiveDate)) s.say(` to come into force on ${text(d.effectiveDate)}`);
      break;
    case 'ruleset.in_force': {
      const replaced = Array.isArray(d.supersededVersions) ? d.supersededVersions.filter((n): n is number => typeof n === 'number') : [];
      s.say('On its date, ').edition(edition).say(' came into force');
      if (replaced.length) s.say(`, replacing version ${listed(replaced.map(String))}`);
      break;
    }
    case 'ruleset.retired':
      s.actor(entry).say(' withdrew ').edition(edition);
      break;
    case 'ruleset.recheck_completed': {
      s.say('Re-check after publishing ')
        .edition(edition)
        .say(
          `: ${plural(count(d.checked), 'build sheet')} checked, ${count(d.changed)} changed verdict, ${plural(count(d.mailed), 'builder')} e-mailed`,
        );
      if (count(d.failed) > 0) s.say(`, ${count(d.failed)} could not be checked`);
      break;
    }
    case 'cage_record.issued':
      s.actor(entry).say(' issued cage record ').record(record, d.number).say(' for ').car(car);
      break;
    case 'cage_record.revoked':
      s.actor(entry)
        .say(' revoked cage record ')
        .record(record, d.number)
        .say(' of ')
        .car(car)
        .note(d.reason);
      break;
    case 'cage_record.inspected': {
      s.actor(entry).say(' inspected ').car(car).say(' at the track, record ').record(record, d.number).say(`, seal ${text(d.sealNumber)}`);
      const readings = count(d.readings);
      const low = count(d.belowMinimum);
      s.say(readings ? `: ${plural(readings, 'wall reading')}${low ? `, ${low} under the rulebook’s minimum` : ''}` : ', no wall readings');
      break;
    }
    case 'cage_record.expiry_reminded':
      s.say('The builder of ').car(car).say(' was e-mailed that cage record ').record(record, d.number).say(
        // The club's date (entries from before it was stored give the instant in this browser's zone).
        typeof d.expiresOn === 'string' && isIsoDate(d.expiresOn)
          ? ` expires on ${formatIsoDate(d.expiresOn)}`
          : typeof d.expiresAt === 'string' ? ` expires on ${new Date(d.expiresAt).toLocaleDateString(undefined, { dateStyle: 'medium' })}` : ' expires soon',
      );
      break;
    case 'club.record_settings_changed':
      s.actor(entry).say(` changed the cage record settings${recordSettings(d)}`);
      break;
    case 'club.settings_changed': {
      const zone = (d.timeZone ?? {}) as { from?: unknown; to?: unknown };
      s.actor(entry).say(` changed the club's time zone from ${text(zone.from)} to ${text(zone.to)}`);
      break;
    }
    case 'tube_stock.added':
      s.actor(entry)
        .say(` added ${text(d.label)} to the `)
        .stock('tube stock');
      break;
    case 'tube_stock.changed': {
      const before = stockLabel(d.before);
      const after = stockLabel(d.after);
      s.actor(entry)
        .say(before === after ? ` changed ${after} in the ` : ` changed ${before} to ${after} in the `)
        .stock('tube stock');
      break;
    }
    case 'tube_stock.removed':
      s.actor(entry)
        .say(` removed ${text(d.label)} from the `)
        .stock('tube stock');
      break;
    case 'tube_stock.common_added':
      s.actor(entry)
        .say(` added ${plural(count(d.added), 'common size')} back to the `)
        .stock('tube stock');
      break;
    case 'journal.stage_recorded':
      s.actor(entry)
        .say(` recorded the ${stageLabel(d.stage)} stage of `)
        .sheet(sheet, text(d.sheetName) || 'a build sheet');
      if (car) s.say(' (').car(car).say(')');
      if (text(d.happenedOn)) s.say(`, on ${text(d.happenedOn)}`);
      break;
    case 'journal.stage_changed':
      s.actor(entry)
        .say(` changed the ${stageLabel(d.stage)} stage of `)
        .sheet(sheet, text(d.sheetName) || 'a build sheet');
      break;
    case 'journal.stage_removed':
      s.actor(entry)
        .say(` removed the ${stageLabel(d.stage)} stage of `)
        .sheet(sheet, text(d.sheetName) || 'a build sheet');
      if (text(d.happenedOn)) s.say(` (${text(d.happenedOn)})`);
      break;
    case 'car.transfer_offered':
      s.actor(entry).say(' offered ').car(car).say(' to ').person(person, text(d.otherName));
      break;
    case 'car.transfer_accepted':
      s.actor(entry).say(' took over ').car(car).say(' from ').person(person, text(d.otherName)).say(', with its build sheets and cage records');
      break;
    case 'car.transfer_declined':
      s.actor(entry).say(' declined the offer of ').car(car).say(' from ').person(person, text(d.otherName));
      break;
    case 'car.transfer_withdrawn':
      s.actor(entry).say(' withdrew the offer of ').car(car).say(' to ').person(person, text(d.otherName));
      break;
    case 'car.transferred':
      s.actor(entry)
        .say(' moved ')
        .car(car)
        .say(' from ')
        .person(text(d.fromUserId) ? { id: text(d.fromUserId), name: text(d.fromName), open: false } : undefined, text(d.fromName) || 'its owner')
        .say(' to ')
        .person(person, text(d.otherName));
      break;
    case 'journal.photos_added':
      s.actor(entry)
        .say(` added ${plural(count(d.count), 'photo')} at the ${stageLabel(d.stage)} stage of `)
        .sheet(sheet, text(d.sheetName) || 'a build sheet');
      break;
    default:
      genericSentence(s, entry);
  }
  return s.end();
}

/** The sentence as plain text (for tests, titles and screen readers that want one string). */
export function auditSentenceText(entry: AuditEntry, clubId: string): string {
  return auditSentence(entry, clubId)
    .map((p) => p.text)
    .join('');
}
