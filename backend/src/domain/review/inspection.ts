// Track inspections of a caged car, on its cage record: the expiry flag of a record, the least wall
// the record's rulebook asks of each member (read from the approved check's findings), and the checks
// a steward's readings must pass. Pure: the service loads the rows and stores what this returns.
import type { CheckReport } from '../../contracts/report.js';
import { EXPIRY_NOTICE_DAYS } from '../../contracts/record-words.js';
import { FIELD_RANGES, inRange, rangeMessageBothSystems } from '../field-ranges.js';
import type { RecordStatus } from './cage-record.js';

const DAY_MS = 86_400_000;

/** Whole days from `now` to `expiresAt`, rounded down (negative once expired). */
export function daysLeft(expiresAt: Date, now: Date): number {
  return Math.floor((expiresAt.getTime() - now.getTime()) / DAY_MS);
}

/** A valid record expiring within EXPIRY_NOTICE_DAYS (30 days to the millisecond counts). */
export function expiresSoon(status: RecordStatus, expiresAt: Date, now: Date): boolean {
  return status === 'valid' && expiresAt.getTime() - now.getTime() <= EXPIRY_NOTICE_DAYS * DAY_MS;
}

// Facts whose limit is the rulebook's limit for a measured wall (its tolerance for readings included).
const READING_FACTS = new Set(['member.minUltrasonicWallMm', 'member.minMeasuredWallMm']);

/**
 * The least wall the rulebook asks of each member, from the approved check's mandatory findings: the
 * rulebook's limit for an ultrasonic or measured reading where it states one, else the least wall of
 * the tube it matched. Several findings about one member: the strictest. Members it names no wall
 * for are absent.
 */
export function memberMinimumWalls(report: Pick<CheckReport, 'findings'>): Map<string, number> {
  const reading = new Map<string, number>();
  const nominal = new Map<string, number>();
  for (const f of report.findings) {
    if (!f.member || f.severity !== 'mandatory') continue;
    for (const r of f.required) {
      if (r.operator !== 'atLeast' || typeof r.value !== 'number' || !Number.isFinite(r.value)) continue;
      const into = READING_FACTS.has(r.fact) ? reading : r.fact === 'member.wallMm' ? nominal : null;
      if (!into) continue;
      into.set(f.member.id, Math.max(into.get(f.member.id) ?? 0, r.value));
    }
  }
  const out = new Map(nominal);
  for (const [id, v] of reading) out.set(id, v);
  return out;
}

/** Allowing for the float noise of a unit conversion (0.065 in = 1.651 mm). */
export function isBelowMinimum(wallMm: number, minWallMm: number | null): boolean {
  return minWallMm !== null && wallMm < minWallMm - 1e-9;
}

export interface InspectionProblem {
  path: string;
  message: string;
}

/**
 * What is wrong with an inspection's readings and time, each at its path: a member the approved sheet
 * does not have, a member read twice, a wall outside the plausible range (a unit slip), a time in the
 * future or before the record was issued. Empty when it may be stored.
 */
export function inspectionProblems(
  input: { inspectedAt: Date; readings: readonly { memberId: string; wallMm: number }[] },
  context: { memberIds: ReadonlySet<string>; issuedAt: Date; now: Date },
): InspectionProblem[] {
  const problems: InspectionProblem[] = [];
  // A few minutes of slack: the steward's device clock may run a little ahead of the server's.
  if (input.inspectedAt.getTime() > context.now.getTime() + 5 * 60_000)
    problems.push({ path: 'inspectedAt', message: 'An inspection cannot be in the future.' });
  // A minute's slack: a time typed to the minute, in the minute the record was issued, is not before it.
  if (input.inspectedAt.getTime() < context.issuedAt.getTime() - 60_000)
    problems.push({ path: 'inspectedAt', message: 'An inspection on this record cannot be before the record was issued.' });
  const range = FIELD_RANGES['members.*.wallReadings.*.wallMm'];
  const seen = new Set<string>();
  input.readings.forEach((r, i) => {
    if (!context.memberIds.has(r.memberId)) problems.push({ path: `readings.${i}.memberId`, message: 'The approved build sheet has no such member.' });
    else if (seen.has(r.memberId)) problems.push({ path: `readings.${i}.memberId`, message: 'This member already has a reading in this inspection.' });
    seen.add(r.memberId);
    if (!inRange(r.wallMm, range)) problems.push({ path: `readings.${i}.wallMm`, message: rangeMessageBothSystems(range) });
  });
  return problems;
}
