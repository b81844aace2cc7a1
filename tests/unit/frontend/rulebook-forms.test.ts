// Editor controls of the new rule forms (issue 9 §3): a proportional limit, a grade floor, member
// against member, measured walls and the thin-wall reading, each edited without JSON and written
// straight into the draft document; problems shown beside the control they concern.
import { mount } from '@vue/test-utils';
import PrimeVue from 'primevue/config';
import { describe, expect, it } from 'vitest';
import { reactive } from 'vue';
import RulebookLimits from '@/components/rulebook/RulebookLimits.vue';
import RulebookMemberMatch from '@/components/rulebook/RulebookMemberMatch.vue';
import RulebookTubeTable from '@/components/rulebook/RulebookTubeTable.vue';
import type { MemberMatch, Requires, TubeTable } from '../../../backend/src/contracts/ruleset';

type Limit = Extract<Requires, { template: 'limit' }>;
const global = { plugins: [[PrimeVue, { theme: 'none' }]] as [typeof PrimeVue, object][] };

describe('RulebookLimits: proportional limits and grades', () => {
  const mountLimits = (model: Limit, problems: { path: string; message: string }[] = []) =>
    mount(RulebookLimits, { props: { modelValue: model, readOnly: false, unitSystem: 'imperial', scope: 'plate', path: 'requirements.2.requires', problems }, global });

  it('turns a fixed plate side into 2 × the attached tube OD, and an area into k (in) × OD', async () => {
    const model = reactive<Limit>({ template: 'limit', checks: [
      { fact: 'plate.leastSideMm', operator: 'atLeast', value: 3 },
      { fact: 'plate.areaMm2', operator: 'atLeast', value: 15 },
    ] });
    const w = mountLimits(model);
    await w.get('select[aria-label="Shortest plate side: kind of limit"]').setValue('times');
    await w.get('select[aria-label="Shortest plate side: multiple of"]').setValue('plate.attachedOdMm');
    await w.get('input[aria-label="Shortest plate side: multiple (k)"]').setValue('2');
    expect(model.checks[0]).toEqual({ fact: 'plate.leastSideMm', operator: 'atLeast', value: { times: 2, of: 'plate.attachedOdMm' } });
    await w.get('select[aria-label="Plate area: kind of limit"]').setValue('times');
    await w.get('select[aria-label="Plate area: multiple of"]').setValue('plate.attachedOdMm');
    await w.get('input[aria-label="Plate area: multiple (k)"]').setValue('10');
    // An area as k × a length: k carries a length unit, the document's by default.
    expect(model.checks[1]).toEqual({ fact: 'plate.areaMm2', operator: 'atLeast', value: { times: 10, of: 'plate.attachedOdMm', unit: 'in' } });
    expect(w.text()).toContain('k is a length');
    // Only measurements k can bridge are offered: an area is not offered for a side.
    const options = w.get('select[aria-label="Shortest plate side: multiple of"]').findAll('option').map((o) => o.element.value);
    expect(options).toContain('plate.thicknessMm');
    expect(options).not.toContain('plate.areaMm2');
  });

  it('offers grades in strength order and writes the chosen name; shows a problem at its path', async () => {
    const model = reactive<Limit>({ template: 'limit', checks: [{ fact: 'plate.boltGrade', operator: 'atLeast', value: 'Grade 99' }] });
    const w = mountLimits(model, [{ path: 'requirements.2.requires.checks.0.value', message: '"Grade 99" is not a bolt grade in the vocabulary.' }]);
    expect(w.text()).toContain('"Grade 99" is not a bolt grade in the vocabulary.');
    const select = w.get('select[aria-label="Bolt grade: grade"]');
    const names = select.findAll('option').map((o) => o.element.value);
    expect(names.slice(1)).toEqual(['ISO 8.8', 'SAE Grade 5', 'SAE Grade 8', 'ISO 10.9', 'ISO 12.9']);
    await select.setValue('ISO 10.9');
    expect(model.checks[0]!.value).toBe('ISO 10.9');
  });
});

describe('RulebookLimits: adding and removing a limit without JSON', () => {
  const mountVehicle = (model: Limit) =>
    mount(RulebookLimits, { props: { modelValue: model, readOnly: false, unitSystem: 'imperial', scope: 'vehicle', path: 'requirements.5.requires', problems: [] }, global });

  it('adds "included angle at least 30°" beside the angle from vertical (F-SCCA-G1 writes its 30° as an included angle)', async () => {
    const model = reactive<Limit>({ template: 'limit', checks: [{ fact: 'geometry.rearBraceAttachBelowTopMm', operator: 'atMost', value: 6 }] });
    const w = mountVehicle(model);
    const add = w.get('select[aria-label="Add a limit on a measurement"]');
    const offered = add.findAll('option').map((o) => o.element.value);
    expect(offered).toEqual(expect.arrayContaining(['geometry.rearBraceIncludedAngleDeg', 'geometry.rearBraceAngleFromVerticalDeg', 'cage.approvedOn']));
    // Member and plate measurements belong to member and plate rules; counts by kind need the checklist.
    expect(offered).not.toContain('member.odMm');
    expect(offered).not.toContain('vehicle.memberCountOnSide');
    await add.setValue('geometry.rearBraceIncludedAngleDeg');
    expect(model.checks[1]).toEqual({ fact: 'geometry.rearBraceIncludedAngleDeg', operator: 'atLeast', value: 0 });
    await w.get('input[aria-label="Included angle between rear brace and main hoop (deg)"]').setValue('30');
    expect(model.checks[1]!.value).toBe(30);
    await w.get('button[aria-label="Remove the limit on rear brace attachment below main hoop top"]').trigger('click');
    expect(model.checks.map((c) => c.fact)).toEqual(['geometry.rearBraceIncludedAngleDeg']);
    // The last limit of a rule is not removed (the rule would check nothing).
    expect(w.find('button[aria-label^="Remove the limit"]').exists()).toBe(false);
  });

  it('adds a legacy date as "approved before" a date (F-MSUK-3: before 1 Jan 1995)', async () => {
    const model = reactive<Limit>({ template: 'limit', checks: [{ fact: 'geometry.hoopAboveHelmetMm', operator: 'atLeast', value: 2 }] });
    const w = mountVehicle(model);
    await w.get('select[aria-label="Add a limit on a measurement"]').setValue('cage.approvedOn');
    expect(model.checks[1]).toEqual({ fact: 'cage.approvedOn', operator: 'below', value: '' });
    expect(w.get('select[aria-label="Cage approval date: comparison"]').findAll('option').map((o) => o.text())).toContain('before');
    await w.get('input[aria-label="Cage approval date: date"]').setValue('1995-01-01');
    await w.get('input[aria-label="Cage approval date: date"]').trigger('change');
    expect(model.checks[1]!.value).toBe('1995-01-01');
  });

  it('adds a bolt grade floor on a plate rule, starting from the weakest grade', async () => {
    const model = reactive<Limit>({ template: 'limit', checks: [{ fact: 'plate.boltCount', operator: 'atLeast', value: 3 }] });
    const w = mount(RulebookLimits, { props: { modelValue: model, readOnly: false, unitSystem: 'metric', scope: 'plate', path: 'requirements.5.requires', problems: [] }, global });
    await w.get('select[aria-label="Add a limit on a measurement"]').setValue('plate.boltGrade');
    expect(model.checks[1]).toEqual({ fact: 'plate.boltGrade', operator: 'atLeast', value: 'ISO 8.8' });
  });

  it('offers nothing to add on a published version', () => {
    const model = reactive<Limit>({ template: 'limit', checks: [{ fact: 'plate.boltCount', operator: 'atLeast', value: 3 }] });
    const w = mount(RulebookLimits, { props: { modelValue: model, readOnly: true, unitSystem: 'metric', scope: 'plate' }, global });
    expect(w.find('select[aria-label="Add a limit on a measurement"]').exists()).toBe(false);
    expect(w.find('button').exists()).toBe(false);
  });
});

describe('RulebookMemberMatch', () => {
  it('ticks the kinds to compare with (never its own) and sets OD and wall comparisons', async () => {
    const model = reactive<MemberMatch>({ template: 'member_match', of: ['main_hoop'], checks: [{ measure: 'od', operator: 'equals' }] });
    const w = mount(RulebookMemberMatch, { props: { modelValue: model, readOnly: false, ownKinds: ['rear_brace'], label: 'Braces', path: 'requirements.4.requires', problems: [] }, global });
    const own = w.findAll('input[type="checkbox"]').find((c) => c.element.parentElement?.textContent?.includes('rear brace'));
    expect((own!.element as HTMLInputElement).disabled).toBe(true);
    const selects = w.findAll('select');
    await selects[1]!.setValue('equals');
    expect(model.checks).toEqual([{ measure: 'od', operator: 'equals' }, { measure: 'wall', operator: 'equals' }]);
    await selects[0]!.setValue('');
    expect(model.checks).toEqual([{ measure: 'wall', operator: 'equals' }]);
    const front = w.findAll('input[type="checkbox"]').find((c) => c.element.parentElement?.textContent?.includes('front hoop'));
    await front!.setValue(true);
    expect(model.of).toEqual(['main_hoop', 'front_hoop']);
  });
});

describe('RulebookTubeTable: measured wall and thin-wall reading', () => {
  const base = (): TubeTable => ({
    template: 'tube_table',
    bands: [{ rows: [{ alternatives: [{ od: 38, wall: 3 }] }] }],
    allowances: { thinWallWhenOdExceedsMinimum: { odMargin: 6, minWall: 2.5 } },
  });
  const mountTable = (model: TubeTable, problems: { path: string; message: string }[] = []) =>
    mount(RulebookTubeTable, { props: { modelValue: model, lengthUnit: 'mm', massUnit: 'kg', readOnly: false, path: 'requirements.0.requires', problems }, global });

  it('asks for a sonic reading with 0.30 mm tolerance (F-SSA-1) and can stop asking', async () => {
    const model = reactive(base());
    const w = mountTable(model);
    await w.findAll('button').find((b) => b.text().includes('Ask for a measured wall'))!.trigger('click');
    expect(model.measuredWall).toEqual({ method: 'ultrasonic' });
    await w.get('select[aria-label="Measured wall: kind of tolerance"]').setValue('value');
    await w.get('input[aria-label="Measured wall: tolerance (mm)"]').setValue('0.3');
    expect(model.measuredWall).toEqual({ method: 'ultrasonic', tolerance: { value: 0.3 } });
    await w.get('select[aria-label="Measured wall: method"]').setValue('callipers');
    expect(model.measuredWall!.method).toBe('callipers');
    await w.findAll('button').find((b) => b.text().includes('Stop asking'))!.trigger('click');
    expect(model.measuredWall).toBeUndefined();
  });

  it('shows a refused percent beside the control', () => {
    const model = reactive({ ...base(), measuredWall: { method: 'ultrasonic' as const, tolerance: { percent: 50 } } });
    const w = mountTable(model, [{ path: 'requirements.0.requires.measuredWall.tolerance.percent', message: 'It must be under 50 %.' }]);
    expect(w.text()).toContain('It must be under 50 %.');
  });

  it('switches the thin-wall reading; the default is written by leaving it out', async () => {
    const model = reactive(base());
    const w = mountTable(model);
    const select = w.get('select[aria-label="Thinner wall allowed: which OD is the minimum diameter"]');
    await select.setValue('largest_listed');
    expect(model.allowances!.thinWallWhenOdExceedsMinimum!.minimumDiameter).toBe('largest_listed');
    await select.setValue('smallest_listed');
    expect('minimumDiameter' in model.allowances!.thinWallWhenOdExceedsMinimum!).toBe(false);
  });
});
