// Waivers: a steward's written acceptance of a finding that did not pass. A waived mandatory
// finding no longer blocks approval, but it stays visible as "waived", never as a pass.
import type { Finding, FindingVerdict } from '../../contracts/report.js';

/** The parts of a report finding the review needs. */
export type ReviewFinding = Pick<Finding, 'requirementId' | 'verdict' | 'severity'> & {
  member?: { id: string } | null;
  plate?: { id: string } | null;
};

export interface Waiver {
  /** findingKey() of the finding it accepts. */
  findingKey: string;
  reason: string;
  stewardId: string;
}

/** One key per finding: requirement and subject (member, plate or the vehicle). */
export function findingKey(f: ReviewFinding): string {
  const subject = f.member ? `member:${f.member.id}` : f.plate ? `plate:${f.plate.id}` : 'vehicle';
  return `${f.requirementId}@${subject}`;
}

/** Findings a steward may waive: ones that failed or that lack a measurement. */
export const WAIVABLE_VERDICTS: readonly FindingVerdict[] = ['fail', 'needs_information'];
export { WAIVER_REASON_MAX, WAIVER_REASON_MIN } from '../../contracts/review-limits.js';

export type ShownVerdict = FindingVerdict | 'waived';
export type OverallReviewVerdict = 'pass' | 'pass_with_waivers' | 'fail' | 'needs_information';

export interface VerdictWithWaivers {
  verdict: OverallReviewVerdict;
  /** Each finding with the verdict to show: a waived finding shows as waived. */
  findings: {
    key: string;
    verdict: FindingVerdict;
    shown: ShownVerdict;
    severity: Finding['severity'];
    waiver?: Waiver;
  }[];
  /** Mandatory findings still blocking: failed, or lacking information, and not waived. */
  blocking: string[];
  waivedCount: number;
  /** Waivers whose finding is gone or now passes (a later check); they count for nothing. */
  unusedWaivers: Waiver[];
}

export function overallWithWaivers(
  findings: readonly ReviewFinding[],
  waivers: readonly Waiver[],
): VerdictWithWaivers {
  const byKey = new Map(waivers.map((w) => [w.findingKey, w]));
  const used = new Set<string>();
  const rows = findings.map((f) => {
    const key = findingKey(f);
    const waiver = WAIVABLE_VERDICTS.includes(f.verdict) ? byKey.get(key) : undefined;
    if (waiver) used.add(key);
    return {
      key,
      verdict: f.verdict,
      shown: waiver ? ('waived' as const) : f.verdict,
      severity: f.severity,
      ...(waiver ? { waiver } : {}),
    };
  });
  const mandatory = rows.filter((r) => r.severity === 'mandatory');
  const blockingFail = mandatory.filter((r) => r.shown === 'fail').map((r) => r.key);
  const blockingInfo = mandatory.filter((r) => r.shown === 'needs_information').map((r) => r.key);
  const waivedMandatory = mandatory.some((r) => r.shown === 'waived');
  const verdict: OverallReviewVerdict =
    blockingFail.length > 0
      ? 'fail'
      : blockingInfo.length > 0
        ? 'needs_information'
        : waivedMandatory
          ? 'pass_with_waivers'
          : 'pass';
  return {
    verdict,
    findings: rows,
    blocking: [...blockingFail, ...blockingInfo],
    waivedCount: rows.filter((r) => r.shown === 'waived').length,
    unusedWaivers: waivers.filter((w) => !used.has(w.findingKey)),
  };
}
