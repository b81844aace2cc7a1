// The cage views of one specification and its findings, as three SVG strings: what the build sheet,
// the review page, the PDF and the bench all call, so each draws exactly the same thing. Members
// without a path (a sheet typed the old way) are simply not drawn; the sheet works as before.
import { formatQuantity, type UnitSystem } from '../units.js';
import type { MemberKind } from '../vocabulary.js';
import { memberCentreline } from './centreline.js';
import { memberShapes, memberSide, type GeometryInput, type MemberShape } from './derive.js';
import { deriveGeometryFacts, type GeometryFactValues } from './derived-facts.js';
import type { CageNode, MemberSide, PathEntry } from './model.js';
import { memberNames } from './names.js';
import { cageGeometryMarks } from './cage-marks.js';
import { projectView, VIEW_NAMES, type DrawnMember, type ViewName } from './projection.js';
import { memberMarks } from './verdict-marks.js';
import type { Finding } from '../../contracts/report.js';
import { cageViewParts, viewPartsSvg, type CageViewParts, type SvgMemberInfo } from './view-svg.js';

export interface CageMemberLike {
  id: string;
  kind: MemberKind;
  label?: string;
  odMm?: number;
  wallMm?: number;
  path?: readonly PathEntry[];
}

/** The parts of a specification (or of the editor's draft, where a size may still be missing) the drawing reads. */
export interface CageSpecLike {
  members: readonly CageMemberLike[];
  model?: { nodes: readonly CageNode[] };
  vehicle?: GeometryInput['vehicle'];
}

const sized = (spec: CageSpecLike) =>
  spec.members.filter((m): m is CageMemberLike & { odMm: number } => typeof m.odMm === 'number' && m.odMm > 0);

/**
 * Members that can be drawn: a path of known nodes and an OD. A valid path is drawn from its analysed
 * shape (bend arcs included); one still being edited (a bend too tight for its straights, say) is drawn
 * as the straight polyline through its nodes, so the drawing never vanishes mid-edit.
 */
export function drawnMembers(spec: CageSpecLike, shapes: readonly MemberShape[] = modelShapes(spec)): DrawnMember[] {
  const nodes = spec.model?.nodes ?? [];
  if (nodes.length === 0) return [];
  const known = new Set(nodes.map((n) => n.id));
  const names = memberNames(spec.members);
  const byId = new Map(shapes.map((s) => [s.memberId, s]));
  const out: DrawnMember[] = [];
  for (const [i, m] of spec.members.entries()) {
    if (!m.path || m.path.length < 2 || !m.odMm || m.odMm <= 0 || m.path.some((p) => !known.has(p.nodeId))) continue;
    const centreline = byId.get(m.id)?.centreline() ?? memberCentreline(nodes, m.path, m.odMm);
    if (centreline.length >= 2) out.push({ id: m.id, name: names[i]!, odMm: m.odMm, centreline });
  }
  return out;
}

/** The analysed member paths (once per drawing: the facts and the centrelines share them). */
export function modelShapes(spec: CageSpecLike): MemberShape[] {
  if (!spec.model || spec.model.nodes.length === 0) return [];
  try {
    return memberShapes({ vehicle: spec.vehicle, members: sized(spec), model: spec.model });
  } catch {
    // A draft mid-edit may hold what the contract will refuse; it is then drawn unanalysed.
    return [];
  }
}

export function tubeSizeWords(odMm: number | undefined, wallMm: number | undefined, units: UnitSystem): string {
  if (odMm === undefined) return 'size not given';
  const od = formatQuantity(odMm, 'length', units);
  if (wallMm === undefined) return `${od.text} OD`;
  return `${od.value.toFixed(od.decimals)} × ${formatQuantity(wallMm, 'length', units).text}`;
}

export interface CageDrawingInput {
  spec: CageSpecLike;
  findings: readonly Finding[];
  units: UnitSystem;
  /** findingKey()s a steward waived. */
  waivedKeys?: ReadonlySet<string>;
  highlightId?: string | null;
  labels?: boolean;
}

export interface CageDrawing {
  svgs: Record<ViewName, string>;
  /** The same views as keyed parts, for a screen that redraws only what changed. */
  views: Record<ViewName, CageViewParts>;
  /** Per drawn member: name, size, verdict and rule (for hover text and lists beside the drawing). */
  members: Map<string, SvgMemberInfo>;
  drawn: DrawnMember[];
  /** The model's derived geometry facts the drawing labels (the same values the rules read). */
  facts: GeometryFactValues;
  /**
   * What the model gives per member with a valid path, so the sheet need not ask for it: the
   * developed centreline length (the member's length) and the side of the car read from y.
   */
  modelled: Map<string, { developedLengthMm: number; side: MemberSide }>;
}

/** The model's facts (the same values the rules read), from the members that have a size. */
export function drawingFacts(spec: CageSpecLike, shapes: readonly MemberShape[] = modelShapes(spec)): GeometryFactValues {
  if (!spec.model || spec.model.nodes.length === 0) return {};
  try {
    return deriveGeometryFacts({ vehicle: spec.vehicle, members: sized(spec), model: spec.model }, shapes);
  } catch {
    return {};
  }
}

/**
 * The member a whole-car finding is about, when the model derived the value it measured: the first
 * member the derived fact names (the worst one: the steeper backstay, the brace attached lowest).
 */
export function factMembers(facts: GeometryFactValues, drawn: readonly DrawnMember[]): (f: Pick<Finding, 'measured'>) => string[] {
  const byName = new Map(drawn.map((d) => [d.name, d.id]));
  return (f) => {
    const ids = new Set<string>();
    for (const m of f.measured) {
      const fact = facts[m.fact as keyof GeometryFactValues];
      const id = fact && m.source !== 'sheet' ? byName.get(fact.members[0] ?? '') : undefined;
      if (id) ids.add(id);
    }
    return [...ids];
  };
}

export function drawCage(input: CageDrawingInput): CageDrawing {
  const shapes = modelShapes(input.spec);
  const drawn = drawnMembers(input.spec, shapes);
  const facts = drawingFacts(input.spec, shapes);
  const marks = memberMarks(input.findings, input.waivedKeys, factMembers(facts, drawn));
  const byId = new Map(input.spec.members.map((m) => [m.id, m]));
  const members = new Map<string, SvgMemberInfo>();
  for (const d of drawn) {
    const m = byId.get(d.id)!;
    const mark = marks.get(d.id);
    members.set(d.id, { name: d.name, sizeText: tubeSizeWords(m.odMm, m.wallMm, input.units), verdict: mark?.verdict ?? 'unchecked', rule: mark?.worstRule ?? null });
  }
  const geometry = cageGeometryMarks(input.spec, drawn, facts, input.units);
  const svgs = {} as Record<ViewName, string>;
  const views = {} as Record<ViewName, CageViewParts>;
  for (const view of VIEW_NAMES) {
    views[view] = cageViewParts(projectView(drawn, view), { members, marks: geometry, units: input.units, highlightId: input.highlightId ?? null, labels: input.labels ?? false });
    svgs[view] = viewPartsSvg(views[view]);
  }
  const modelled = new Map(shapes.map((s) => [s.memberId, { developedLengthMm: s.geometry.developedLengthMm, side: memberSide(s.geometry.points) }]));
  return { svgs, views, members, drawn, facts, modelled };
}
