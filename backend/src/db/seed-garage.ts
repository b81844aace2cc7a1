// The demo builder's garage: one car with a hillclimb build sheet that carries a full cage model
// (main hoop with backstays, harness bar, front hoop with roof rails, a door bar each side and a
// diagonal), generated from a tape's dimensions with the rulebook's lightest listed tube sizes.
// Insert-if-missing: a car of that name in the builder's garage is left as it is. Invented car.
import type { DataSource } from 'typeorm';
import type { Specification } from '../contracts/specification';
import { compileRuleset, validateRulesetDocument } from '../domain';
import { startingShape } from '../domain/geometry/starting-shapes';
import type { SizeFor, StartingChoices, StartingDimensions } from '../domain/geometry/starting-shapes';
import { startingSizes } from '../domain/tube-choice';
import { Car, Rulebook, RulesetVersion } from '../entities';
import { createBuildSheetService } from '../services/build-sheets.service';
import { createGarageService } from '../services/garage.service';
import type { SeedStep } from './seed';
import { demoPeople } from './seed-data';

export const DEMO_CAR_NAME = 'Heron grey hillclimb saloon';
export const DEMO_SHEET_NAME = 'Hill cage, drawn';
const RULEBOOK_SLUG = 'tarnwick-vale-mc-hillclimb-2027-metric';
const CLASS_ID = 'hill-saloon';
const WEIGHT_WITHOUT_DRIVER_KG = 960;

export const DEMO_CHOICES: StartingChoices = { harnessBar: true, front: 'front_hoop', doorBars: 'straight', diagonal: 'main_hoop' };
export const DEMO_DIMENSIONS: StartingDimensions = {
  hoopWidthAtFeetMm: 1240, hoopWidthAtTopMm: 1060, hoopHeightMm: 1140, hoopLeanDeg: 6,
  frontHoopForwardMm: 1350, backstayLandingBehindMm: 950, backstayLandingHeightMm: 320, doorBarHeightMm: 460, harnessBarHeightMm: 640,
};

export function demoSpecification(sizeFor: SizeFor): Specification {
  const r = startingShape(DEMO_CHOICES, DEMO_DIMENSIONS, sizeFor);
  if (!r.ok) throw new Error(`The demo cage's dimensions do not make a cage: ${JSON.stringify(r.problems)}`);
  return {
    vehicle: {
      classId: CLASS_ID, weightWithoutDriverKg: WEIGHT_WITHOUT_DRIVER_KG, chassis: 'unibody', cockpit: 'closed', fuel: 'petrol',
      driverSide: 'right', driverShoulderHeightMm: 860, helmet: { xMm: 230, yMm: -330, zMm: 930, radiusMm: 140 },
    },
    model: { nodes: r.shape.nodes },
    members: r.shape.members.map((m) => ({ ...m, material: 'mild_steel' as const, process: 'cds' as const, yieldMpa: 350 })),
    welding: { process: 'tig' },
  };
}

export const demoGarageStep: SeedStep = {
  name: 'demo garage (a build sheet with a cage model)',
  async run(ds: DataSource, ctx) {
    const builderEmail = demoPeople.find((p) => p.roles.includes('builder') && p.roles.length === 1)!.email;
    const builder = ctx.usersByEmail.get(builderEmail);
    if (!builder) return;
    if (await ds.getRepository(Car).findOneBy({ ownerId: builder.id, name: DEMO_CAR_NAME })) return;
    const rulebook = await ds.getRepository(Rulebook).findOneBy({ clubId: ctx.club.id, slug: RULEBOOK_SLUG });
    if (!rulebook) return;
    const version = await ds.getRepository(RulesetVersion).findOne({ where: { rulebookId: rulebook.id, status: 'published' } });
    if (!version) return;
    const v = validateRulesetDocument(version.document);
    if (!v.ok) throw new Error(`${RULEBOOK_SLUG} is not valid: ${JSON.stringify(v.problems)}`);
    // The same sizes "Start from a shape" gives in the browser: the class's lightest listed sizes.
    const spec = demoSpecification(startingSizes(compileRuleset(v.document), CLASS_ID, { weightWithoutDriverKg: WEIGHT_WITHOUT_DRIVER_KG }).sizeFor);
    const car = await createGarageService(ds).create(builder.id, { name: DEMO_CAR_NAME, chassisType: 'unibody', raceNumber: '27' });
    await createBuildSheetService(ds).create(car.id, builder.id, { name: DEMO_SHEET_NAME, clubId: ctx.club.id, rulesetVersionId: version.id, classId: CLASS_ID, specification: spec });
  },
};
