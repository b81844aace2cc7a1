// The one map from a member's verdict to how the drawing marks it: line pattern, symbol, colour and
// words. The SVG views, the 3D view, the legend and the PDF all read it, so a fail looks the same
// everywhere, and colour is never the only cue (each verdict also has its own pattern and symbol).
import type { Finding } from '../../contracts/report.js';
import { findingKey } from '../review/waivers.js';
import { FINDING_VERDICT_WORDS } from '../../contracts/verdict-words.js';

export const MARK_VERDICTS = ['fail', 'needs_information', 'waived', 'pass', 'unchecked'] as const;
export type MarkVerdict = (typeof MARK_VERDICTS)[number];

export type MarkSymbol = 'cross' | 'question' | 'waived' | 'tick' | 'none';

export interface VerdictMark {
  verdict: MarkVerdict;
  /** Words for the legend and the hover text. */
  label: string;
  /** Strong colour (centreline, symbol, text), at least 4.5:1 on white. */
  colour: string;
  /** Light colour the tube body is filled with. */
  tint: string;
  /**
   * Dash pattern of the centreline drawn along the tube, in multiples of the tube's OD, so the
   * pattern reads the same on a 25 mm bar and a 50 mm hoop; empty is a solid line.
   */
  dashPerOd: readonly number[];
  symbol: MarkSymbol;
  /** Lower is worse: the worst finding of a member decides its mark. */
  rank: number;
}

export const VERDICT_MARKS: Readonly<Record<MarkVerdict, VerdictMark>> = {
  fail: { verdict: 'fail', label: 'Fails a rule', colour: '#a3261d', tint: '#f3c9c4', dashPerOd: [1.6, 0.8], symbol: 'cross', rank: 0 },
  needs_information: {
    verdict: 'needs_information', label: FINDING_VERDICT_WORDS.needs_information, colour: '#7a4f00', tint: '#f5e0b3', dashPerOd: [0.15, 0.55], symbol: 'question', rank: 1,
  },
  waived: { verdict: 'waived', label: 'Waived by a steward', colour: '#2f4f9a', tint: '#cfd9f0', dashPerOd: [1.6, 0.5, 0.15, 0.5], symbol: 'waived', rank: 2 },
  pass: { verdict: 'pass', label: 'Passes', colour: '#1f6f43', tint: '#c5e4d0', dashPerOd: [], symbol: 'tick', rank: 3 },
  unchecked: { verdict: 'unchecked', label: 'No rule checks it', colour: '#56616b', tint: '#dde1e5', dashPerOd: [], symbol: 'none', rank: 4 },
};

/** Marks in legend order, worst first. */
export const LEGEND_MARKS: readonly VerdictMark[] = MARK_VERDICTS.map((v) => VERDICT_MARKS[v]);

type MarkedFinding = Pick<Finding, 'requirementId' | 'verdict' | 'severity' | 'title' | 'reason' | 'citation' | 'member' | 'plate' | 'measured'>;

/**
 * A finding's own mark. Only mandatory findings can fail or need a measurement: an advisory finding
 * that is not met shows with the member's findings but does not mark the tube as failing. A waived
 * finding shows as waived, never as a pass.
 */
export function findingMark(f: MarkedFinding, waivedKeys: ReadonlySet<string> = new Set()): MarkVerdict {
  if (f.verdict === 'not_applicable') return 'unchecked';
  if (f.verdict === 'pass' || f.severity === 'advisory') return 'pass';
  return waivedKeys.has(findingKey(f)) ? 'waived' : f.verdict;
}

export function worseOf(a: MarkVerdict, b: MarkVerdict): MarkVerdict {
  return VERDICT_MARKS[a].rank <= VERDICT_MARKS[b].rank ? a : b;
}

export interface MemberMark<F extends MarkedFinding = MarkedFinding> {
  verdict: MarkVerdict;
  /** The member's findings that apply, worst first. */
  findings: F[];
  /** "§ 4.2 Rear brace angle: …" of the worst finding when it does not pass. */
  worstRule: string | null;
}

/**
 * Each member's mark from its worst finding; a member no finding is about is "unchecked". A finding
 * about the whole car (the brace angle, say) counts for the members `attribute` names: the drawing
 * passes the member the model read that value from, so a steep backstay is the tube that shows it.
 */
export function memberMarks<F extends MarkedFinding>(
  findings: readonly F[],
  waivedKeys: ReadonlySet<string> = new Set(),
  attribute: (f: F) => readonly string[] = () => [],
): Map<string, MemberMark<F>> {
  const out = new Map<string, MemberMark<F>>();
  for (const f of findings) {
    const ids = f.member ? [f.member.id] : attribute(f);
    if (ids.length === 0) continue;
    const verdict = findingMark(f, waivedKeys);
    if (verdict === 'unchecked') continue;
    for (const id of ids) {
      const entry = out.get(id) ?? { verdict: 'unchecked' as MarkVerdict, findings: [], worstRule: null };
      entry.verdict = worseOf(entry.verdict, verdict);
      entry.findings.push(f);
      out.set(id, entry);
    }
  }
  for (const entry of out.values()) {
    entry.findings.sort((a, b) => VERDICT_MARKS[findingMark(a, waivedKeys)].rank - VERDICT_MARKS[findingMark(b, waivedKeys)].rank);
    const worst = entry.findings[0];
    entry.worstRule = worst && entry.verdict !== 'pass' ? `§ ${worst.citation.section} ${worst.title}: ${worst.reason}` : null;
  }
  return out;
}

/** The dash pattern for a tube of `odMm`, in millimetres (what SVG's stroke-dasharray takes). */
export function dashArrayMm(mark: VerdictMark, odMm: number): number[] {
  return mark.dashPerOd.map((d) => Math.round(d * odMm * 10) / 10);
}
