// Equivalence by strength on screen: the rulebook editor's tube-size policy writes the
// `strengthEquivalents` option (and removes it again when switched back to what omitted means), shows
// its problems at their fields; a finding shows every step of its calculation in the reader's units.
// Z values: F-ENG-5 (45 × 2.5 mm → 3361 mm³; 50 × 2.0 mm → 3480 mm³); 350 N/mm²: F-MSUK-1.
import { mount } from '@vue/test-utils';
import PrimeVue from 'primevue/config';
import { describe, expect, it } from 'vitest';
import { reactive } from 'vue';
import RulebookTubePolicy from '@/components/rulebook/RulebookTubePolicy.vue';
import FindingsEquivalence from '@/components/findings/FindingsEquivalence.vue';
import type { RulesetDocument } from '../../../backend/src/contracts/ruleset';

const global = { plugins: [[PrimeVue, { theme: 'none' }]] as [typeof PrimeVue, object][] };

const doc = (): RulesetDocument => reactive({
  formatVersion: 1, rulebook: { publisher: 'Tarnwick Vale MC', title: 'Cage rules', edition: '2027', effectiveDate: '2027-01-01' }, unitSystem: 'metric',
  measurementTolerance: {}, acceptPrintedEquivalents: false, printedEquivalents: [], classes: [], requirements: [],
}) as RulesetDocument;

describe('RulebookTubePolicy', () => {
  it('switches equivalence by strength on, by bending strength with the listed yield, and off again to omitted', async () => {
    const d = doc();
    const w = mount(RulebookTubePolicy, { props: { document: d, readOnly: false, problems: [] }, global });
    await w.get('[data-test="strength-accept"]').setValue(true);
    expect(d.strengthEquivalents).toEqual({ accept: true, measure: 'section_modulus' });
    await w.get('select[aria-label="Equivalence by strength judged by"]').setValue('bending_strength');
    await w.get('input[aria-label="Yield of the listed sizes (MPa)"]').setValue('350');
    expect(d.strengthEquivalents).toEqual({ accept: true, measure: 'bending_strength', listedYield: { value: 350 } });
    expect(w.text()).toContain('A tube that is not listed passes');
    await w.get('input[aria-label="Yield of the listed sizes (MPa)"]').setValue('');
    await w.get('select[aria-label="Equivalence by strength judged by"]').setValue('section_modulus');
    await w.get('[data-test="strength-accept"]').setValue(false);
    expect('strengthEquivalents' in d).toBe(false);
    expect(w.text()).toContain('as advice that does not change the verdict');
  });
  it('shows a problem at its field and keeps the printed-equivalents switch apart', async () => {
    const d = doc();
    d.strengthEquivalents = { accept: true, measure: 'bending_strength' };
    const w = mount(RulebookTubePolicy, { props: { document: d, readOnly: false, problems: [{ path: 'strengthEquivalents.listedYield', message: 'Bending strength compares yield × Z: give the yield the listed sizes are taken at.' }] }, global });
    expect(w.text()).toContain('give the yield the listed sizes are taken at');
    const printed = w.findAll('input[type="checkbox"]')[0]!;
    await printed.setValue(true);
    expect(d.acceptPrintedEquivalents).toBe(true);
    expect(d.strengthEquivalents).toEqual({ accept: true, measure: 'bending_strength' });
  });
});

describe('FindingsEquivalence', () => {
  const eq = { measure: 'section_modulus' as const, accepted: false, listed: { label: '45 × 2.5 mm', odMm: 45, wallMm: 2.5 }, candidate: { odMm: 50, wallMm: 2 }, equivalent: true as const };
  it('writes every step in the reader’s units and says it is advice where the rulebook does not accept it', () => {
    const w = mount(FindingsEquivalence, { props: { equivalence: eq, units: 'metric' } });
    const steps = w.findAll('li').map((l) => l.text());
    expect(steps[1]).toMatch(/= 3361 mm³\.$/);
    expect(steps[3]).toMatch(/= 3480 mm³\.$/);
    expect(steps[4]).toBe('Ratio: Z of the alternative ÷ Z of the listed size = 3480 mm³ ÷ 3361 mm³ = 1.04 (at least 1.00).');
    expect(w.text()).toContain('Advice: equivalence by section modulus, step by step');
    expect(w.text()).toContain('This rulebook does not accept equivalents by strength');
    const imperial = mount(FindingsEquivalence, { props: { equivalence: { ...eq, accepted: true }, units: 'imperial' } });
    expect(imperial.text()).toMatch(/0\.2051 in³/);
    expect(imperial.text()).not.toContain('does not accept');
  });
});
