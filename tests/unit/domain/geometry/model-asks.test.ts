// Facts the cage model derives are never asked for: on a sheet with a model, a missing geometry fact
// becomes what the model still needs (a member's path, the driver's shoulder height, the helmet),
// in the finding, its reason and "measure next". Without a model, or where the model cannot give the
// fact at all, the typed measurement is asked as before. Checked against the demo club's rulebook
// (rulesets/tarnwick-vale-mc-cage-regulations-2027.json, invented): § C5.2.1 brace geometry, § C5.4.1
// harness bar, § C5.3.2 helmet below the hoop line.
import { describe, expect, test } from 'vitest';
import { modelAsks } from '@backend/domain/geometry/model-asks';
import { check, compileFile, finding } from '../helpers';
import { cageSpec } from '../../../fixtures/cage-model';

const demo = compileFile('rulesets/tarnwick-vale-mc-cage-regulations-2027.json');

/** The fixture cage as a closed club saloon, with every member's tube in the class's table. */
function saloon(edit: (s: ReturnType<typeof base>) => void = () => undefined) {
  const s = base();
  edit(s);
  return s;
}
function base() {
  const c = cageSpec();
  return {
    vehicle: { ...c.vehicle, classId: 'club-saloon', weightWithDriverKg: 1100, cockpit: 'closed' as const } as Record<string, unknown>,
    model: c.model as { nodes: unknown[] } | undefined,
    members: c.members.map((m) => ({ ...m, material: 'mild_steel', process: 'dom' })) as { id: string; path?: unknown; [k: string]: unknown }[],
  };
}
const facts = (f: { missing: { fact: string }[] }) => f.missing.map((m) => m.fact);

describe('with a model, what the model needs is asked instead of the measurement', () => {
  test('no shoulder height: the harness bar rule asks for it, not for "harness bar below the shoulders"', async () => {
    const report = await check(demo, saloon((s) => delete s.vehicle.driverShoulderHeightMm));
    const f = finding(report, 'tv-harness-bar');
    expect(f.verdict).toBe('needs_information');
    expect(facts(f)).toEqual(['vehicle.driverShoulderHeightMm']);
    expect(f.reason).toContain("driver's seated shoulder height");
    expect(report.measureNext.map((m) => m.fact)).toContain('vehicle.driverShoulderHeightMm');
    expect(report.measureNext.map((m) => m.fact)).not.toContain('geometry.harnessBarBelowShouldersMm');
  });

  test('a backstay without a path: the brace rule asks for that backstay’s path, by its name', async () => {
    const report = await check(demo, saloon((s) => delete s.members.find((m) => m.id === 'bsr')!.path));
    const f = finding(report, 'tv-brace-geometry');
    expect(f.verdict).toBe('needs_information');
    expect(f.missing).toEqual([{ fact: 'model.path.bsr', label: 'a path in the cage model for backstay right', dimension: null }]);
    const next = report.measureNext.map((m) => m.label);
    expect(next).toContain('a path in the cage model for backstay right');
    expect(next).not.toContain('rear brace angle from vertical');
  });

  test('everything the model needs is there: nothing about these facts is asked', async () => {
    const report = await check(demo, saloon());
    for (const id of ['tv-harness-bar', 'tv-brace-geometry']) expect(finding(report, id).verdict).not.toBe('needs_information');
    // Only the helmet line remains, which this cage (no front hoop) cannot give: see below.
    expect(report.measureNext.map((m) => m.fact).filter((f) => f.startsWith('geometry.') || f.startsWith('model.'))).toEqual(['geometry.helmetBelowHoopLineMm']);
  });
});

describe('the typed measurement is still asked', () => {
  test('on a sheet without a model', async () => {
    const report = await check(demo, saloon((s) => {
      delete s.model;
      for (const m of s.members) delete m.path;
    }));
    expect(facts(finding(report, 'tv-brace-geometry'))).toEqual(['geometry.rearBraceAngleFromVerticalDeg', 'geometry.rearBraceAttachBelowTopMm']);
    expect(facts(finding(report, 'tv-harness-bar'))).toEqual(['geometry.harnessBarBelowShouldersMm']);
  });

  test('where the model cannot give it: the helmet line needs a front hoop or halo, and this cage has neither', async () => {
    const report = await check(demo, saloon());
    expect(facts(finding(report, 'tv-helmet-closed'))).toEqual(['geometry.helmetBelowHoopLineMm']);
  });
});

describe('modelAsks', () => {
  const c = cageSpec();
  test.each([
    ['not a geometry fact', 'member.wallMm'],
    ['a fact about a kind the cage lacks (no front hoop)', 'geometry.helmetBelowHoopLineMm'],
  ])('%s: null', (_what, fact) => expect(modelAsks(c, fact)).toBeNull());
  test('no model: null', () => expect(modelAsks({ ...c, model: undefined }, 'geometry.rearBraceAngleFromVerticalDeg')).toBeNull());
  test('the nearest tube needs every member modelled and the helmet', () => {
    const members = c.members.map((m) => (m.id === 'dg' ? { ...m, path: undefined } : m));
    expect(modelAsks({ ...c, members, vehicle: { ...c.vehicle, helmet: undefined } }, 'geometry.nearestTubeToHelmetMm')?.map((a) => a.fact)).toEqual(['vehicle.helmet', 'model.path.dg']);
  });
});
