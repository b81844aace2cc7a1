// Compiles the typed requirement templates (the rule kinds of template-kinds.ts) into
// json-rules-engine condition trees, converting values to canonical units once.
import type { Requirement, TubeTable } from '../../contracts/ruleset.js';
import { toCanonical } from '../units.js';
import { tubeSizeProblems } from '../tube.js';
import { isIsoDate } from '../dates.js';
import { MEMBER_KIND_LABELS, MEMBER_KIND_PLURAL_LABELS, SIDED_MEMBER_KINDS } from '../vocabulary.js';
import type { SideParam } from '../facts.js';
import { compileConditionTree, compileLeaf, resolveUnit, sideWords } from './conditions.js';
import type { CompileContext, EngineNode, Path, Problems } from './conditions.js';
import { ENGINE_FROM_LIMIT } from './operators.js';
import type { AlternativeMeta } from './types.js';
import { TEMPLATE_KINDS } from './template-kinds.js';
import { compileGradeFloor, compileProportional } from './limit-values.js';
import { GRADE_FACTS, isProportional } from './limit-forms.js';
import { compileMemberMatch } from './member-match.js';
import { WALL_METHOD_FACTS } from '../facts.js';
import { MEASURED_WALL_MAX_PERCENT } from './measured-wall.js';
import type { TemplateName, TemplateOf } from './template-kinds.js';
import type { StrengthMeasure } from '../../contracts/ruleset.js';
import { tubeSectionProperties } from '../tube.js';
import { MEASURE_WORDS } from '../strength-equivalence.js';

export interface CanonicalEquivalent {
  size: { odMm: number; wallMm: number };
  printedAs: { odMm: number; wallMm: number; label: string };
  note?: string;
}

/** The document's `strengthEquivalents`, in canonical units (compile.ts). */
export interface CanonicalStrengthPolicy {
  accept: boolean;
  measure: StrengthMeasure;
  listedYieldMpa?: number;
  minWallMm?: number;
}

export interface TemplateContext extends CompileContext {
  alternatives: Record<string, AlternativeMeta>;
  nextAlternative: () => string;
  acceptPrintedEquivalents: boolean;
  equivalents: readonly CanonicalEquivalent[];
  /** Set when the rulebook accepts equivalents by strength: each listed size gains one. */
  strength?: CanonicalStrengthPolicy;
}

export interface CompiledRequires {
  /** One node per weight band for tube tables; a single entry otherwise. */
  variants: { aboveKg: number | null; upToKg: number | null; bandLabel?: string; node: EngineNode }[];
}

/** Rewrites the engine-level path segments compileLeaf reports onto the template's own field names. */
function renamedProblems(problems: Problems, rename: Record<string, string>): Problems {
  return { add: (path, message) => problems.add(path.map((p) => (typeof p === 'string' && rename[p] ? rename[p] : p)), message) };
}

const sameSize = (a: { odMm: number; wallMm: number }, b: { odMm: number; wallMm: number }) =>
  Math.abs(a.odMm - b.odMm) < 1e-6 && Math.abs(a.wallMm - b.wallMm) < 1e-6;

export function sizeLabel(odMm: number, wallMm: number, system: 'imperial' | 'metric'): string {
  if (system === 'imperial') return `${(odMm / 25.4).toFixed(3)} × ${(wallMm / 25.4).toFixed(3)} in`;
  const f = (x: number) => String(Math.round(x * 100) / 100);
  return `${f(odMm)} × ${f(wallMm)} mm`;
}

export function lengthLabel(mm: number, system: 'imperial' | 'metric'): string {
  return system === 'imperial' ? `${(mm / 25.4).toFixed(3)} in` : `${Math.round(mm * 100) / 100} mm`;
}

/**
 * A tube table's `measuredWall`, resolved: the reading fact and the wall a reading needs for a
 * table wall. Undefined when the table has none; null when it is invalid (problems reported).
 */
function measuredWallRule(t: TubeTable, path: Path, ctx: TemplateContext): { fact: string; percent?: number; required: (wallMm: number) => number } | undefined | null {
  const mw = t.measuredWall;
  if (!mw) return undefined;
  const fact = WALL_METHOD_FACTS[mw.method];
  const tol = mw.tolerance;
  if (tol === undefined) return { fact, required: (w) => w };
  if ('percent' in tol) {
    if (tol.percent >= MEASURED_WALL_MAX_PERCENT) {
      ctx.problems.add([...path, 'measuredWall', 'tolerance', 'percent'], `A reading tolerance of ${tol.percent} % would accept a wall ${tol.percent >= 100 ? 'of nothing' : 'half as thick or thinner'}: it must be under ${MEASURED_WALL_MAX_PERCENT} %.`);
      return null;
    }
    return { fact, percent: tol.percent, required: (w) => w * (1 - tol.percent / 100) };
  }
  const unit = resolveUnit('length', tol.unit, [...path, 'measuredWall', 'tolerance', 'unit'], ctx);
  if (!unit) return null;
  const tolMm = toCanonical(tol.value, unit);
  return { fact, required: (w) => w - tolMm };
}

function compileTubeTable(t: TubeTable, path: Path, ctx: TemplateContext): CompiledRequires | undefined {
  let ok = true;
  const massUnit = resolveUnit('mass', t.weightUnit, [...path, 'weightUnit'], ctx);
  const wallAllowanceUnit = resolveUnit('length', t.allowances?.wallAllowance?.unit, [...path, 'allowances', 'wallAllowance', 'unit'], ctx);
  const thin = t.allowances?.thinWallWhenOdExceedsMinimum;
  const thinUnit = resolveUnit('length', thin?.unit, [...path, 'allowances', 'thinWallWhenOdExceedsMinimum', 'unit'], ctx);
  if (!massUnit || !wallAllowanceUnit || !thinUnit) return undefined;
  const wallAllowanceMm = t.allowances?.wallAllowance ? toCanonical(t.allowances.wallAllowance.value, wallAllowanceUnit) : 0;
  const reading = measuredWallRule(t, path, ctx);
  if (reading === null) return undefined;
  // The reading is compared with the table's wall less the rulebook's reading tolerance only: not
  // less the wall allowance (for nominal sizes) and without the measurement tolerance, which would
  // otherwise widen a limit the rulebook already states for readings (docs/rulesets.md).
  const readingLeaf = (wallMm: number, where: Path): { node: EngineNode; requiredMm: number; fact: string } | undefined => {
    if (!reading) return undefined;
    const requiredMm = reading.required(wallMm);
    if (reading.percent === undefined && requiredMm <= wallMm / 2) {
      ctx.problems.add([...path, 'measuredWall', 'tolerance', 'value'], `The tolerance leaves ${lengthLabel(requiredMm, ctx.system)} of a ${lengthLabel(wallMm, ctx.system)} wall: it must leave more than half of every wall in the table.`);
      ok = false;
      return undefined;
    }
    const node = compileLeaf({ fact: reading.fact, operator: 'greaterThanInclusive', value: requiredMm, unit: 'mm' }, where, { ...ctx, tolerance: {} });
    return node ? { node, requiredMm, fact: reading.fact } : undefined;
  };

  let previousUpTo: number | null = null;
  const variants: CompiledRequires['variants'] = [];
  t.bands.forEach((band, b) => {
    const bandPath = [...path, 'bands', b];
    const isLast = b === t.bands.length - 1;
    if (band.upTo === undefined && !isLast) {
      ctx.problems.add([...bandPath, 'upTo'], 'Every band but the last needs an upper weight ("upTo").');
      ok = false;
    }
    const upToKg = band.upTo === undefined ? null : toCanonical(band.upTo, massUnit);
    if (upToKg !== null && previousUpTo !== null && upToKg <= previousUpTo) {
      ctx.problems.add([...bandPath, 'upTo'], 'Bands must be in order of increasing weight.');
      ok = false;
    }
    const alternatives: EngineNode[] = [];
    band.rows.forEach((row, r) => {
      const rowPath = [...bandPath, 'rows', r];
      if (row.approvedBefore !== undefined && !isIsoDate(row.approvedBefore)) {
        ctx.problems.add([...rowPath, 'approvedBefore'], `"${row.approvedBefore}" is not a date: write it YYYY-MM-DD.`);
        ok = false;
        return;
      }
      const sizes: { odMm: number; wallMm: number; label?: string }[] = [];
      row.alternatives.forEach((alt, a) => {
        const altPath = [...rowPath, 'alternatives', a];
        const unit = resolveUnit('length', alt.unit, [...altPath, 'unit'], ctx);
        if (!unit) { ok = false; return; }
        const size = { odMm: toCanonical(alt.od, unit), wallMm: toCanonical(alt.wall, unit), label: alt.label };
        for (const p of tubeSizeProblems(size)) {
          ctx.problems.add([...altPath, p.field === 'odMm' ? 'od' : 'wall'], p.message);
          ok = false;
        }
        sizes.push(size);
      });
      if (!ok || sizes.length === 0) return;
      const restrictions = (): EngineNode[] => {
        const out: EngineNode[] = [];
        if (row.materials) {
          const leaf = compileLeaf({ fact: 'member.material', operator: 'in', value: row.materials }, [...rowPath, 'materials'], ctx);
          if (leaf) out.push(leaf);
        }
        if (row.processes) {
          const leaf = compileLeaf({ fact: 'member.process', operator: 'in', value: row.processes }, [...rowPath, 'processes'], ctx);
          if (leaf) out.push(leaf);
        }
        // A legacy row: unknown (so "needs information", never a pass) until the sheet gives the date.
        if (row.approvedBefore !== undefined) {
          const leaf = compileLeaf({ fact: 'cage.approvedOn', operator: 'lessThan', value: row.approvedBefore }, [...rowPath, 'approvedBefore'], ctx);
          if (leaf) out.push(leaf);
        }
        return out;
      };
      const sizeNode = (odMm: number, wallMm: number, meta: Omit<AlternativeMeta, 'materials' | 'processes' | 'requiredWallMm'>): EngineNode => {
        const name = ctx.nextAlternative();
        const od = compileLeaf({ fact: 'member.odMm', operator: 'greaterThanInclusive', value: odMm, unit: 'mm' }, rowPath, ctx);
        const wall = compileLeaf({ fact: 'member.wallMm', operator: 'greaterThanInclusive', value: Math.max(wallMm - wallAllowanceMm, 0), unit: 'mm' }, rowPath, ctx);
        const measured = readingLeaf(wallMm, [...path, 'measuredWall']);
        ctx.alternatives[name] = {
          ...meta, requiredWallMm: Math.max(wallMm - wallAllowanceMm, 0), ...(row.materials ? { materials: row.materials } : {}), ...(row.processes ? { processes: row.processes } : {}),
          ...(row.approvedBefore ? { approvedBefore: row.approvedBefore } : {}),
          ...(measured ? { requiredReadingMm: measured.requiredMm, readingFact: measured.fact } : {}),
        };
        return { all: [...restrictions(), od, wall, ...(measured ? [measured.node] : [])], name };
      };
      // Equivalents by strength come after everything the row lists, so a listed size that fits
      // is always the one named.
      const strengthNodes: EngineNode[] = [];
      const strength = ctx.strength;
      const strengthNode = (s: { odMm: number; wallMm: number }, label: string): EngineNode | undefined => {
        if (!strength?.accept) return undefined;
        const name = ctx.nextAlternative();
        const zMm3 = tubeSectionProperties(s).sectionModulusMm3;
        const required = strength.measure === 'section_modulus' ? zMm3 : zMm3 * strength.listedYieldMpa!;
        const leaf = strength.measure === 'section_modulus'
          ? compileLeaf({ fact: 'member.sectionModulusMm3', operator: 'greaterThanInclusive', value: required, unit: 'mm3' }, rowPath, ctx)
          : compileLeaf({ fact: 'member.bendingStrengthNmm', operator: 'greaterThanInclusive', value: required, unit: 'N*mm' }, rowPath, ctx);
        const wall = strength.minWallMm === undefined ? undefined : compileLeaf({ fact: 'member.wallMm', operator: 'greaterThanInclusive', value: strength.minWallMm, unit: 'mm' }, rowPath, ctx);
        // A table that reads wall readings holds an equivalent to them too: against its least wall, else the listed wall.
        const measured = readingLeaf(strength.minWallMm ?? s.wallMm, [...path, 'measuredWall']);
        if (!leaf) return undefined;
        ctx.alternatives[name] = {
          label: `equivalent by ${MEASURE_WORDS[strength.measure]} to ${label}`, odMm: s.odMm, wallMm: s.wallMm, requiredWallMm: strength.minWallMm ?? 0, source: 'strength_equivalent',
          ...(row.materials ? { materials: row.materials } : {}), ...(row.processes ? { processes: row.processes } : {}),
          ...(row.approvedBefore ? { approvedBefore: row.approvedBefore } : {}),
          ...(measured ? { requiredReadingMm: measured.requiredMm, readingFact: measured.fact } : {}),
          equivalence: {
            measure: strength.measure, listedLabel: label, requiredValue: required,
            ...(strength.listedYieldMpa !== undefined ? { listedYieldMpa: strength.listedYieldMpa } : {}),
            ...(strength.minWallMm !== undefined ? { minWallMm: strength.minWallMm } : {}),
          },
        };
        return { all: [...restrictions(), leaf, ...(wall ? [wall] : []), ...(measured ? [measured.node] : [])], name };
      };
      for (const s of sizes) {
        const label = s.label ?? sizeLabel(s.odMm, s.wallMm, ctx.system);
        alternatives.push(sizeNode(s.odMm, s.wallMm, { label, odMm: s.odMm, wallMm: s.wallMm, source: 'table' }));
        const eq = strengthNode(s, label);
        if (eq) strengthNodes.push(eq);
        if (ctx.acceptPrintedEquivalents) {
          for (const eq of ctx.equivalents) {
            if (!sameSize(eq.size, s) || sameSize(eq.printedAs, s)) continue;
            alternatives.push(
              sizeNode(eq.printedAs.odMm, eq.printedAs.wallMm, {
                label: `${eq.printedAs.label} (printed equivalent of ${label})`, odMm: eq.printedAs.odMm, wallMm: eq.printedAs.wallMm,
                source: 'printed_equivalent', equivalentOf: { odMm: s.odMm, wallMm: s.wallMm }, ...(eq.note ? { note: eq.note } : {}),
              }),
            );
          }
        }
      }
      if (thin && thinUnit) {
        // Two readings of "the minimum diameter required for the weight" (F-SCCA-T1): the smallest OD
        // the row lists (today's default) or the largest.
        const ods = sizes.map((s) => s.odMm);
        const minOd = thin.minimumDiameter === 'largest_listed' ? Math.max(...ods) : Math.min(...ods);
        const marginMm = toCanonical(thin.odMargin, thinUnit);
        const minWallMm = toCanonical(thin.minWall, thinUnit);
        const name = ctx.nextAlternative();
        const label = `${lengthLabel(minOd + marginMm, ctx.system)} OD or larger with ${lengthLabel(minWallMm, ctx.system)} wall (thin-wall allowance)`;
        const measured = readingLeaf(minWallMm, [...path, 'measuredWall']);
        ctx.alternatives[name] = {
          label, odMm: minOd + marginMm, wallMm: minWallMm, requiredWallMm: Math.max(minWallMm - wallAllowanceMm, 0), source: 'allowance',
          ...(row.materials ? { materials: row.materials } : {}), ...(row.processes ? { processes: row.processes } : {}),
          ...(measured ? { requiredReadingMm: measured.requiredMm, readingFact: measured.fact } : {}),
          ...(row.approvedBefore ? { approvedBefore: row.approvedBefore } : {}),
        };
        const margin = compileLeaf(
          { fact: 'member.odMarginOverTableMinimumMm', operator: 'greaterThanInclusive', value: marginMm, unit: 'mm', params: { tableMinimumOdMm: minOd } },
          [...path, 'allowances', 'thinWallWhenOdExceedsMinimum'], ctx,
        );
        const wall = compileLeaf({ fact: 'member.wallMm', operator: 'greaterThanInclusive', value: Math.max(minWallMm - wallAllowanceMm, 0), unit: 'mm' }, [...path, 'allowances'], ctx);
        alternatives.push({ all: [...restrictions(), margin, wall, ...(measured ? [measured.node] : [])], name });
      }
      alternatives.push(...strengthNodes);
    });
    // Descending priorities make the engine try alternatives one at a time and stop at the first
    // that fits, instead of evaluating every alternative of the band.
    alternatives.forEach((alt, i) => (alt.priority = alternatives.length - i));
    variants.push({ aboveKg: previousUpTo, upToKg, ...(band.label ? { bandLabel: band.label } : {}), node: { any: alternatives } });
    if (upToKg !== null) previousUpTo = upToKg;
  });
  if (!ok) return undefined;
  return { variants };
}

type Compiler<K extends TemplateName> = (req: Requirement, r: TemplateOf<K>, path: Path, ctx: TemplateContext) => CompiledRequires | undefined;
const single = (node: EngineNode | undefined): CompiledRequires | undefined => (node ? { variants: [{ aboveKg: null, upToKg: null, node }] } : undefined);

function compileRequiredMembers(r: TemplateOf<'required_members'>, path: Path, ctx: TemplateContext): CompiledRequires | undefined {
  const leaves: (EngineNode | undefined)[] = [];
  r.members.forEach((entry, i) => {
    const p = [...path, 'members', i];
    const kinds = [...new Set(entry.kinds)];
    const kindWords = kinds.map((k) => MEMBER_KIND_PLURAL_LABELS[k]).join(' / ');
    if (entry.max !== undefined && entry.max < entry.min) ctx.problems.add([...p, 'max'], 'The maximum must not be below the minimum.');
    // Per side (opt-in): each side is its own count, so two door bars on one side do not stand
    // in for none on the other.
    const sides: (SideParam | undefined)[] = entry.side === undefined ? [undefined] : entry.side === 'each' ? ['left', 'right'] : [entry.side];
    if (entry.side !== undefined) {
      const sideless = kinds.filter((k) => !SIDED_MEMBER_KINDS.includes(k));
      if (sideless.length > 0) ctx.problems.add([...p, 'side'], `A ${MEMBER_KIND_LABELS[sideless[0]]} spans the car and has no side; count it in total.`);
    }
    for (const side of sides) {
      const label = entry.label
        ? (side && entry.side === 'each' ? `${entry.label} ${sideWords(side)}` : entry.label)
        : `number of ${kindWords}${side ? ` ${sideWords(side)}` : ''}`;
      const addressing = side !== undefined
        ? { fact: 'vehicle.memberCountOnSide', params: { kinds, side } }
        : kinds.length === 1 ? { fact: 'vehicle.memberCounts', path: kinds[0] } : { fact: 'vehicle.memberCountOfKinds', params: { kinds } };
      leaves.push(compileLeaf({ ...addressing, operator: 'greaterThanInclusive', value: entry.min }, p, ctx, label));
      if (entry.max !== undefined) leaves.push(compileLeaf({ ...addressing, operator: 'lessThanInclusive', value: entry.max }, p, ctx, label));
    }
  });
  return leaves.every((l) => l) ? single({ all: leaves }) : undefined;
}

function compileLimit(r: TemplateOf<'limit'>, path: Path, ctx: TemplateContext): CompiledRequires | undefined {
  const leaves = r.checks.flatMap((c, i): (EngineNode | undefined)[] => {
    const p = [...path, 'checks', i];
    if (GRADE_FACTS[c.fact]) return compileGradeFloor(c, p, ctx) ?? [undefined];
    const v = c.value;
    if (isProportional(v)) return [compileProportional({ ...c, value: v }, p, ctx)];
    return [compileLeaf({ fact: c.fact, operator: ENGINE_FROM_LIMIT[c.operator], value: v, unit: c.unit, path: c.path, params: c.params }, p, ctx, c.label)];
  });
  return leaves.every((l) => l) ? single({ all: leaves }) : undefined;
}

function compileAllowedValues(r: TemplateOf<'allowed_values'>, path: Path, ctx: TemplateContext): CompiledRequires | undefined {
  const renamed = { ...ctx, problems: renamedProblems(ctx.problems, { value: 'values', operator: 'fact' }) };
  const leaf = compileLeaf({ fact: r.fact, operator: r.mode === 'forbidden' ? 'notIn' : 'in', value: r.values }, path, renamed);
  ctx.leafCount = renamed.leafCount;
  return single(leaf ? { all: [leaf] } : undefined);
}

/**
 * The compiler of every rule kind. A mapped type over the schema's template names: a kind without
 * a compiler fails the type-check instead of compiling to nothing.
 */
const COMPILERS: { readonly [K in TemplateName]: Compiler<K> } = {
  tube_table: (_req, r, path, ctx) => compileTubeTable(r, path, ctx),
  required_members: (_req, r, path, ctx) => compileRequiredMembers(r, path, ctx),
  limit: (_req, r, path, ctx) => compileLimit(r, path, ctx),
  allowed_values: (_req, r, path, ctx) => compileAllowedValues(r, path, ctx),
  conditions: (_req, r, path, ctx) => single(compileConditionTree(r.conditions, [...path, 'conditions'], ctx)),
  member_match: (req, r, path, ctx) => single(compileMemberMatch(req, r, path, ctx)),
};

export function compileRequires(req: Requirement, path: Path, ctx: TemplateContext): CompiledRequires | undefined {
  const r = req.requires;
  const kind = TEMPLATE_KINDS[r.template];
  if (!kind.scopes.includes(req.scope.kind)) {
    ctx.problems.add([...path.slice(0, -1), 'scope'], kind.scopeMessage);
    return undefined;
  }
  // TypeScript cannot tie COMPILERS[r.template] to r's own member of the union; the mapped type does.
  return (COMPILERS[r.template] as Compiler<TemplateName>)(req, r, path, ctx);
}
