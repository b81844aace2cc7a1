// A finding's reason as structured parts, written as a sentence when it is read, in the reader's
// units. Check runs are immutable and read by people in either unit system (a metric steward reads
// an imperial builder's run), so a run stores the parts: text, and typed holes holding canonical
// values (a quantity, a comparison, a tube size, a weight band). Runs stored before parts existed
// keep their stored sentence (`findingReason` falls back to it).
//
// Comparisons never round a failing value onto its limit: when the usual decimals would print the
// two alike ("2.50 mm is under 2.50 mm"), more digits are shown, with the shortfall
// ("2.496 mm: 0.004 mm under 2.50 mm"). Ratios likewise (0.8995 is not "0.90").
import { formatQuantity, fromCanonical, type Dimension, type UnitSystem } from '../units.js';

export type ComparisonOp = 'atLeast' | 'atMost' | 'above' | 'below' | 'equals' | 'notEquals';

/** One part of a reason; the wire schema is contracts/report.ts `reasonSegmentSchema`. */
export type ReasonSegment =
  | string
  | { q: number; d: Dimension }
  /** A measured value against its limit; `met` says which way it went. */
  | { cmp: { value: number; limit: number; d: Dimension; op: ComparisonOp; met: boolean; form?: 'gap' } }
  /** A tube size, OD × wall. */
  | { tube: { odMm: number; wallMm: number } }
  /** A weight band by its bounds (kg): "over 680 kg up to 998 kg". */
  | { band: { aboveKg: number | null; upToKg: number | null } }
  /** A phrase written by another module in each system (a reference to another fact's value). */
  | { bySystem: { metric: string; imperial: string } };


export const q = (value: number, d: Dimension): ReasonSegment => ({ q: value, d });
export const cmp = (value: number, limit: number, d: Dimension, op: ComparisonOp, met: boolean): ReasonSegment => ({ cmp: { value, limit, d, op, met } });
/** A shortfall said as "0.065 in is under 0.083 in" (or "2.496 mm is 0.004 mm under 2.50 mm"). */
export const gap = (value: number, limit: number, d: Dimension): ReasonSegment => ({ cmp: { value, limit, d, op: 'atLeast', met: false, form: 'gap' } });
export const tube = (odMm: number, wallMm: number): ReasonSegment => ({ tube: { odMm, wallMm } });
export const band = (aboveKg: number | null, upToKg: number | null): ReasonSegment => ({ band: { aboveKg, upToKg } });
export const bySystem = (write: (system: UnitSystem) => string): ReasonSegment => {
  const metric = write('metric');
  const imperial = write('imperial');
  return metric === imperial ? metric : { bySystem: { metric, imperial } };
};

/** Adjacent text merged, so a stored run carries as few parts as it needs. */
export function compact(parts: readonly ReasonSegment[]): ReasonSegment[] {
  const out: ReasonSegment[] = [];
  for (const p of parts) {
    if (typeof p === 'string' && typeof out[out.length - 1] === 'string') out[out.length - 1] = `${out[out.length - 1] as string}${p}`;
    else if (p !== '') out.push(p);
  }
  return out;
}

/** The sentence in one unit system. */
export function renderReason(parts: readonly ReasonSegment[], system: UnitSystem): string {
  return parts.map((p) => renderSegment(p, system)).join('');
}

/** The reason of a stored finding in the reader's units; a finding stored without parts keeps its text. */
export function findingReason(finding: { reason: string; reasonParts?: readonly ReasonSegment[] | undefined }, system: UnitSystem): string {
  return finding.reasonParts && finding.reasonParts.length > 0 ? renderReason(finding.reasonParts, system) : finding.reason;
}

function renderSegment(p: ReasonSegment, system: UnitSystem): string {
  if (typeof p === 'string') return p;
  if ('q' in p) return formatQuantity(p.q, p.d, system).text;
  if ('cmp' in p) return p.cmp.form === 'gap' ? gapText(p.cmp.value, p.cmp.limit, p.cmp.d, system) : comparisonText(p.cmp.value, p.cmp.limit, p.cmp.d, p.cmp.op, p.cmp.met, system);
  if ('tube' in p) return tubeSizeText(p.tube.odMm, p.tube.wallMm, system);
  if ('band' in p) return bandText(p.band.aboveKg, p.band.upToKg, system);
  return p.bySystem[system];
}

const OP_WORDS: Record<ComparisonOp, string> = { atLeast: 'at least', atMost: 'at most', above: 'more than', below: 'less than', equals: 'equal to', notEquals: 'not' };

/**
 * A value and its limit, each with the digits that tell them apart. Failing: "2.496 mm: 0.004 mm
 * under 2.50 mm" once the usual decimals would print them alike, else "2.41 mm (required at least
 * 2.50 mm)". Passing: "2.54 mm (at least 2.41 mm)".
 */
export function comparisonText(value: number, limit: number, d: Dimension, op: ComparisonOp, met: boolean, system: UnitSystem): string {
  const usual = formatQuantity(value, d, system);
  const limitText = formatQuantity(limit, d, system).text;
  if (met) return `${usual.text} (${OP_WORDS[op]} ${limitText})`;
  const { valueText, alike } = distinguished(value, limit, d, system);
  if (!alike) return `${valueText} (required ${OP_WORDS[op]} ${limitText})`;
  const gap = Math.abs(value - limit);
  const side = value < limit ? 'under' : value > limit ? 'over' : 'at';
  return side === 'at' ? `${valueText} (required ${OP_WORDS[op]} ${limitText})` : `${valueText}: ${differenceText(gap, d, system)} ${side} ${limitText}`;
}

export function gapText(value: number, limit: number, d: Dimension, system: UnitSystem): string {
  const { valueText, alike } = distinguished(value, limit, d, system);
  const limitText = formatQuantity(limit, d, system).text;
  const side = value > limit ? 'over' : 'under';
  return alike ? `${valueText} is ${differenceText(Math.abs(value - limit), d, system)} ${side} ${limitText}` : `${valueText} is ${side} ${limitText}`;
}

/** The value with enough decimals that it does not print as its limit. */
export function distinguished(value: number, limit: number, d: Dimension, system: UnitSystem): { valueText: string; alike: boolean } {
  const usual = formatQuantity(value, d, system);
  const limitText = formatQuantity(limit, d, system, { unit: usual.unit, decimals: usual.decimals }).text;
  if (usual.text !== limitText || value === limit) return { valueText: usual.text, alike: false };
  for (let extra = 1; extra <= 6; extra += 1) {
    const more = formatQuantity(value, d, system, { unit: usual.unit, decimals: usual.decimals + extra });
    if (more.text !== formatQuantity(limit, d, system, { unit: usual.unit, decimals: usual.decimals + extra }).text) return { valueText: more.text, alike: true };
  }
  return { valueText: usual.text, alike: true };
}

/** A small difference with its first significant digit shown: 0.004 mm, 0.0005. */
function differenceText(gap: number, d: Dimension, system: UnitSystem): string {
  const usual = formatQuantity(gap, d, system);
  let decimals = usual.decimals;
  // Enough digits that the shown difference is the difference (0.0005, not 0.001 or 0.000).
  const raw = fromCanonical(gap, usual.unit);
  while (decimals < 8 && Math.abs(Number(raw.toFixed(decimals)) - raw) > 0.05 * raw) decimals += 1;
  return formatQuantity(gap, d, system, { unit: usual.unit, decimals }).text;
}

/** OD × wall as the trade writes it: "1.750 × 0.095 in", "45 × 2.5 mm". */
export function tubeSizeText(odMm: number, wallMm: number, system: UnitSystem): string {
  if (system === 'imperial') return `${(odMm / 25.4).toFixed(3)} × ${(wallMm / 25.4).toFixed(3)} in`;
  const mm = (v: number) => String(Number(v.toFixed(2)));
  return `${mm(odMm)} × ${mm(wallMm)} mm`;
}

/** A weight with thousands grouped, as rulebooks print weights: 1,500 lb. */
export function groupedWeight(kg: number, system: UnitSystem): string {
  const f = formatQuantity(kg, 'mass', system);
  const [whole, frac] = f.value.toFixed(f.decimals).split('.') as [string, string | undefined];
  return `${whole.replace(/\B(?=(\d{3})+(?!\d))/g, ',')}${frac ? `.${frac}` : ''} ${f.unitLabel}`;
}

export function bandText(aboveKg: number | null, upToKg: number | null, system: UnitSystem): string {
  const m = (kg: number) => groupedWeight(kg, system);
  if (aboveKg === null && upToKg === null) return 'all weights';
  if (aboveKg === null) return `up to ${m(upToKg!)}`;
  if (upToKg === null) return `over ${m(aboveKg)}`;
  return `over ${m(aboveKg)} up to ${m(upToKg)}`;
}
