// The tube chooser for a build sheet: per member of its latest revision, the lightest legal tube
// from the club's stock list and the builder's own sizes, judged under the sheet's ruleset version
// and class (domain/tube-choice-sheet.ts), with the members a choice must change too. Readable by
// whoever may read the sheet; a steward sees the same answer as its builder (the builder's own sizes,
// not the steward's). The builder may put a chosen size on the sheet: it is judged again, with its
// companions, and saved as the next revision (undone by restoring the one before).
import type { DataSource } from 'typeorm';
import type {
  CandidateWire, MemberTubeChoiceWire, TubeChangeWire, TubeChoiceAppliedWire, TubeChoiceApplyBody, TubeChoiceWire,
} from '../contracts/tube-stock';
import { FABRICATION_CAUTION } from '../contracts/tube-stock';
import type { Specification } from '../contracts/specification';
import { FACTS_BY_NAME } from '../domain/facts';
import { memberNames } from '../domain/geometry/names';
import { TUBE_DEPENDENT_FACTS, memberWithTube } from '../domain/tube-choice';
import type { RankedCandidate, StockTube as DomainStockTube } from '../domain/tube-choice';
import { chooseTubesForSheet, consequencesOf, peerDependents } from '../domain/tube-choice-sheet';
import type { Consequences, MemberTubeChoice } from '../domain/tube-choice-sheet';
import type { CompiledRuleset } from '../domain/rules/types';
import { BuildSheetRevision } from '../entities';
import type { StockTube } from '../entities';
import { ConflictError, ValidationError } from '../errors';
import { sheetFor } from './garage.service';
import type { BuildSheetService } from './build-sheets.service';
import type { RulesetService } from './rulesets.service';
import type { TubeStockService } from './tube-stock.service';

const SHOWN = 5;

function candidateView(c: RankedCandidate & Partial<Consequences>, list: CandidateWire['list'], label: string, names: readonly string[], view: (c: RankedCandidate) => CandidateWire): CandidateWire {
  const failing = c.outcomes.find((o) => o.verdict === 'fail');
  const missing = new Map<string, Set<string>>();
  for (const o of c.outcomes) for (const f of o.missing ?? []) missing.set(f, (missing.get(f) ?? new Set()).add(o.requirementId));
  return {
    stockId: list === 'sheet' ? null : (c.tube.id ?? null), list, label,
    odMm: c.tube.odMm, wallMm: c.tube.wallMm, material: c.tube.material ?? null, process: c.tube.process ?? null,
    grade: c.tube.grade ?? null, yieldMpa: c.tube.yieldMpa ?? null, massPerMetreKg: c.massPerMetreKg, status: c.status,
    matched: c.outcomes.flatMap((o) => (o.matched ? [o.matched] : [])),
    failing: failing ? { requirementId: failing.requirementId, title: failing.title, section: failing.section } : null,
    missing: [...missing].map(([fact, ids]) => ({ fact, label: FACTS_BY_NAME.get(fact)?.label ?? fact, requirementIds: [...ids].sort() })),
    assumesCatalogueWall: c.assumesCatalogueWall,
    together: (c.together ?? []).map((t) => ({ memberId: t.memberId, memberName: names[t.memberIndex] ?? t.memberId, because: t.because, candidate: view(t.tube) })),
    leavesFailing: (c.leavesFailing ?? []).map((l) => ({ memberId: l.memberId, memberName: names[l.memberIndex] ?? l.memberId, requirement: l.requirement })),
  };
}

interface Loaded {
  sheetId: string;
  revision: BuildSheetRevision;
  compiled: CompiledRuleset;
  spec: Specification;
  stock: DomainStockTube[];
  club: StockTube[];
  mine: StockTube[];
  rowsById: Map<string, { row: StockTube; list: 'club' | 'mine' }>;
  canApply: boolean;
}

export type TubeChoiceService = ReturnType<typeof createTubeChoiceService>;

export function createTubeChoiceService(ds: DataSource, deps: { rulesets: RulesetService; stock: TubeStockService; buildSheets: BuildSheetService }) {
  async function load(sheetId: string, userId: string): Promise<Loaded> {
    const { sheet, car, access } = await sheetFor(ds.manager, sheetId, userId, 'read');
    const revision = await ds.getRepository(BuildSheetRevision).findOneOrFail({ where: { buildSheetId: sheet.id, number: sheet.currentRevision } });
    const compiled = await deps.rulesets.loadCompiled(revision.rulesetVersionId);
    const { club, mine } = await deps.stock.stockFor(sheet.clubId, car.ownerId);
    const rowsById = new Map<string, { row: StockTube; list: 'club' | 'mine' }>();
    const toDomain = (row: StockTube, list: 'club' | 'mine'): DomainStockTube => {
      rowsById.set(row.id, { row, list });
      return {
        id: row.id, label: row.label, odMm: row.odMm, wallMm: row.wallMm, material: row.material, process: row.process,
        ...(row.grade ? { grade: row.grade } : {}), ...(row.yieldMpa !== null ? { yieldMpa: row.yieldMpa } : {}),
      };
    };
    const stock = [...club.map((r) => toDomain(r, 'club')), ...mine.map((r) => toDomain(r, 'mine'))];
    const spec = { ...revision.specification, vehicle: { ...revision.specification.vehicle, classId: revision.classId } };
    return { sheetId: sheet.id, revision, compiled, spec, stock, club, mine, rowsById, canApply: access === 'owner' && sheet.archivedAt === null };
  }

  const viewer = (l: Loaded, names: readonly string[]) => {
    const view = (c: RankedCandidate & Partial<Consequences>): CandidateWire => {
      const found = c.tube.id ? l.rowsById.get(c.tube.id) : undefined;
      return candidateView(c, found?.list ?? 'sheet', found?.row.label ?? c.tube.label ?? '', names, view);
    };
    return view;
  };

  return {
    async choose(sheetId: string, userId: string, options: { anyMaterial: boolean }): Promise<TubeChoiceWire> {
      const l = await load(sheetId, userId);
      const { revision, compiled, spec } = l;
      const names = memberNames(spec.members);
      const view = viewer(l, names);
      const members: MemberTubeChoiceWire[] = chooseTubesForSheet(compiled, spec, l.stock, { anyMaterial: options.anyMaterial }).map((m: MemberTubeChoice, i) => {
        const member = spec.members[i]!;
        // Lighter sizes the choice cannot use (they would leave another member failing) come first, with why.
        const start = m.lightest ? m.legal.indexOf(m.lightest) : -1;
        const blocked = start >= 0 ? m.legal.slice(0, start) : [];
        // Sizes not tried on the sheet (members compared with this one) are not offered: what they would do is not known.
        const after = (start >= 0 ? m.legal.slice(start + 1) : m.legal).filter((c) => c.triedOnSheet);
        return {
          memberId: m.memberId, memberKind: m.memberKind, label: member.label ?? null, name: names[i]!, lengthMm: m.lengthMm,
          current: candidateView(m.current, 'sheet', 'On the sheet', names, view),
          lightest: m.lightest ? view(m.lightest) : null,
          alternatives: [...blocked.slice(0, SHOWN), ...after.slice(0, SHOWN)].map(view),
          undecided: m.undecided.slice(0, SHOWN).map(view),
          legalCount: m.legal.length, savingPerMetreKg: m.savingPerMetreKg, savingKg: m.savingKg, savingTogetherKg: m.savingTogetherKg,
        };
      });
      const cls = compiled.classes[revision.classId];
      const rb = compiled.document.rulebook;
      return {
        sheetId: l.sheetId, revision: revision.number, rulesetVersionId: revision.rulesetVersionId, classId: revision.classId, className: cls?.name ?? revision.classId,
        rulebook: { publisher: rb.publisher, title: rb.title, edition: rb.edition },
        stock: { club: l.club.length, mine: l.mine.length }, anyMaterial: options.anyMaterial, members,
        requirementsJudged: compiled.requirements.filter((r) => (r.classes === null || r.classes.includes(revision.classId)) && r.factsUsed.some((f) => TUBE_DEPENDENT_FACTS.has(f))).length,
        canApply: l.canApply, caution: FABRICATION_CAUTION,
      };
    },

    /**
     * Puts the stock size on the member, and its companions on theirs, as the next revision. The
     * choice is judged again from the sheet as saved: a size that is not legal, or that would leave
     * another member failing, is refused at `stockId`; a sheet saved since `baseRevision` is a 409.
     */
    async apply(sheetId: string, userId: string, body: TubeChoiceApplyBody): Promise<TubeChoiceAppliedWire> {
      const { sheet } = await sheetFor(ds.manager, sheetId, userId, 'edit');
      if (body.baseRevision !== sheet.currentRevision)
        throw new ConflictError(`This build sheet was saved as revision ${sheet.currentRevision} since the chooser read revision ${body.baseRevision}. Nothing was changed: look at the lightest tubes again.`, { currentRevision: sheet.currentRevision });
      const l = await load(sheetId, userId);
      const { compiled, spec } = l;
      const names = memberNames(spec.members);
      const index = spec.members.findIndex((m) => m.id === body.memberId);
      if (index < 0) throw new ValidationError([{ path: 'memberId', message: `Revision ${l.revision.number} has no member "${body.memberId}".` }]);
      const all = chooseTubesForSheet(compiled, spec, l.stock, { anyMaterial: body.anyMaterial });
      const choice = all[index]!;
      const candidate = choice.legal.find((c) => c.tube.id === body.stockId);
      if (!candidate) {
        const onList = l.rowsById.has(body.stockId);
        throw new ValidationError([{ path: 'stockId', message: onList ? `That size is not legal for ${names[index]} under ${compiled.document.rulebook.title} ${compiled.document.rulebook.edition}${body.anyMaterial ? '' : ' in its material'}.` : 'That size is not on the club’s list or yours.' }]);
      }
      const consequences = consequencesOf(compiled, spec, index, candidate.tube, l.stock, {
        dependents: peerDependents(compiled, spec), before: all.map((m) => m.current.status), anyMaterial: body.anyMaterial,
      });
      if (consequences.leavesFailing.length > 0) {
        const who = consequences.leavesFailing.map((f) => `${names[f.memberIndex]} (§ ${f.requirement.section} ${f.requirement.title})`).join(', ');
        throw new ValidationError([{ path: 'stockId', message: `That size would leave ${who} failing, and no size in stock puts ${consequences.leavesFailing.length === 1 ? 'it' : 'them'} right. Nothing was changed.` }]);
      }
      const changes: TubeChangeWire[] = [];
      const tubes = new Map<number, RankedCandidate>([[index, candidate], ...consequences.together.map((c) => [c.memberIndex, c.tube] as [number, RankedCandidate])]);
      const members = spec.members.map((m, i) => {
        const c = tubes.get(i);
        if (!c) return m;
        const t = c.tube;
        changes.push({
          memberId: m.id, memberName: names[i]!, from: { odMm: m.odMm, wallMm: m.wallMm, material: m.material ?? null, process: m.process ?? null },
          to: { odMm: t.odMm, wallMm: t.wallMm, material: t.material!, process: t.process!, label: (t.id ? l.rowsById.get(t.id)?.row.label : undefined) ?? t.label ?? '' },
        });
        return memberWithTube(m, t);
      });
      const { vehicle } = l.revision.specification;
      const saved = await deps.buildSheets.saveRevision(sheetId, userId, {
        baseRevision: body.baseRevision, rulesetVersionId: l.revision.rulesetVersionId, classId: l.revision.classId,
        specification: { ...l.revision.specification, vehicle, members },
      });
      return { revision: saved.revision.number, previousRevision: body.baseRevision, changes };
    },
  };
}
