// Numbers typed into the rulebook editor are read by the one typed-number reader (issue 9 §1):
// rulebooks print "2,800 lb" and "1-5/8 in", so those are read as meant in an inch-pound document;
// a form that could mean two values is refused with the reason beside the field, and the draft keeps
// its last good value (nothing wrong is saved, the typed text is not lost).
import { mount } from '@vue/test-utils';
import PrimeVue from 'primevue/config';
import { describe, expect, it } from 'vitest';
import { nextTick, reactive } from 'vue';
import RulebookTubeTable from '@/components/rulebook/RulebookTubeTable.vue';
import RulebookLimits from '@/components/rulebook/RulebookLimits.vue';
import RulebookClasses from '@/components/rulebook/RulebookClasses.vue';
import RulebookRequiredMembers from '@/components/rulebook/RulebookRequiredMembers.vue';
import type { Requires, RulesetClass, TubeTable } from '../../../backend/src/contracts/ruleset';

const global = { plugins: [[PrimeVue, { theme: 'none' }]] as [typeof PrimeVue, object][] };
type Limit = Extract<Requires, { template: 'limit' }>;
type RequiredMembers = Extract<Requires, { template: 'required_members' }>;

// The demo saloon table's shape (invented rulebook), imperial.
const imperialTable = (): TubeTable => ({
  template: 'tube_table',
  bands: [
    { label: 'up to 2,200 lb', upTo: 2200, rows: [{ alternatives: [{ od: 1.5, wall: 0.095 }] }] },
    { label: 'over 2,200 lb', rows: [{ alternatives: [{ od: 1.75, wall: 0.12 }] }] },
  ],
});
const metricTable = (): TubeTable => ({ template: 'tube_table', bands: [{ upTo: 1000, rows: [{ alternatives: [{ od: 45, wall: 2.5 }] }] }, { rows: [{ alternatives: [{ od: 50, wall: 2 }] }] }] });

const mountTable = (model: TubeTable, system: 'imperial' | 'metric') =>
  mount(RulebookTubeTable, {
    props: { modelValue: model, lengthUnit: system === 'imperial' ? 'in' : 'mm', massUnit: system === 'imperial' ? 'lb' : 'kg', unitSystem: system, readOnly: false, path: 'requirements.0.requires', problems: [] },
    global,
  });

describe('tube table: numbers as rulebooks print them', () => {
  it('inch-pound document: "2,800" is 2,800 lb, "1-5/8" is 1.625 in, "2 700" is 2,700', async () => {
    const model = reactive(imperialTable());
    const w = mountTable(model, 'imperial');
    const upTo = w.get('input[aria-label="Band 1 up to (lb)"]');
    expect(upTo.attributes('type')).toBe('text');
    expect(upTo.attributes('inputmode')).toBe('decimal');
    await upTo.setValue('2,800');
    expect(model.bands[0]!.upTo).toBe(2800);
    await upTo.setValue('2 700');
    expect(model.bands[0]!.upTo).toBe(2700);
    await w.get('input[aria-label="Band 1, row 1, size 1: OD (in)"]').setValue('1-5/8');
    expect(model.bands[0]!.rows[0]!.alternatives[0]!.od).toBe(1.625);
    expect(w.find('[role="status"]').exists()).toBe(false);
  });

  it('inch-pound document: "0,095" is refused at the field with the reason, and the draft keeps its wall', async () => {
    const model = reactive(imperialTable());
    const w = mountTable(model, 'imperial');
    const wall = w.get('input[aria-label="Band 1, row 1, size 1: wall (in)"]');
    await wall.setValue('0,095');
    expect(model.bands[0]!.rows[0]!.alternatives[0]!.wall).toBe(0.095);
    expect(wall.attributes('aria-invalid')).toBe('true');
    const msg = w.get('[role="status"]');
    expect(msg.text()).toBe('"0,095": in inch-pound units a comma groups thousands (2,800), so this is not clear. Type a decimal with a point (0.0950).');
    expect(wall.attributes('aria-describedby')).toBe(msg.attributes('id'));
    // The typed text stays for the admin to correct.
    expect((wall.element as HTMLInputElement).value).toBe('0,095');
    await wall.setValue('0.12');
    expect(model.bands[0]!.rows[0]!.alternatives[0]!.wall).toBe(0.12);
    expect(w.find('[role="status"]').exists()).toBe(false);
  });

  it('metric document: "2,800" could be 2800 or 2.8 and is refused; "2,5" is 2.5 mm and "1.000,5" is 1000.5 kg', async () => {
    const model = reactive(metricTable());
    const w = mountTable(model, 'metric');
    const upTo = w.get('input[aria-label="Band 1 up to (kg)"]');
    await upTo.setValue('2,800');
    expect(model.bands[0]!.upTo).toBe(1000);
    expect(w.get('[role="status"]').text()).toBe('"2,800" could mean 2800 or 2.8. Type 2800 or 2.8 to say which.');
    await upTo.setValue('1.000,5');
    expect(model.bands[0]!.upTo).toBe(1000.5);
    await w.get('input[aria-label="Band 1, row 1, size 1: wall (mm)"]').setValue('2,5');
    expect(model.bands[0]!.rows[0]!.alternatives[0]!.wall).toBe(2.5);
  });

  it('refuses what is not a number, inconsistent grouping and negative sizes', async () => {
    const model = reactive(imperialTable());
    const w = mountTable(model, 'imperial');
    const od = w.get('input[aria-label="Band 2, row 1, size 1: OD (in)"]');
    for (const [typed, message] of [
      ['1.75 in', '"1.75 in" is not a number.'],
      ['12,50,0', '"12,50,0" is not grouped consistently: use one separator, with three digits in each group after the first (2,800 or 12 500), and one decimal mark.'],
      ['-1.75', 'Must not be negative.'],
    ] as const) {
      await od.setValue(typed);
      expect(w.get('[role="status"]').text()).toBe(message);
      expect(model.bands[1]!.rows[0]!.alternatives[0]!.od).toBe(1.75);
    }
  });

  it('an emptied size is 0 in the draft (refused by validation at its path); an emptied band limit is "no limit"', async () => {
    const model = reactive(imperialTable());
    const w = mountTable(model, 'imperial');
    const wall = w.get('input[aria-label="Band 1, row 1, size 1: wall (in)"]');
    await wall.setValue('');
    expect(model.bands[0]!.rows[0]!.alternatives[0]!.wall).toBe(0);
    expect((wall.element as HTMLInputElement).value).toBe('');
    await w.get('input[aria-label="Band 1 up to (lb)"]').setValue('');
    expect(model.bands[0]!.upTo).toBeUndefined();
  });

  it('follows the draft when it changes from outside (import, the other admin\'s version), dropping a refused text', async () => {
    const model = reactive(imperialTable());
    const w = mountTable(model, 'imperial');
    const od = w.get('input[aria-label="Band 1, row 1, size 1: OD (in)"]');
    await od.setValue('1,5');
    expect(w.find('[role="status"]').exists()).toBe(true);
    model.bands[0]!.rows[0]!.alternatives[0]!.od = 1.625;
    await nextTick();
    expect((od.element as HTMLInputElement).value).toBe('1.625');
    expect(w.find('[role="status"]').exists()).toBe(false);
  });
});

describe('limits, class weights and member counts', () => {
  it('a limit value: "50,000" psi-style grouping in an inch-pound document, negative values allowed', async () => {
    const model = reactive<Limit>({ template: 'limit', checks: [
      { fact: 'member.yieldMpa', operator: 'atLeast', value: 40000, unit: 'psi' },
      { fact: 'geometry.harnessBarBelowShouldersMm', operator: 'atLeast', value: 0 },
    ] });
    const w = mount(RulebookLimits, { props: { modelValue: model, readOnly: false, unitSystem: 'imperial', scope: 'member', path: 'requirements.1.requires', problems: [] }, global });
    const inputs = w.findAll('input[type="text"]');
    await inputs[0]!.setValue('50,000');
    expect(model.checks[0]!.value).toBe(50000);
    await inputs[1]!.setValue('-0.5');
    expect(model.checks[1]!.value).toBe(-0.5);
    await inputs[1]!.setValue('0,5');
    expect(model.checks[1]!.value).toBe(-0.5);
    expect(w.get('[role="status"]').text()).toMatch(/^"0,5": in inch-pound units a comma groups thousands/);
  });

  it('k of a proportional limit is read the same way and may not be negative', async () => {
    const model = reactive<Limit>({ template: 'limit', checks: [{ fact: 'plate.leastSideMm', operator: 'atLeast', value: { times: 2, of: 'plate.attachedOdMm' } }] });
    const w = mount(RulebookLimits, { props: { modelValue: model, readOnly: false, unitSystem: 'metric', scope: 'plate', path: 'requirements.1.requires', problems: [] }, global });
    const k = w.get('input[aria-label="Shortest plate side: multiple (k)"]');
    await k.setValue('2,5');
    expect(model.checks[0]!.value).toEqual({ times: 2.5, of: 'plate.attachedOdMm' });
    await k.setValue('-2');
    expect(w.get('[role="status"]').text()).toBe('Must not be negative.');
    expect(model.checks[0]!.value).toEqual({ times: 2.5, of: 'plate.attachedOdMm' });
  });

  it('a listed class weight: "2,450" lb is 2450; emptied, the class bands on the measured weight again', async () => {
    const classes = reactive<RulesetClass[]>([{ id: 'gcr', name: 'GCR class', weightBasis: 'with_driver' }]);
    const w = mount(RulebookClasses, { props: { modelValue: classes, readOnly: false, problems: [], massUnit: 'lb', unitSystem: 'imperial' }, global });
    const input = w.get('input[aria-label="Class 1 listed weight (lb)"]');
    await input.setValue('2,450');
    expect(classes[0]!.listedWeight).toEqual({ value: 2450 });
    await input.setValue('');
    expect(classes[0]!.listedWeight).toBeUndefined();
  });

  it('member counts are whole numbers: "1.5" is refused, an emptied "at most" means no limit', async () => {
    const model = reactive<RequiredMembers>({ template: 'required_members', members: [{ kinds: ['door_bar'], min: 1, max: 2 }] });
    const w = mount(RulebookRequiredMembers, { props: { modelValue: model, readOnly: false, label: 'Door bars', unitSystem: 'imperial' }, global });
    const min = w.get('input[aria-label="Door bars: line 1 at least"]');
    await min.setValue('1.5');
    expect(w.get('[role="status"]').text()).toBe('Must be a whole number.');
    expect(model.members[0]!.min).toBe(1);
    await min.setValue('2');
    expect(model.members[0]!.min).toBe(2);
    await w.get('input[aria-label="Door bars: line 1 at most (blank: no limit)"]').setValue('');
    expect('max' in model.members[0]!).toBe(false);
  });
});
