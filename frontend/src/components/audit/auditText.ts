// How activity log entries read on screen: a short name for each action and one line saying what
// changed. Unknown actions (added by later features) still read sensibly from their raw name.
import type { AuditEntry } from '@/api/audit';
import { roleLabels } from '@/components/common/roles';
import type { Role } from '@/api/types';
import { JOURNAL_STAGE_LABELS, type JournalStage } from '@/api/journal';
import { formatIsoDate } from '@domain/dates';

export const actionLabels: Record<string, string> = {
  'membership.added': 'Member added',
  'membership.roles_changed': 'Roles changed',
  'membership.removed': 'Member removed',
  'invitation.accepted': 'Invitation accepted',
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
  'club.record_settings_changed': 'Cage record settings changed',
  'club.settings_changed': 'Club time zone changed',
  'submission.annotated': 'Finding annotated',
  'tube_stock.added': 'Stock size added',
  'tube_stock.changed': 'Stock size changed',
  'tube_stock.removed': 'Stock size removed',
  'tube_stock.common_added': 'Common stock sizes added back',
  'journal.stage_recorded': 'Build stage recorded',
  'journal.stage_changed': 'Build stage changed',
  'journal.stage_removed': 'Build stage removed',
  'journal.photos_added': 'Build journal photos added',
};

/** `ruleset.version_published` → "Ruleset: version published" for actions without a label yet. */
export function actionLabel(action: string): string {
  const known = actionLabels[action];
  if (known) return known;
  const [area = '', ...rest] = action.split('.');
  const words = rest.join(' ').replace(/_/g, ' ');
  return `${area.charAt(0).toUpperCase()}${area.slice(1)}: ${words}`;
}

function roles(value: unknown): string {
  if (!Array.isArray(value)) return '';
  return value.map((r) => roleLabels[r as Role] ?? String(r)).join(', ');
}

const text = (value: unknown): string => (typeof value === 'string' ? value : '');
const stageLabel = (value: unknown): string => JOURNAL_STAGE_LABELS[value as JournalStage] ?? text(value);

export function auditSummary(entry: AuditEntry): string {
  const d = entry.details;
  switch (entry.action) {
    case 'membership.added':
      return `${text(d.email)} as ${roles(d.roles)}${d.invited ? ' (invitation sent)' : ''}`;
    case 'membership.roles_changed':
      return `${text(d.email)}: ${roles(d.before)} → ${roles(d.after)}`;
    case 'membership.removed':
      return `${text(d.email)} (was ${roles(d.roles)})`;
    case 'invitation.accepted':
      return `${text(d.email)} joined as ${roles(d.roles)}`;
    case 'tube_stock.added':
    case 'tube_stock.removed':
      return text(d.label);
    case 'tube_stock.changed': {
      const before = d.before as { label?: unknown } | undefined;
      const after = d.after as { label?: unknown } | undefined;
      return before?.label === after?.label ? text(after?.label) : `${text(before?.label)} → ${text(after?.label)}`;
    }
    case 'journal.stage_recorded':
    case 'journal.stage_removed':
      return `${text(d.sheetName)}: ${stageLabel(d.stage)} (${text(d.happenedOn)})`;
    case 'journal.stage_changed':
      return `${text(d.sheetName)}: ${stageLabel(d.stage)}`;
    case 'journal.photos_added':
      return `${text(d.sheetName)}: ${String(d.count)} photo${d.count === 1 ? '' : 's'} at ${stageLabel(d.stage)}`;
    case 'ruleset.published':
    case 'ruleset.scheduled':
    case 'ruleset.in_force':
      return `Version ${String(d.versionNumber)}, edition ${text(d.edition)}, from ${formatIsoDate(text(d.effectiveDate))}`;
    case 'club.settings_changed': {
      const zone = d.timeZone as { from?: unknown; to?: unknown } | undefined;
      return `${text(zone?.from)} → ${text(zone?.to)}`;
    }
    case 'tube_stock.common_added':
      return `${String(d.added)} size${d.added === 1 ? '' : 's'}`;
    default:
      return entry.entityId ? `${entry.entityType} ${entry.entityId}` : entry.entityType;
  }
}

export function actorName(entry: AuditEntry): string {
  return entry.actor ? entry.actor.displayName || entry.actor.email : 'System';
}
