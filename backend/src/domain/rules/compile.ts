// Turns a ruleset document into json-rules-engine rules plus finding metadata. Pure: the same
// document always gives the same compiled ruleset, so callers may cache it by document revision.
import type { TopLevelCondition } from 'json-rules-engine';
import type { DocumentProblem, RulesetDocument } from '../../contracts/ruleset.js';
import { DEFAULT_UNIT, toCanonical } from '../units.js';
import type { Dimension } from '../units.js';
import type { FactScope } from '../facts.js';
import { compileConditionTree, resolveUnit } from './conditions.js';
import type { Path, Problems } from './conditions.js';
import { compileRequires, sizeLabel } from './templates.js';
import type { CanonicalEquivalent, CanonicalStrengthPolicy, TemplateContext } from './templates.js';
import type { CompiledRequirement, CompiledRuleset, CompiledPolicy } from './types.js';

export class RulesetInvalidError extends Error {
  readonly problems: DocumentProblem[];
  constructor(problems: DocumentProblem[]) {
    super(`The ruleset document is invalid: ${problems.slice(0, 3).map((p) => `${p.path || '(document)'}: ${p.message}`).join('; ')}${problems.length > 3 ? ` (and ${problems.length - 3} more)` : ''}`);
    this.name = 'RulesetInvalidError';
    this.problems = problems;
  }
}

/** Collects problems with dotted paths, e.g. `requirements.3.section`. */
export function problemCollector(): Problems & { list: DocumentProblem[] } {
  const list: DocumentProblem[] = [];
  return { list, add: (path: Path, message: string) => list.push({ path: path.join('.'), message }) };
}

const TOLERANCE_DIMENSIONS: Dimension[] = ['length', 'angle', 'mass', 'area', 'stress', 'ratio'];

/**
 * Semantic compilation of a structurally valid document. Problems go to `problems`; the result is
 * only meaningful when none were added.
 */
export function compileDocument(doc: RulesetDocument, problems: Problems & { list: DocumentProblem[] }): CompiledRuleset {
  const system = doc.unitSystem;
  const tolerance: Partial<Record<Dimension, number>> = {};
  for (const dim of TOLERANCE_DIMENSIONS) {
    const v = doc.measurementTolerance[dim as keyof typeof doc.measurementTolerance];
    if (v !== undefined) tolerance[dim] = toCanonical(v, DEFAULT_UNIT[system][dim]);
  }
  const classIds = new Map<string, number>();
  const listedWeightsKg: Record<string, number> = {};
  doc.classes.forEach((c, i) => {
    if (classIds.has(c.id)) problems.add(['classes', i, 'id'], `Class id "${c.id}" is already used by class ${classIds.get(c.id)! + 1}.`);
    else classIds.set(c.id, i);
    if (c.listedWeight) {
      const unit = resolveUnit('mass', c.listedWeight.unit, ['classes', i, 'listedWeight', 'unit'], { system, problems });
      if (unit) {
        const kg = toCanonical(c.listedWeight.value, unit);
        if (kg > 10000) problems.add(['classes', i, 'listedWeight', 'value'], 'A listed class weight over 10,000 kg is not a race car: check the unit.');
        else listedWeightsKg[c.id] = kg;
      }
    }
  });

  const equivalents: CanonicalEquivalent[] = [];
  const eqCtx = { system, problems };
  doc.printedEquivalents.forEach((eq, i) => {
    const u1 = resolveUnit('length', eq.size.unit, ['printedEquivalents', i, 'size', 'unit'], eqCtx);
    const u2 = resolveUnit('length', eq.printedAs.unit, ['printedEquivalents', i, 'printedAs', 'unit'], eqCtx);
    if (!u1 || !u2) return;
    const printedAs = { odMm: toCanonical(eq.printedAs.od, u2), wallMm: toCanonical(eq.printedAs.wall, u2) };
    equivalents.push({
      size: { odMm: toCanonical(eq.size.od, u1), wallMm: toCanonical(eq.size.wall, u1) },
      printedAs: { ...printedAs, label: sizeLabel(printedAs.odMm, printedAs.wallMm, u2 === 'in' ? 'imperial' : 'metric') },
      ...(eq.note ? { note: eq.note } : {}),
    });
  });

  const strength = strengthPolicy(doc, problems);

  const requirementIds = new Map<string, number>();
  const requirements: CompiledRequirement[] = [];
  doc.requirements.forEach((req, index) => {
    const path: Path = ['requirements', index];
    if (requirementIds.has(req.id)) problems.add([...path, 'id'], `Requirement id "${req.id}" is already used by requirement ${requirementIds.get(req.id)! + 1}.`);
    else requirementIds.set(req.id, index);
    req.appliesTo?.classes?.forEach((c, j) => {
      if (!classIds.has(c)) problems.add([...path, 'appliesTo', 'classes', j], `Unknown class "${c}". Classes: ${[...classIds.keys()].join(', ')}.`);
    });
    const scope: FactScope = req.scope.kind;
    let leaf = 0;
    let alt = 0;
    const ctx: TemplateContext = {
      system, scope, tolerance, problems, leaves: {}, factsUsed: new Set(), leafCount: 0,
      nextLeaf: () => `L${leaf++}`, alternatives: {}, nextAlternative: () => `A${alt++}`,
      acceptPrintedEquivalents: doc.acceptPrintedEquivalents, equivalents, ...(strength.accept && (strength.measure === 'section_modulus' || strength.listedYieldMpa !== undefined) ? { strength } : {}),
    };
    const before = problems.list.length;
    const when = req.appliesTo?.when === undefined ? undefined : compileConditionTree(req.appliesTo.when, [...path, 'appliesTo', 'when'], ctx);
    const requires = compileRequires(req, [...path, 'requires'], ctx);
    // A requirement that compiles to nothing must never vanish from the checks without a word.
    if (!requires && problems.list.length === before) problems.add([...path, 'requires'], `This ${req.requires.template} rule could not be compiled.`);
    if (problems.list.length > before || !requires) return;
    requirements.push({
      id: req.id, index, title: req.title, section: req.section, severity: req.severity, area: req.area, scope: req.scope,
      template: req.requires.template, classes: req.appliesTo?.classes ?? null, explanation: req.explanation,
      acceptsMakerCertificate: req.acceptsMakerCertificate ?? false,
      leaves: ctx.leaves, alternatives: ctx.alternatives, factsUsed: [...ctx.factsUsed].sort(),
      variants: requires.variants.map((v) => ({
        aboveKg: v.aboveKg, upToKg: v.upToKg, ...(v.bandLabel ? { bandLabel: v.bandLabel } : {}),
        rule: {
          name: req.id,
          event: { type: 'requirement', params: { id: req.id } },
          // The applicability guard runs first (higher priority) so a requirement that does not
          // apply stops there instead of evaluating what it requires.
          // Built only from nodes checked by compileConditionTree/compileLeaf, hence the cast.
          conditions: { all: [...(when ? [{ ...when, name: 'when', priority: 2 }] : []), { ...v.node, name: 'requires', priority: 1 }] } as unknown as TopLevelCondition,
        },
      })),
    });
  });
  const policy: CompiledPolicy = { acceptPrintedEquivalents: doc.acceptPrintedEquivalents, strength, tolerance };
  return { document: doc, classes: Object.fromEntries(doc.classes.map((c) => [c.id, c])), listedWeightsKg, requirements, policy };
}

/**
 * `strengthEquivalents` in canonical units. Without it: not accepted, judged (as advice) by section
 * modulus. Bending strength needs the yield the listed sizes are taken at.
 */
function strengthPolicy(doc: RulesetDocument, problems: Problems): CanonicalStrengthPolicy {
  const se = doc.strengthEquivalents;
  if (!se) return { accept: false, measure: 'section_modulus' };
  const ctx = { system: doc.unitSystem, problems };
  const out: CanonicalStrengthPolicy = { accept: se.accept, measure: se.measure };
  if (se.listedYield) {
    const unit = resolveUnit('stress', se.listedYield.unit, ['strengthEquivalents', 'listedYield', 'unit'], ctx);
    if (unit) {
      const mpa = toCanonical(se.listedYield.value, unit);
      if (mpa > 3000) problems.add(['strengthEquivalents', 'listedYield', 'value'], 'A yield over 3000 MPa is not a tube steel: check the unit.');
      else out.listedYieldMpa = mpa;
    }
  } else if (se.measure === 'bending_strength') {
    problems.add(['strengthEquivalents', 'listedYield'], 'Bending strength compares yield × Z: give the yield the listed sizes are taken at (e.g. the rulebook’s minimum yield).');
  }
  if (se.minWall) {
    const unit = resolveUnit('length', se.minWall.unit, ['strengthEquivalents', 'minWall', 'unit'], ctx);
    if (unit) {
      const mm = toCanonical(se.minWall.value, unit);
      if (mm > 20) problems.add(['strengthEquivalents', 'minWall', 'value'], 'A least wall over 20 mm is not a cage tube: check the unit.');
      else out.minWallMm = mm;
    }
  }
  return out;
}

/** Compiles a validated document. Throws RulesetInvalidError (with every problem) otherwise. */
export function compileRuleset(document: RulesetDocument): CompiledRuleset {
  const problems = problemCollector();
  const compiled = compileDocument(document, problems);
  if (problems.list.length > 0) throw new RulesetInvalidError(problems.list);
  return compiled;
}
