// The tube chooser for a build sheet: per member of its latest revision, the lightest legal tube
// from the club's stock list and the builder's own sizes, judged under the sheet's ruleset version
// and class (domain/tube-choice.ts). Readable by whoever may read the sheet; a steward sees the same
// answer as its builder (the builder's own sizes, not the steward's).
import type { DataSource } from 'typeorm';
import type { CandidateWire, MemberTubeChoiceWire, TubeChoiceWire } from '../contracts/tube-stock';
import { FABRICATION_CAUTION } from '../contracts/tube-stock';
import { FACTS_BY_NAME } from '../domain/facts';
import { TUBE_DEPENDENT_FACTS, chooseTubesForSheet } from '../domain/tube-choice';
import { memberNames } from '../domain/geometry/names';
import type { RankedCandidate, StockTube as DomainStockTube } from '../domain/tube-choice';
import { BuildSheetRevision } from '../entities';
import type { StockTube } from '../entities';
import { sheetFor } from './garage.service';
import type { RulesetService } from './rulesets.service';
import type { TubeStockService } from './tube-stock.service';

const SHOWN = 5;

function candidateView(c: RankedCandidate, list: CandidateWire['list'], label: string): CandidateWire {
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
  };
}

export type TubeChoiceService = ReturnType<typeof createTubeChoiceService>;

export function createTubeChoiceService(ds: DataSource, deps: { rulesets: RulesetService; stock: TubeStockService }) {
  return {
    async choose(sheetId: string, userId: string, options: { anyMaterial: boolean }): Promise<TubeChoiceWire> {
      const { sheet, car } = await sheetFor(ds.manager, sheetId, userId, 'read');
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
      const view = (c: RankedCandidate): CandidateWire => {
        const found = c.tube.id ? rowsById.get(c.tube.id) : undefined;
        return candidateView(c, found?.list ?? 'sheet', found?.row.label ?? c.tube.label ?? '');
      };
      const names = memberNames(spec.members);
      const members: MemberTubeChoiceWire[] = chooseTubesForSheet(compiled, spec, stock, { anyMaterial: options.anyMaterial }).map((m, i) => {
        const member = spec.members[i];
        return {
          memberId: m.memberId, memberKind: m.memberKind, label: member.label ?? null, name: names[i]!, lengthMm: member.lengthMm ?? null,
          current: candidateView(m.current, 'sheet', 'On the sheet'),
          lightest: m.lightest ? view(m.lightest) : null,
          alternatives: m.legal.slice(1, 1 + SHOWN).map(view),
          undecided: m.undecided.slice(0, SHOWN).map(view),
          legalCount: m.legal.length, savingPerMetreKg: m.savingPerMetreKg, savingKg: m.savingKg,
        };
      });
      const cls = compiled.classes[revision.classId];
      const rb = compiled.document.rulebook;
      return {
        sheetId: sheet.id, revision: revision.number, rulesetVersionId: revision.rulesetVersionId, classId: revision.classId, className: cls?.name ?? revision.classId,
        rulebook: { publisher: rb.publisher, title: rb.title, edition: rb.edition },
        stock: { club: club.length, mine: mine.length }, anyMaterial: options.anyMaterial, members,
        requirementsJudged: compiled.requirements.filter((r) => (r.classes === null || r.classes.includes(revision.classId)) && r.factsUsed.some((f) => TUBE_DEPENDENT_FACTS.has(f))).length,
        caution: FABRICATION_CAUTION,
      };
    },
  };
}
