// The check engine's `compare` job (issue 13 §5): one sheet against several rulebooks in one job,
// parsed once and evaluated under each, only the matrix crossing back. It must give exactly the matrix
// the reports give when each rulebook is checked on its own and compared afterwards (the way it was
// built before, and the way the domain tests check it against published tables), on one thread and in
// a worker thread; and a worker that let a compilation go is sent the documents again.
import { afterAll, describe, expect, test } from 'vitest';
import { readFileSync } from 'node:fs';
import type { RulesetDocument } from '@backend/contracts/ruleset';
import { parseSpecification, type Specification } from '@backend/contracts/specification';
import { compareRulebooks, satisfyAllLine } from '@backend/domain/compare/side-by-side';
import { compileRuleset, evaluateSpecification, validateRulesetDocument, type CompiledRuleset } from '@backend/domain/index';
import { createInProcessEngine, createWorkerEngine, type CheckEngine } from '@backend/services/check-engine';
import type { CacheKeyParts } from '@backend/services/compiled-ruleset-cache';
import { NotFoundError, ValidationError } from '@backend/errors';

/** Rulebooks quoted from published tables (tests/fixtures/rulesets; their sources are in each file). */
const FILES = { msuk: 'msuk-ncr-2026.json', scca: 'scca-gcr-quoted.json', fia: 'fia-art253-quoted.json' } as const;
const CLASSES = { msuk: 'new_cage', scca: 'gcr_2008', fia: undefined } as const;

function documentOf(file: string): RulesetDocument {
  const v = validateRulesetDocument(JSON.parse(readFileSync(new URL(`../../fixtures/rulesets/${file}`, import.meta.url), 'utf8')));
  if (!v.ok) throw new Error(`${file} is invalid`);
  return v.document;
}

const documents = Object.fromEntries(Object.entries(FILES).map(([k, f]) => [k, documentOf(f)])) as Record<keyof typeof FILES, RulesetDocument>;
const classOf = (k: keyof typeof FILES): string => CLASSES[k] ?? documents[k].classes[0]!.id;
const version = (i: number): CacheKeyParts => ({ id: `00000000-0000-4000-8000-${String(i).padStart(12, '0')}`, status: 'published', lockVersion: 1 });
const keys = Object.keys(FILES) as (keyof typeof FILES)[];
/** Version i holds rulebook keys[i % 3]: more versions than a worker keeps compiled reuse three documents. */
const documentFor = async (v: CacheKeyParts): Promise<RulesetDocument> => documents[keys[Number(v.id.slice(-12)) % keys.length]!];

/** A 1,400 kg car, mild steel cold-drawn tubes, a welded plate under the main hoop. */
function sheet(classId: string): Specification {
  const parsed = parseSpecification({
    vehicle: { classId, chassis: 'unibody', weightWithDriverKg: 1400, weightWithoutDriverKg: 1320 },
    members: [
      { id: 'mh', kind: 'main_hoop', odMm: 45, wallMm: 2.5, material: 'mild_steel', process: 'cds' },
      { id: 'rb', kind: 'rear_brace', odMm: 40, wallMm: 2.0, material: 'mild_steel', process: 'cds' },
    ],
    plates: [{ id: 'p1', location: 'main_hoop_foot', memberId: 'mh', fixing: 'welded', sidesMm: [120, 120], thicknessMm: 3 }],
  });
  if (!parsed.ok) throw new Error(JSON.stringify(parsed.problems));
  return parsed.value;
}

const columns = keys.map((k, i) => ({ version: version(i), classId: classOf(k), home: i === 0 }));
const spec = sheet(columns[0]!.classId);

/** The matrix the old way: each rulebook checked on its own, its report compared afterwards. */
async function oneByOne() {
  const compared = [];
  for (const [i, k] of keys.entries()) {
    const compiled: CompiledRuleset = compileRuleset(documents[k]);
    const classId = classOf(k);
    const report = await evaluateSpecification(compiled, classId, { ...spec, vehicle: { ...spec.vehicle, classId } }, { unitSystem: 'imperial' });
    compared.push({ key: `${version(i).id}:${classId}`, home: i === 0, classId, compiled, report });
  }
  const comparison = compareRulebooks(spec, compared);
  return { comparison, line: satisfyAllLine(comparison, 'imperial') };
}

const inProcess = (): CheckEngine => {
  let compiles = 0;
  return createInProcessEngine(async (v) => (compiles++, compileRuleset(await documentFor(v))), () => compiles);
};
const workers = createWorkerEngine({ size: 1, documentFor });
afterAll(() => workers.close());

describe('one sheet against three rulebooks in one job', () => {
  test.each([
    ['on one thread', inProcess],
    ['in a worker thread', () => workers],
  ])('gives the matrix and line that checking each on its own gives (%s)', async (_, engine) => {
    const expected = await oneByOne();
    const got = await engine().compare({ columns, specification: spec, unitSystem: 'imperial' });
    expect(got).toEqual(expected);
    // The three rulebooks really differ on this sheet, so the equality says something.
    expect(got.comparison.columns.map((c) => c.title)).toEqual(keys.map((k) => documents[k].rulebook.title));
    expect(got.comparison.rows.find((r) => r.key === 'member:main_hoop')?.cells).toHaveLength(3);
  });

  test('compiles each rulebook once per worker, and again only when the worker let it go', async () => {
    const engine = createWorkerEngine({ size: 1, documentFor });
    try {
      await engine.compare({ columns, specification: spec, unitSystem: 'imperial' });
      expect(engine.stats().compiles).toBe(3);
      await engine.compare({ columns, specification: spec, unitSystem: 'imperial' });
      expect(engine.stats().compiles).toBe(3);
      // 40 more versions push the first three out of the worker's 32 compilations: the comparison
      // that follows is answered "need the documents", sent them, and still gives the same matrix.
      for (let i = 3; i < 43; i++) await engine.verdict({ version: version(i), classId: classOf(keys[i % 3]!), specificationJson: JSON.stringify(sheet(classOf(keys[i % 3]!))) });
      const before = engine.stats().compiles;
      const again = await engine.compare({ columns, specification: spec, unitSystem: 'imperial' });
      expect(engine.stats().compiles).toBe(before + 3);
      expect(again).toEqual(await oneByOne());
    } finally {
      await engine.close();
    }
  }, 60_000);

  test.each([
    ['on one thread', inProcess],
    ['in a worker thread', () => workers],
  ])('refuses a specification that does not name the first column’s class, or a class a rulebook lacks (%s)', async (_, engine) => {
    const other = sheet(classOf('scca'));
    await expect(engine().compare({ columns, specification: other, unitSystem: 'metric' })).rejects.toBeInstanceOf(ValidationError);
    await expect(engine().compare({ columns, specification: { ...spec, members: 'none' }, unitSystem: 'metric' })).rejects.toBeInstanceOf(ValidationError);
    const unknown = [columns[0]!, { ...columns[1]!, classId: 'no-such-class' }];
    await expect(engine().compare({ columns: unknown, specification: spec, unitSystem: 'metric' })).rejects.toBeInstanceOf(NotFoundError);
  });
});
