// The cage views of one specification and its findings, as three SVG strings: what the build sheet,
// the review page, the PDF and the bench all call, so each draws exactly the same thing. Members
// without a path (a sheet typed the old way) are simply not drawn; the sheet works as before.
import { formatQuantity, type UnitSystem } from '../units.js';
import { MEMBER_KIND_LABELS, type MemberKind } from '../vocabulary.js';
import { memberCentreline } from './centreline-source.js';
import { cageGeometryMarks } from './cage-marks.js';
import { projectView, VIEW_NAMES, type DrawnMember, type ViewName } from './projection.js';
import { memberMarks } from './verdict-marks.js';
import type { Finding } from '../../contracts/report.js';
import { cageViewSvg, type SvgMemberInfo } from './view-svg.js';

export interface CageNodeLike {
  id: string;
  label?: string;
  xMm: number;
  yMm: number;
  zMm: number;
}

export interface CageMemberLike {
  id: string;
  kind: MemberKind;
  label?: string;
  odMm?: number;
  wallMm?: number;
  path?: { nodeId: string; clrMm?: number }[];
}

/** The parts of a specification (or of the editor's draft) the drawing reads. */
export interface CageSpecLike {
  members: readonly CageMemberLike[];
  model?: { nodes: readonly CageNodeLike[] };
  vehicle?: { driverShoulderHeightMm?: number; helmet?: { xMm: number; yMm: number; zMm: number; radiusMm: number } };
}

/**
 * The name every output uses: the builder's own, else the kind in words, numbered when the cage has
 * several of that kind ("Rear brace (backstay) 2"), never an internal id.
 */
export function memberNames(members: readonly CageMemberLike[]): Map<string, string> {
  const counts = new Map<MemberKind, number>();
  for (const m of members) counts.set(m.kind, (counts.get(m.kind) ?? 0) + 1);
  const seen = new Map<MemberKind, number>();
  const out = new Map<string, string>();
  for (const m of members) {
    const nth = (seen.get(m.kind) ?? 0) + 1;
    seen.set(m.kind, nth);
    const words = MEMBER_KIND_LABELS[m.kind];
    const fallback = `${words.charAt(0).toUpperCase()}${words.slice(1)}${(counts.get(m.kind) ?? 0) > 1 ? ` ${nth}` : ''}`;
    out.set(m.id, m.label?.trim() || fallback);
  }
  return out;
}

/** Members that can be drawn: a path of known nodes and an OD. */
export function drawnMembers(spec: CageSpecLike): DrawnMember[] {
  const nodes = spec.model?.nodes ?? [];
  if (nodes.length === 0) return [];
  const known = new Set(nodes.map((n) => n.id));
  const names = memberNames(spec.members);
  const out: DrawnMember[] = [];
  for (const m of spec.members) {
    if (!m.path || m.path.length < 2 || !m.odMm || m.odMm <= 0 || m.path.some((p) => !known.has(p.nodeId))) continue;
    const centreline = memberCentreline(nodes, m.path, m.odMm);
    if (centreline.length >= 2) out.push({ id: m.id, name: names.get(m.id) ?? m.id, odMm: m.odMm, centreline });
  }
  return out;
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
  /** Per drawn member: name, size, verdict and rule (for hover text and lists beside the drawing). */
  members: Map<string, SvgMemberInfo>;
  drawn: DrawnMember[];
}

export function drawCage(input: CageDrawingInput): CageDrawing {
  const drawn = drawnMembers(input.spec);
  const marks = memberMarks(input.findings, input.waivedKeys);
  const byId = new Map(input.spec.members.map((m) => [m.id, m]));
  const members = new Map<string, SvgMemberInfo>();
  for (const d of drawn) {
    const m = byId.get(d.id)!;
    const mark = marks.get(d.id);
    members.set(d.id, { name: d.name, sizeText: tubeSizeWords(m.odMm, m.wallMm, input.units), verdict: mark?.verdict ?? 'unchecked', rule: mark?.worstRule ?? null });
  }
  const geometry = cageGeometryMarks(input.spec, drawn, input.units);
  const svgs = {} as Record<ViewName, string>;
  for (const view of VIEW_NAMES) {
    svgs[view] = cageViewSvg(projectView(drawn, view), { members, marks: geometry, units: input.units, highlightId: input.highlightId ?? null, labels: input.labels ?? false });
  }
  return { svgs, members, drawn };
}
