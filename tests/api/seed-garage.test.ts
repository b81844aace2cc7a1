// The demo garage seed step: the builder's hillclimb sheet with a full cage model, made once, and a
// check of it through the engine reads its geometry from the model.
import { describe, expect, it } from 'vitest';
import { seedDemo, demoSeedSteps } from '../../backend/src/db/seed';
import { DEMO_CAR_NAME, DEMO_SHEET_NAME, demoGarageStep } from '../../backend/src/db/seed-garage';
import { parseSpecification } from '../../backend/src/contracts/specification';
import { compileRuleset, evaluateSpecification, validateRulesetDocument } from '../../backend/src/domain';
import { BuildSheet, BuildSheetRevision, Car, RulesetVersion } from '../../backend/src/entities';
import { useTestDatabase } from './helpers';

const db = useTestDatabase();

describe('demo garage seed', () => {
  it('adds one car with a modelled sheet, once, and the sheet checks from its model', async () => {
    await seedDemo(db.ds, [...demoSeedSteps, demoGarageStep]);
    await seedDemo(db.ds, [...demoSeedSteps, demoGarageStep]);
    const cars = await db.ds.getRepository(Car).findBy({ name: DEMO_CAR_NAME });
    expect(cars).toHaveLength(1);
    const sheet = await db.ds.getRepository(BuildSheet).findOneByOrFail({ carId: cars[0]!.id, name: DEMO_SHEET_NAME });
    const rev = await db.ds.getRepository(BuildSheetRevision).findOneByOrFail({ buildSheetId: sheet.id, number: 1 });
    const parsed = parseSpecification(rev.specification);
    expect(parsed.ok).toBe(true);
    if (!parsed.ok) return;
    expect(parsed.value.members).toHaveLength(10);
    // Main hoop: 2 feet, 2 top corners, junctions for backstays, harness bar and door bars (6);
    // 2 backstay feet; front hoop: 2 feet, 2 top corners, 2 door bar junctions.
    expect(parsed.value.model?.nodes).toHaveLength(18);
    // Tube sizes: the lightest per metre the hillclimb tables list. Mass goes with (D − t)·t (computed):
    // hoops 50 × 2.0 (96) beats 45 × 2.5 (106.25); others 40 × 2.0 (76) beats 38 × 2.5 (88.75).
    expect(parsed.value.members.find((m) => m.kind === 'main_hoop')).toMatchObject({ odMm: 50, wallMm: 2, label: 'main hoop' });
    expect(parsed.value.members.find((m) => m.kind === 'door_bar')).toMatchObject({ odMm: 40, wallMm: 2 });

    const version = await db.ds.getRepository(RulesetVersion).findOneByOrFail({ id: sheet.rulesetVersionId });
    const v = validateRulesetDocument(version.document);
    if (!v.ok) throw new Error('demo ruleset invalid');
    const report = await evaluateSpecification(compileRuleset(v.document), 'hill-saloon', parsed.value);
    const angle = report.findings.find((f) => f.requirementId === 'hc-backstay-angle')!;
    expect(angle.verdict).toBe('pass');
    expect(angle.measured[0]).toMatchObject({ fact: 'geometry.rearBraceAngleFromVerticalDeg', source: 'model' });
    expect(report.findings.find((f) => f.requirementId === 'hc-members')!.verdict).toBe('pass');
    expect(report.geometry?.members).toHaveLength(10);
    expect(report.findings.filter((f) => f.verdict === 'fail')).toEqual([]);
  });
});
