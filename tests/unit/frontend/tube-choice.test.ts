// The tube chooser's member card and the stock size form: the saving in the person's units, the
// words for a member with nothing legal yet, and a wall of half the OD refused before anything is sent.
import { afterEach, describe, expect, test } from 'vitest';
import { mount } from '@vue/test-utils';
import PrimeVue from 'primevue/config';
import TubeChoiceMember from '@/components/tubes/TubeChoiceMember.vue';
import TubeStockForm from '@/components/tubes/TubeStockForm.vue';
import type { MemberTubeChoice, TubeCandidate } from '@/api/tube-stock';
import { settle } from './mount-app';

const IN = 25.4;
const global = { plugins: [[PrimeVue, { theme: 'none' }]] as [typeof PrimeVue, object][] };

function candidate(over: Partial<TubeCandidate>): TubeCandidate {
  return {
    stockId: 's1', list: 'club', label: '1.75 × 0.095 in DOM 1020', odMm: 1.75 * IN, wallMm: 0.095 * IN, material: 'mild_steel', process: 'dom',
    grade: '1020 DOM', yieldMpa: 414, massPerMetreKg: 2.502, status: 'legal', matched: ['1.750 × 0.095 in'], failing: null, missing: [], assumesCatalogueWall: false,
    together: [], leavesFailing: [], ...over,
  };
}

function member(over: Partial<MemberTubeChoice>): MemberTubeChoice {
  return {
    memberId: 'mh', memberKind: 'main_hoop', label: 'Main hoop', name: 'Main hoop', lengthMm: 3350,
    current: candidate({ stockId: null, list: 'sheet', wallMm: 0.12 * IN, massPerMetreKg: 3.113, matched: ['1.500 × 0.120 in'] }),
    lightest: candidate({}), alternatives: [candidate({ stockId: 's2', odMm: 1.5 * IN, wallMm: 0.12 * IN, massPerMetreKg: 2.633 })], undecided: [],
    legalCount: 2, savingPerMetreKg: 0.611, savingKg: 2.047, savingTogetherKg: null, ...over,
  };
}

afterEach(() => {
  document.body.innerHTML = '';
});

describe('TubeChoiceMember', () => {
  test('shows the lightest legal size beside the sheet’s tube and the saving in the person’s units', async () => {
    const metric = mount(TubeChoiceMember, { props: { member: member({}), units: 'metric' }, global });
    expect(metric.get('[aria-label="Saving"]').text()).toMatch(/Saves 0\.611 kg\/m, 2\.05 kg on this member\./);
    expect(metric.get('[aria-label="Lightest legal from stock"]').text()).toMatch(/44\.45 × 2\.41 mm.*DOM mild steel, 1020 DOM.*club list.*Matches 1\.750 × 0\.095 in/);
    expect(metric.get('[aria-label="Lightest legal from stock"]').text()).not.toMatch(/No size in stock|No stock size/);
    const imperial = mount(TubeChoiceMember, { props: { member: member({}), units: 'imperial' }, global });
    // 0.611 kg/m = 0.411 lb/ft (F-UNIT-1: 1 lb/ft = 1.4882 kg/m); 2.047 kg = 4.51 lb.
    expect(imperial.get('[aria-label="Saving"]').text()).toMatch(/Saves 0\.411 lb\/ft, 4\.51 lb on this member\./);
    await imperial.get('button').trigger('click');
    await settle();
    expect(imperial.text()).toMatch(/Next legal sizes.*1\.500 × 0\.120 in/);
  });

  test('says when nothing can be called legal yet, and what is missing', () => {
    const undecided = candidate({ status: 'undecided', matched: [], missing: [{ fact: 'member.bendCount', label: 'number of bends', requirementIds: ['tv-bends'] }] });
    const w = mount(TubeChoiceMember, { props: { member: member({ lightest: null, alternatives: [], undecided: [undecided], legalCount: 0, savingPerMetreKg: null, savingKg: null }), units: 'metric' }, global });
    expect(w.get('[aria-label="Lightest legal from stock"]').text()).toMatch(/No stock size can be called legal yet: number of bends must be on the sheet first/);
    expect(w.get('[aria-label="Saving"]').text()).toMatch(/—/);
  });

  test('says when the sheet already has the lightest legal size, and names a failing requirement', () => {
    const failing = candidate({ status: 'fails', matched: [], failing: { requirementId: 'tv-process', title: 'Seamless, DOM or CDS tube', section: 'C3.1' } });
    const w = mount(TubeChoiceMember, { props: { member: member({ current: failing, savingPerMetreKg: 0, savingKg: 0 }), units: 'metric' }, global });
    expect(w.get('[aria-label="Saving"]').text()).toMatch(/Already the lightest legal size in stock\./);
    expect(w.get('[aria-label="On the sheet"]').text()).toMatch(/Not legal: Seamless, DOM or CDS tube \(C3\.1\)/);
  });
});

describe('TubeChoiceMember: putting a size on the sheet', () => {
  const braces = [
    { memberId: 'rb-l', memberName: 'Left backstay', because: { requirementId: 'nhra-bar-braces', title: 'Roll bar rear braces the same OD and wall as the hoop', section: 'GR 4.10' }, candidate: candidate({ stockId: 's1' }) },
  ];
  test('offers "Use this tube" to the builder only, names the members to change with it, and emits the candidate', async () => {
    const m = member({ lightest: candidate({ together: braces }), savingTogetherKg: 3.1 });
    const reader = mount(TubeChoiceMember, { props: { member: m, units: 'imperial' }, global });
    expect(reader.findAll('button').map((b) => b.text())).not.toContain('Use this tube');
    const builder = mount(TubeChoiceMember, { props: { member: m, units: 'imperial', canApply: true }, global });
    expect(builder.get('[data-test="together"]').text()).toMatch(/Change with it, so the sheet stays legal:\s*Left backstay to 1\.750 × 0\.095 in DOM mild steel, 1020 DOM \(GR 4\.10 Roll bar rear braces/);
    // 3.1 kg = 6.83 lb (F-UNIT-1).
    expect(builder.get('[aria-label="Saving"]').text()).toMatch(/With Left backstay changed too: saves 6\.83 lb in all\./);
    const use = builder.findAll('button').find((b) => b.text() === 'Use this tube')!;
    await use.trigger('click');
    expect(builder.emitted('use')![0]).toEqual([m.lightest]);
  });
  test('offers the lightest legal size where the sheet’s tube is not legal, even when it is heavier', () => {
    const failing = candidate({ stockId: null, list: 'sheet', status: 'fails', matched: [], failing: { requirementId: 'tv-saloon-tubes', title: 'Full cage hoop and brace sizes by weight', section: 'C4.2.2' } });
    const w = mount(TubeChoiceMember, { props: { member: member({ current: failing, savingPerMetreKg: -0.31, savingKg: -0.3 }), units: 'metric', canApply: true }, global });
    expect(w.get('[aria-label="Saving"]').text()).toMatch(/Heavier than the sheet's tube/);
    expect(w.findAll('button').map((b) => b.text())).toContain('Use this tube');
  });
  test('a size that would leave another member failing says so and cannot be used', async () => {
    const blocked = candidate({ stockId: 's3', wallMm: 0.083 * IN, leavesFailing: [{ memberId: 'rb-l', memberName: 'Left backstay', requirement: braces[0]!.because }] });
    const w = mount(TubeChoiceMember, { props: { member: member({ alternatives: [blocked] }), units: 'imperial', canApply: true }, global });
    await w.findAll('button').find((b) => b.text().startsWith('Other sizes'))!.trigger('click');
    await settle();
    expect(w.get('[data-test="leaves-failing"]').text()).toMatch(/Would leave Left backstay failing GR 4\.10 Roll bar rear braces the same OD and wall as the hoop, and no size in stock puts it right\./);
    expect(w.findAll('button').map((b) => b.text())).not.toContain('Use 1.750 × 0.083 in');
  });
});

describe('TubeStockForm', () => {
  test('refuses a wall of half the OD or more at the wall, and sends nothing', async () => {
    const w = mount(TubeStockForm, { props: { units: 'metric', busy: false, errors: {} }, global, attachTo: document.body });
    await w.get('#stock-od').setValue('40');
    await w.get('#stock-wall').setValue('20');
    await w.get('form').trigger('submit');
    await settle();
    expect(w.text()).toMatch(/half the outside diameter or more/);
    expect(w.emitted('submit')).toBeUndefined();
  });

  test('sends canonical millimetres from inches, with the optional fields only when given', async () => {
    const w = mount(TubeStockForm, { props: { units: 'imperial', busy: false, errors: {} }, global, attachTo: document.body });
    await w.get('#stock-od').setValue('1.625');
    await w.get('#stock-wall').setValue('0.083');
    await w.get('#stock-label').setValue('  Rack B  ');
    await w.get('form').trigger('submit');
    await settle();
    const [body] = w.emitted('submit')![0] as [Record<string, unknown>];
    expect(body).toEqual({ odMm: expect.closeTo(41.275, 9), wallMm: expect.closeTo(2.1082, 9), material: 'mild_steel', process: 'dom', label: 'Rack B' });
  });

  test('shows the server’s field errors at their fields', () => {
    const w = mount(TubeStockForm, { props: { units: 'metric', busy: false, errors: { grade: 'At most 60 characters' } }, global });
    expect(w.text()).toMatch(/At most 60 characters/);
  });
});
