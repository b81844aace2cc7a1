// The ruleset diff: real before/after pairs made by editing a copy of the Tarnwick Vale demo
// documents, one edit per row, with the exact sentence a reader sees.
import { readFileSync } from 'node:fs';
import { describe, expect, test } from 'vitest';
import { describeRulesetChanges } from '@backend/domain/rulebook/diff';
import type { RulesetChange } from '@backend/domain/rulebook/diff';
import { changedJsonPaths, groupThousands } from '@backend/domain/rulebook/diff-format';
import { validateRulesetDocument } from '@backend/domain/rules/validate';
import type { RulesetDocument } from '@backend/contracts/ruleset';

// The documents are plain JSON; the edits below reach into them freely.
type Json = any; // eslint-disable-line @typescript-eslint/no-explicit-any -- test edits walk untyped JSON

const load = (name: string): Json =>
  JSON.parse(readFileSync(new URL(`../../../../rulesets/${name}`, import.meta.url), 'utf8'));
const IMPERIAL = load('tarnwick-vale-mc-cage-regulations-2027.json');
const METRIC = load('tarnwick-vale-mc-hillclimb-2027-metric.json');

function valid(json: unknown): RulesetDocument {
  const v = validateRulesetDocument(json);
  if (!v.ok) throw new Error(`edited document is invalid: ${JSON.stringify(v.problems)}`);
  return v.document;
}

const req = (doc: Json, id: string): Json => {
  const r = doc.requirements.find((x: Json) => x.id === id);
  if (!r) throw new Error(`no requirement ${id}`);
  return r;
};

function changes(edit: (doc: Json) => void, base: Json = IMPERIAL, options = {}): RulesetChange[] {
  const after = structuredClone(base);
  edit(after);
  return describeRulesetChanges(valid(base), valid(after), options);
}
const texts = (edit: (doc: Json) => void, base?: Json, options = {}) =>
  changes(edit, base, options).map((c) => c.text);

describe('identical documents', () => {
  test.each([
    ['imperial', IMPERIAL],
    ['metric', METRIC],
  ])('%s: no changes', (_n, doc) => {
    expect(describeRulesetChanges(valid(doc), valid(structuredClone(doc)))).toEqual([]);
  });
});

describe('rulebook identity and policy', () => {
  test.each<[string, (d: Json) => void, string]>([
    [
      'edition',
      (d) => {
        d.rulebook.edition = '2028';
      },
      'Rulebook edition 2027 → 2028',
    ],
    [
      'title',
      (d) => {
        d.rulebook.title = 'TVMC Cage Rules';
      },
      "Rulebook title 'Tarnwick Vale MC Cage Regulations' → 'TVMC Cage Rules'",
    ],
    [
      'publisher',
      (d) => {
        d.rulebook.publisher = 'Tarnwick Vale Motor Club Ltd';
      },
      "Publisher 'Tarnwick Vale Motor Club' → 'Tarnwick Vale Motor Club Ltd'",
    ],
    [
      'effective date',
      (d) => {
        d.rulebook.effectiveDate = '2027-02-01';
      },
      'Effective date 2026-11-01 → 2027-02-01',
    ],
    [
      'link added',
      (d) => {
        d.rulebook.url = 'https://tarnwick-vale.example/cage';
      },
      'Link to the rulebook added: https://tarnwick-vale.example/cage',
    ],
    [
      'length tolerance',
      (d) => {
        d.measurementTolerance.length = 0.005;
      },
      'Measurement tolerance for length 0.002 in → 0.005 in',
    ],
    [
      'angle tolerance removed',
      (d) => {
        delete d.measurementTolerance.angle;
      },
      'Measurement tolerance for angle 0.5° removed',
    ],
    [
      'mass tolerance added',
      (d) => {
        d.measurementTolerance.mass = 10;
      },
      'Measurement tolerance for mass 10.0 lb added',
    ],
    [
      'printed equivalents accepted',
      (d) => {
        d.acceptPrintedEquivalents = true;
      },
      'Printed equivalent sizes now accepted',
    ],
    [
      'printed equivalent added',
      (d) => {
        d.printedEquivalents.push({
          size: { od: 1.5, wall: 0.095 },
          printedAs: { od: 38, wall: 2.4, unit: 'mm' },
        });
      },
      'Printed equivalent for 1.500 × 0.095 in added: 1.496 × 0.094 in',
    ],
  ])('%s', (_name, edit, text) => {
    expect(texts(edit)).toEqual([text]);
  });

  test('metric document: printed equivalent changed, note changed, one added and (reversed) removed', () => {
    const after = structuredClone(METRIC);
    after.printedEquivalents[1].printedAs.wall = 0.098;
    after.printedEquivalents[1].note = 'Accepted until 2028.';
    after.printedEquivalents.push({
      size: { od: 50, wall: 2 },
      printedAs: { od: 2, wall: 0.079, unit: 'in' },
    });
    // F-UNIT-1: 1.5 in = 38.1 mm, 0.095 in = 2.413 mm, 0.098 in = 2.489 mm, 2 in = 50.8 mm, 0.079 in = 2.007 mm
    expect(describeRulesetChanges(valid(METRIC), valid(after)).map((c) => c.text)).toEqual([
      'Printed equivalent for 38.0 × 2.50 mm: 38.1 × 2.41 mm → 38.1 × 2.49 mm',
      'Note on the printed equivalent for 38.0 × 2.50 mm changed',
      'Printed equivalent for 50.0 × 2.00 mm added: 50.8 × 2.01 mm',
    ]);
    expect(describeRulesetChanges(valid(after), valid(METRIC)).map((c) => c.text)).toContain(
      'Printed equivalent for 50.0 × 2.00 mm removed (was 50.8 × 2.01 mm)',
    );
  });

  test('rewriting the rulebook in metric with the same values reads as a change of units only', () => {
    const after = structuredClone(IMPERIAL);
    after.unitSystem = 'metric';
    after.measurementTolerance = { length: 0.002 * 25.4, angle: 0.5 };
    // Every length and weight of the document converted exactly: 1 in = 25.4 mm, 1 lb = 0.45359237 kg (F-UNIT-1).
    for (const r of after.requirements) {
      const q = r.requires;
      if (q.template === 'tube_table') {
        q.weightUnit = 'lb';
        for (const band of q.bands)
          for (const row of band.rows)
            for (const alt of row.alternatives) {
              alt.od *= 25.4;
              alt.wall *= 25.4;
            }
        const thin = q.allowances?.thinWallWhenOdExceedsMinimum;
        if (thin) {
          thin.odMargin *= 25.4;
          thin.minWall *= 25.4;
        }
        if (q.allowances?.wallAllowance) q.allowances.wallAllowance.value *= 25.4;
      }
      // Proportional limits (k × another fact) carry k's unit inside their value, if any, and keep it.
      if (q.template === 'limit')
        for (const c of q.checks) if (/Mm$/.test(c.fact) && c.unit === undefined && typeof c.value === 'number') c.unit = 'in';
      if (q.template === 'limit')
        for (const c of q.checks)
          if (/Mm2$/.test(c.fact) && typeof c.value === 'number') {
            c.value *= 645.16;
            c.unit = 'mm2';
          }
    }
    // Raw conditions keep their numbers in the document's units: the bolted-plate rule's 0.375 now
    // means 0.375 mm, and the diff says so instead of staying silent.
    expect(describeRulesetChanges(valid(IMPERIAL), valid(after)).map((c) => c.text)).toEqual([
      'Rulebook units imperial → metric',
      'C6.1.2 conditions now read in metric units (numbers unchanged)',
      'C8.1.1 conditions on when it applies now read in metric units (numbers unchanged)',
    ]);
  });
});

describe('classes', () => {
  test.each<[string, (d: Json) => void, RulesetChange[]]>([
    [
      'renamed',
      (d) => {
        d.classes[1].name = 'Club Saloon';
      },
      [
        {
          area: 'class',
          kind: 'changed',
          classId: 'club-saloon',
          text: "Class 'Club Saloon (full cage)' renamed 'Club Saloon'",
          before: 'Club Saloon (full cage)',
          after: 'Club Saloon',
        },
      ],
    ],
    [
      'weight basis',
      (d) => {
        d.classes[0].weightBasis = 'with_driver';
      },
      [
        {
          area: 'class',
          kind: 'changed',
          classId: 'open-sprint',
          text: "Class 'Open Sprint (roll bar)' now weighed with driver (was without driver)",
          before: 'without driver',
          after: 'with driver',
        },
      ],
    ],
    [
      'description',
      (d) => {
        d.classes[2].description = 'Tube-frame specials.';
      },
      [
        expect.objectContaining({
          kind: 'changed',
          classId: 'heavy-special',
          text: "Description of class 'Heavy Special (tube frame)' changed",
          after: 'Tube-frame specials.',
        }),
      ],
    ],
    [
      'added',
      (d) => {
        d.classes.push({ id: 'historic', name: 'Historic Saloon', weightBasis: 'with_driver' });
      },
      [
        {
          area: 'class',
          kind: 'added',
          classId: 'historic',
          text: "Class 'Historic Saloon' added",
          after: 'Historic Saloon',
        },
      ],
    ],
  ])('%s', (_name, edit, expected) => {
    expect(changes(edit)).toEqual(expected);
  });

  test('a class removed with the requirements that named only it', () => {
    const t = texts((d) => {
      d.classes.shift();
      d.requirements = d.requirements.filter(
        (r: Json) => !(r.appliesTo?.classes?.length === 1 && r.appliesTo.classes[0] === 'open-sprint'),
      );
      req(d, 'tv-no-chromoly').appliesTo.classes = ['club-saloon'];
    });
    expect(t).toEqual([
      "Class 'Open Sprint (roll bar)' removed",
      'C4.1.1 now applies to Club Saloon (full cage) (was Open Sprint (roll bar), Club Saloon (full cage))',
      "Requirement C3.1.1 'Roll bar: main hoop and two rear braces' removed (Open Sprint (roll bar))",
      "Requirement C4.2.1 'Roll bar tube sizes by weight' removed (Open Sprint (roll bar))",
      "Requirement C5.1.3 'Main hoop at least 15 in wide inside' removed (Open Sprint (roll bar))",
    ]);
  });

  test('a class id changed (same name) reads as an id change, not remove + add', () => {
    const t = texts((d) => {
      d.classes[2].id = 'special';
      for (const r of d.requirements)
        if (r.appliesTo?.classes)
          r.appliesTo.classes = r.appliesTo.classes.map((c: string) =>
            c === 'heavy-special' ? 'special' : c,
          );
    });
    expect(t).toEqual(["Class 'Heavy Special (tube frame)' id heavy-special → special"]);
  });
});

describe('requirement identity', () => {
  test.each<[string, (d: Json) => void, string[]]>([
    [
      'title',
      (d) => {
        req(d, 'tv-hoop-width').title = 'Main hoop 15 in wide';
      },
      ["C5.1.3 title 'Main hoop at least 15 in wide inside' → 'Main hoop 15 in wide'"],
    ],
    [
      'renumbered',
      (d) => {
        req(d, 'tv-hoop-width').section = 'C5.1.4';
      },
      ["Requirement 'Main hoop at least 15 in wide inside' renumbered C5.1.3 → C5.1.4"],
    ],
    [
      'id changed',
      (d) => {
        req(d, 'tv-hoop-width').id = 'tv-width';
      },
      ['C5.1.3 id tv-hoop-width → tv-width'],
    ],
    [
      'severity',
      (d) => {
        req(d, 'tv-padding').severity = 'mandatory';
      },
      ['C8.1.1 is now mandatory (was advisory)'],
    ],
    [
      'area',
      (d) => {
        req(d, 'tv-process').area = 'tubes';
      },
      ['C4.1.2 moved from material to tubes'],
    ],
    [
      'explanation',
      (d) => {
        req(d, 'tv-saloon-tubes').explanation = 'Sized by weight with driver.';
      },
      ['Explanation of C4.2.2 changed'],
    ],
    [
      'member scope',
      (d) => {
        req(d, 'tv-main-hoop-one-piece').scope.memberKinds.push('front_hoop');
      },
      ['C5.1.1 now checks each main hoop or front hoop (was each main hoop)'],
    ],
    [
      'classes widened to all',
      (d) => {
        delete req(d, 'tv-hoop-width').appliesTo;
      },
      ['C5.1.3 now applies to every class (was Open Sprint (roll bar))'],
    ],
    [
      'when added',
      (d) => {
        req(d, 'tv-hoop-width').appliesTo.when = {
          all: [{ fact: 'vehicle.cockpit', operator: 'equal', value: 'open' }],
        };
      },
      ['C5.1.3 now applies only when its conditions hold'],
    ],
    [
      'when removed',
      (d) => {
        delete req(d, 'tv-bends').appliesTo;
      },
      ['C4.4.1 no longer has conditions on when it applies'],
    ],
    [
      'when changed',
      (d) => {
        req(d, 'tv-padding').appliesTo.when.all[0].value = 4;
      },
      ['C8.1.1 conditions on when it applies changed (all.0.value)'],
    ],
    [
      'added',
      (d) => {
        d.requirements.push({
          id: 'tv-dash',
          title: 'Dash bar',
          section: 'C3.2.2',
          severity: 'advisory',
          area: 'members',
          scope: { kind: 'vehicle' },
          appliesTo: { classes: ['club-saloon'] },
          requires: { template: 'required_members', members: [{ kinds: ['dash_bar'], min: 1 }] },
          explanation: 'A dash bar is recommended.',
        });
      },
      ["Requirement C3.2.2 'Dash bar' added (Club Saloon (full cage))"],
    ],
    [
      'template rewritten',
      (d) => {
        req(d, 'tv-main-hoop-one-piece').requires = {
          template: 'conditions',
          conditions: { all: [{ fact: 'member.jointCount', operator: 'equal', value: 0 }] },
        };
      },
      ['C5.1.1 rule rewritten: limits → conditions'],
    ],
  ])('%s', (_name, edit, expected) => {
    expect(texts(edit)).toEqual(expected);
  });

  test('a removed requirement carries its id, area and class', () => {
    expect(
      changes((d) => {
        d.requirements = d.requirements.filter((r: Json) => r.id !== 'tv-hoop-width');
      }),
    ).toEqual([
      {
        area: 'geometry',
        kind: 'removed',
        requirementId: 'tv-hoop-width',
        classId: 'open-sprint',
        classIds: ['open-sprint'],
        text: "Requirement C5.1.3 'Main hoop at least 15 in wide inside' removed (Open Sprint (roll bar))",
      },
    ]);
  });
});

describe('tube tables', () => {
  test.each<[string, (d: Json) => void, string[]]>([
    [
      'wall raised for one size',
      (d) => {
        req(d, 'tv-saloon-tubes').requires.bands[0].rows[0].alternatives[0].wall = 0.12;
      },
      [
        'Club Saloon (full cage): C4.2.2 band up to 2,200 lb, mild steel: minimum wall for 1.500 in OD 0.095 → 0.120 in',
      ],
    ],
    [
      'alternative added',
      (d) => {
        req(d, 'tv-saloon-tubes').requires.bands[1].rows[0].alternatives.push({ od: 1.625, wall: 0.08 });
      },
      [
        'Club Saloon (full cage): C4.2.2 band 2,201 – 3,000 lb, mild steel: alternative 1.625 × 0.080 in added',
      ],
    ],
    [
      'alternative removed',
      (d) => {
        req(d, 'tv-sprint-tubes').requires.bands[0].rows[0].alternatives.pop();
      },
      [
        'Open Sprint (roll bar): C4.2.1 band up to 1,500 lb, mild steel: alternative 1.625 × 0.083 in removed',
      ],
    ],
    [
      'alternative replaced by another OD',
      (d) => {
        req(d, 'tv-heavy-tubes').requires.bands[1].rows[0].alternatives[0] = { od: 1.875, wall: 0.12 };
      },
      [
        'Heavy Special (tube frame): C4.2.3 band over 3,500 lb, mild steel: alternative 1.875 × 0.120 in added',
        'Heavy Special (tube frame): C4.2.3 band over 3,500 lb, mild steel: alternative 2.000 × 0.120 in removed',
      ],
    ],
    [
      'alternative labelled',
      (d) => {
        req(d, 'tv-secondary-tubes').requires.bands[0].rows[1].alternatives[0].label = '1-3/8 × .083';
      },
      [
        "Club Saloon (full cage), Heavy Special (tube frame): C4.3.1 all weights, 4130 chromoly: label of 1.375 × 0.083 in '' → '1-3/8 × .083'",
      ],
    ],
    [
      'band limit moved',
      (d) => {
        req(d, 'tv-sprint-tubes').requires.bands[0].upTo = 1600;
        req(d, 'tv-sprint-tubes').requires.bands[0].label = 'up to 1,600 lb';
      },
      [
        'Open Sprint (roll bar): C4.2.1 band 1 upper weight 1,500 lb → 1,600 lb',
        "Open Sprint (roll bar): C4.2.1 band 1 label 'up to 1,500 lb' → 'up to 1,600 lb'",
      ],
    ],
    [
      'band added',
      (d) => {
        const bands = req(d, 'tv-sprint-tubes').requires.bands;
        bands[1].upTo = 2000;
        bands.push({ rows: [{ materials: ['mild_steel'], alternatives: [{ od: 1.75, wall: 0.12 }] }] });
      },
      [
        'Open Sprint (roll bar): C4.2.1 band 2 upper weight no upper weight → 2,000 lb',
        'Open Sprint (roll bar): C4.2.1 band over 2,000 lb added (mild steel: 1.750 × 0.120 in)',
      ],
    ],
    [
      'band removed',
      (d) => {
        const bands = req(d, 'tv-saloon-tubes').requires.bands;
        bands.pop();
        delete bands[1].upTo;
      },
      [
        'Club Saloon (full cage): C4.2.2 band 2 upper weight 3,000 lb → no upper weight',
        'Club Saloon (full cage): C4.2.2 band over 3,000 lb removed',
      ],
    ],
    [
      'row added',
      (d) => {
        req(d, 'tv-sprint-tubes').requires.bands[0].rows.push({
          materials: ['chromoly_4130'],
          processes: ['cds'],
          alternatives: [{ od: 1.375, wall: 0.083 }],
        });
      },
      [
        'Open Sprint (roll bar): C4.2.1 band up to 1,500 lb: sizes for 4130 chromoly (CDS) added (1.375 × 0.083 in)',
      ],
    ],
    [
      'row removed',
      (d) => {
        req(d, 'tv-heavy-tubes').requires.bands[0].rows.pop();
      },
      [
        'Heavy Special (tube frame): C4.2.3 band up to 3,500 lb: sizes for 4130 chromoly removed (1.625 × 0.083 in, 1.750 × 0.083 in)',
      ],
    ],
    [
      'thin-wall allowance changed',
      (d) => {
        req(d, 'tv-saloon-tubes').requires.allowances.thinWallWhenOdExceedsMinimum.odMargin = 0.125;
      },
      ['Club Saloon (full cage): C4.2.2 thin-wall allowance OD margin 0.250 → 0.125 in'],
    ],
    [
      'thin-wall allowance removed',
      (d) => {
        delete req(d, 'tv-saloon-tubes').requires.allowances;
      },
      [
        'Club Saloon (full cage): C4.2.2 thin-wall allowance removed (an OD 0.250 in over the band minimum may use 0.095 in wall)',
      ],
    ],
    [
      'wall allowance changed',
      (d) => {
        req(d, 'tv-heavy-tubes').requires.allowances.wallAllowance.value = 0.01;
      },
      ['Heavy Special (tube frame): C4.2.3 wall allowance 0.005 → 0.010 in'],
    ],
    [
      'wall allowance added',
      (d) => {
        req(d, 'tv-sprint-tubes').requires.allowances = { wallAllowance: { value: 0.004 } };
      },
      ['Open Sprint (roll bar): C4.2.1 wall allowance of 0.004 in added'],
    ],
  ])('%s', (_name, edit, expected) => {
    expect(texts(edit)).toEqual(expected);
  });

  test('a size rewritten in other units with the same value is no change (F-UNIT-1: 1.5 in = 38.1 mm exactly)', () => {
    expect(
      texts((d) => {
        req(d, 'tv-sprint-tubes').requires.bands[0].rows[0].alternatives[0] = {
          od: 38.1,
          wall: 2.413,
          unit: 'mm',
        };
      }),
    ).toEqual([]);
  });

  test("the reader's unit system formats the values (metric reader of an imperial rulebook)", () => {
    expect(
      texts(
        (d) => {
          req(d, 'tv-saloon-tubes').requires.bands[0].rows[0].alternatives[0].wall = 0.12;
          req(d, 'tv-saloon-tubes').requires.bands[0].upTo = 2300;
        },
        IMPERIAL,
        { unitSystem: 'metric' },
      ),
    ).toEqual([
      // F-UNIT-1: 2,200 lb = 997.9 kg, 2,300 lb = 1,043.3 kg; 1.500 in = 38.1 mm; 0.095 in = 2.413 mm; 0.120 in = 3.048 mm
      'Club Saloon (full cage): C4.2.2 band 1 upper weight 998 kg → 1,043 kg',
      'Club Saloon (full cage): C4.2.2 band up to 2,200 lb, mild steel: minimum wall for 38.1 mm OD 2.41 → 3.05 mm',
    ]);
  });

  test('metric rulebook, imperial reader: a band-free table change', () => {
    expect(
      texts(
        (d) => {
          req(d, 'hc-main-tubes').requires.bands[0].rows[0].alternatives[1].wall = 2.5;
        },
        METRIC,
        { unitSystem: 'imperial' },
      ),
    ).toEqual([
      // F-UNIT-1: 50 mm = 1.969 in; 2.0 mm = 0.079 in; 2.5 mm = 0.098 in
      'H2.1.1 all weights, mild steel: minimum wall for 1.969 in OD 0.079 → 0.098 in',
    ]);
  });
});

describe('required members', () => {
  test.each<[string, (d: Json) => void, string[]]>([
    [
      'now required',
      (d) => {
        req(d, 'tv-rollbar-members').requires.members.push({ kinds: ['door_bar'], min: 2 });
      },
      ['Open Sprint (roll bar): C3.1.1 door bar now required (at least 2)'],
    ],
    [
      'minimum raised',
      (d) => {
        req(d, 'tv-cage-members').requires.members[3].min = 4;
      },
      ['Club Saloon (full cage), Heavy Special (tube frame): C3.2.1 door bar: at least 2 → at least 4'],
    ],
    [
      'maximum added',
      (d) => {
        req(d, 'tv-rollbar-members').requires.members[1].max = 2;
      },
      ['Open Sprint (roll bar): C3.1.1 rear brace (backstay): at least 2 → exactly 2'],
    ],
    [
      'no longer required',
      (d) => {
        req(d, 'tv-cage-members').requires.members.splice(4, 1);
      },
      [
        'Club Saloon (full cage), Heavy Special (tube frame): C3.2.1 diagonal no longer required (was at least 1)',
      ],
    ],
    [
      'minimum to zero',
      (d) => {
        req(d, 'tv-cage-members').requires.members[5].min = 0;
        req(d, 'tv-cage-members').requires.members[5].max = 1;
      },
      [
        'Club Saloon (full cage), Heavy Special (tube frame): C3.2.1 harness bar no longer required (at most 1)',
      ],
    ],
    [
      'kinds of an entry changed',
      (d) => {
        req(d, 'tv-cage-members').requires.members[1].kinds = ['front_hoop'];
      },
      [
        'Club Saloon (full cage), Heavy Special (tube frame): C3.2.1 front hoop now required (at least 1)',
        'Club Saloon (full cage), Heavy Special (tube frame): C3.2.1 front hoop or halo hoop no longer required (was at least 1)',
      ],
    ],
    [
      'label',
      (d) => {
        req(d, 'tv-cage-members').requires.members[1].label = 'front hoop';
      },
      [
        "Club Saloon (full cage), Heavy Special (tube frame): C3.2.1 front hoop or halo hoop: label 'front or halo hoop' → 'front hoop'",
      ],
    ],
  ])('%s', (_name, edit, expected) => {
    expect(texts(edit)).toEqual(expected);
  });
});

describe('limits', () => {
  test.each<[string, (d: Json) => void, string[]]>([
    [
      'length value',
      (d) => {
        req(d, 'tv-helmet-open').requires.checks[0].value = 3;
      },
      ['C5.3.1 main hoop top above helmet top at least 2.000 in → 3.000 in'],
    ],
    [
      'angle value',
      (d) => {
        req(d, 'tv-brace-geometry').requires.checks[1].value = 35;
      },
      ['C5.2.1 rear brace angle from vertical at least 30.0° → 35.0°'],
    ],
    [
      'ratio value',
      (d) => {
        req(d, 'tv-bends').requires.checks[1].value = 0.92;
      },
      ['C4.4.1 worst ovality (min ÷ max OD) at least 0.90 → 0.92'],
    ],
    [
      'one of a range on one fact',
      (d) => {
        req(d, 'tv-harness-bar').requires.checks[1].value = 3;
      },
      [
        'Club Saloon (full cage), Heavy Special (tube frame): C5.4.1 harness bar below the shoulders at most 4.000 in → 3.000 in',
      ],
    ],
    [
      'operator',
      (d) => {
        req(d, 'tv-brace-geometry').requires.checks[0].operator = 'below';
      },
      ['C5.2.1 rear brace attachment below main hoop top at most 6.000 in → less than 6.000 in'],
    ],
    [
      'boolean',
      (d) => {
        req(d, 'tv-main-hoop-one-piece').requires.checks[0].value = false;
      },
      ['C5.1.1 one continuous piece must be yes → no'],
    ],
    [
      'area in its own unit',
      (d) => {
        req(d, 'tv-plates-welded').requires.checks[3].value = 150;
      },
      ['C6.1.1 plate area at most 144.00 in² → 150.00 in²'],
    ],
    [
      'added',
      (d) => {
        req(d, 'tv-brace-geometry').requires.checks.push({
          fact: 'vehicle.memberCounts',
          path: 'diagonal',
          operator: 'atLeast',
          value: 1,
        });
      },
      ['C5.2.1 new limit: number of members of a kind: diagonal at least 1'],
    ],
    [
      'removed',
      (d) => {
        req(d, 'tv-inspection-hole').requires.checks.pop();
      },
      ['C9.1.1 limit removed: inspection hole distance from weld or bend at least 3.000 in'],
    ],
    [
      'label',
      (d) => {
        req(d, 'tv-hoop-width').requires.checks[0].label = 'inside width';
      },
      ["Open Sprint (roll bar): C5.1.3 limit label '' → 'inside width'"],
    ],
  ])('%s', (_name, edit, expected) => {
    expect(texts(edit)).toEqual(expected);
  });

  test('a limit in the metric rulebook, shown to an imperial reader', () => {
    // F-UNIT-1: 120 cm² = 18.60 in², 150 cm² = 23.25 in²
    expect(
      texts(
        (d) => {
          req(d, 'hc-feet').requires.checks[1].value = 150;
        },
        METRIC,
        { unitSystem: 'imperial' },
      ),
    ).toEqual(['H4.1.1 plate area at least 18.60 in² → 23.25 in²']);
  });
});

describe('allowed values and raw conditions', () => {
  test.each<[string, (d: Json) => void, string[]]>([
    [
      'value allowed',
      (d) => {
        req(d, 'tv-process').requires.values.push('erw');
      },
      ['C4.1.2 tube process: ERW now allowed'],
    ],
    [
      'value no longer forbidden',
      (d) => {
        req(d, 'tv-no-chromoly').requires.values = ['chromoly_4130'];
      },
      ['Open Sprint (roll bar), Club Saloon (full cage): C4.1.1 material: other no longer forbidden'],
    ],
    [
      'mode',
      (d) => {
        req(d, 'tv-4130-tig').requires.mode = 'forbidden';
        req(d, 'tv-4130-tig').requires.values = ['mig', 'stick', 'gas'];
      },
      [
        'Heavy Special (tube frame): C7.1.1 welding process: the list now names forbidden values (was allowed); forbidden: MIG, stick, gas',
      ],
    ],
    [
      'fact',
      (d) => {
        req(d, 'tv-process').requires.fact = 'member.material';
        req(d, 'tv-process').requires.values = ['mild_steel'];
      },
      ['C4.1.2 now checks material (was tube process); allowed: mild steel'],
    ],
    [
      'conditions',
      (d) => {
        const all = req(d, 'tv-plates-bolted').requires.conditions.all;
        all[1].value = 6;
        all.push({ fact: 'plate.backingThicknessMm', operator: 'greaterThanInclusive', value: 0.08 });
      },
      ['C6.1.2 conditions changed (all.1.value, all.4)'],
    ],
  ])('%s', (_name, edit, expected) => {
    expect(texts(edit)).toEqual(expected);
  });

  test('conditions changes list their paths', () => {
    const [c] = changes((d) => {
      req(d, 'tv-padding').requires.conditions.all[1].value = ['sfi_45_1'];
    });
    expect(c).toMatchObject({
      kind: 'changed',
      area: 'padding',
      requirementId: 'tv-padding',
      paths: ['all.1.value.1'],
    });
  });
});

describe('equivalence by strength (docs/rulesets.md)', () => {
  test.each([
    ['omitted → switched off with nothing set: no change', (d: Json) => { d.strengthEquivalents = { accept: false, measure: 'section_modulus' }; }, []],
    ['accepted by section modulus', (d: Json) => { d.strengthEquivalents = { accept: true, measure: 'section_modulus' }; }, ['Equivalents by strength now accepted, by section modulus']],
    [
      'accepted by bending strength at 50,763 psi (350 MPa, F-MSUK-1)',
      (d: Json) => { d.strengthEquivalents = { accept: true, measure: 'bending_strength', listedYield: { value: 350, unit: 'MPa' } }; },
      ['Equivalents by strength now accepted, by bending strength (yield × Z)', 'Yield the listed sizes are taken at, for equivalence by strength: 50,763 psi added'],
    ],
    ['advice only, by bending strength', (d: Json) => { d.strengthEquivalents = { accept: false, measure: 'bending_strength', listedYield: { value: 50000 } }; }, ['Equivalence by strength judged by section modulus → bending strength (yield × Z) (advice only)', 'Yield the listed sizes are taken at, for equivalence by strength: 50,000 psi added']],
    ['a least wall', (d: Json) => { d.strengthEquivalents = { accept: false, measure: 'section_modulus', minWall: { value: 0.083 } }; }, ['Least wall of an equivalent by strength: 0.083 in added']],
  ])('%s', (_name, edit, expected) => {
    expect(texts(edit)).toEqual(expected);
  });
  test('switched off again, and a yield written in another unit that is the same is no change', () => {
    const on = structuredClone(IMPERIAL);
    on.strengthEquivalents = { accept: true, measure: 'bending_strength', listedYield: { value: 350, unit: 'MPa' } };
    expect(texts((d) => { d.strengthEquivalents.accept = false; }, on)).toEqual(['Equivalents by strength no longer accepted (advice only)']);
    expect(texts((d) => { d.strengthEquivalents.listedYield = { value: 350, unit: 'N/mm2' }; }, on)).toEqual([]);
  });
});

describe('order and combination', () => {
  const edit = (d: Json) => {
    d.requirements = d.requirements.filter((r: Json) => r.id !== 'tv-brace-geometry');
    req(d, 'tv-saloon-tubes').explanation = 'Revised.';
    req(d, 'tv-saloon-tubes').requires.bands[0].rows[0].alternatives[0].wall = 0.12;
    d.classes[1].name = 'Club Saloon';
    d.rulebook.edition = '2028';
    d.acceptPrintedEquivalents = true;
  };

  test('identity, policy, classes, then requirements in document order, removed last', () => {
    expect(texts(edit)).toEqual([
      'Rulebook edition 2027 → 2028',
      'Printed equivalent sizes now accepted',
      "Class 'Club Saloon (full cage)' renamed 'Club Saloon'",
      'Club Saloon: C4.2.2 band up to 2,200 lb, mild steel: minimum wall for 1.500 in OD 0.095 → 0.120 in',
      'Explanation of C4.2.2 changed',
      "Requirement C5.2.1 'Rear braces near the hoop top, at 30° or more' removed",
    ]);
  });

  test('the same pair gives the same list every time', () => {
    expect(changes(edit)).toEqual(changes(edit));
  });

  test('reversed, every addition is a removal', () => {
    const after = structuredClone(IMPERIAL);
    edit(after);
    const forward = describeRulesetChanges(valid(IMPERIAL), valid(after));
    const back = describeRulesetChanges(valid(after), valid(IMPERIAL));
    expect(back.filter((c) => c.kind === 'added')).toHaveLength(
      forward.filter((c) => c.kind === 'removed').length,
    );
  });
});

describe('helpers', () => {
  test.each([
    ['2200 lb', '2,200 lb'],
    ['998 kg', '998 kg'],
    ['1043.3 mm²', '1,043.3 mm²'],
    ['1234567', '1,234,567'],
    ['0.095 in', '0.095 in'],
  ])('groupThousands(%j)', (a, b) => {
    expect(groupThousands(a)).toBe(b);
  });

  test.each<[unknown, unknown, string[]]>([
    [{ all: [1, 2] }, { all: [1, 3] }, ['all.1']],
    [{ all: [1] }, { all: [1, 2] }, ['all.1']],
    [{ a: 1 }, { b: 1 }, ['a', 'b']],
    [1, 2, ['(whole)']],
    [{ a: { b: [true] } }, { a: { b: [true] } }, []],
  ])('changedJsonPaths %j %j', (a, b, paths) => {
    expect(changedJsonPaths(a, b)).toEqual(paths);
  });
});
