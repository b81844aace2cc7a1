// The side-by-side page's parts: the matrix (a verdict in the shared words and the section per cell,
// "No rule here" for a rulebook without one, "strictest" only where rulebooks differ) and the picker
// (a rulebook without a class like the sheet's waits for one, and picking it ticks the rulebook).
import { afterEach, describe, expect, test } from 'vitest';
import { mount } from '@vue/test-utils';
import PrimeVue from 'primevue/config';
import SideBySideMatrix from '@/components/side-by-side/SideBySideMatrix.vue';
import SideBySidePicker from '@/components/side-by-side/SideBySidePicker.vue';
import type { SideBySide, SideBySideOptions } from '@/api/side-by-side';
import { FINDING_VERDICT_WORDS } from '@contracts/verdict-words';

const global = { plugins: [[PrimeVue, { theme: 'none' }]] as [typeof PrimeVue, object][] };
afterEach(() => {
  document.body.innerHTML = '';
});

const column = (key: string, home: boolean) => ({ key, home, classId: 'c', className: 'Saloon', publisher: 'P', title: `Book ${key}`, edition: '2027', verdict: 'pass' as const });

function result(values: [number | null, number | null]): SideBySide {
  return {
    revision: 3,
    line: 'To satisfy all 2 rulebooks at once: 45 × 2.5 mm for the main hoop.',
    columns: [{ rulesetVersionId: 'a', clubName: 'Club A' }, { rulesetVersionId: 'b', clubName: 'Club B' }],
    comparison: {
      columns: [column('a', true), column('b', false)],
      rows: [
        {
          key: 'plate:main_hoop_foot', kind: 'plate', label: 'Plates: main hoop foot', tubes: null,
          cells: [{ verdict: 'fail', severity: 'mandatory', sections: ['H4.1.1'], findings: 1 }, { verdict: null, severity: null, sections: [], findings: 0 }],
          limits: [{ fact: 'plate.areaMm2', label: 'plate area', dimension: 'area', direction: 'atLeast', values, strictest: Math.max(...values.filter((v): v is number => v !== null)), strictestColumns: values[0] === values[1] ? [0, 1] : [values[0]! > (values[1] ?? 0) ? 0 : 1] }],
        },
      ],
    },
  };
}

describe('SideBySideMatrix', () => {
  test('a verdict in the shared words with its section, an empty cell without a rule, and the home column marked', () => {
    const w = mount(SideBySideMatrix, { props: { result: result([12000, null]), units: 'metric' }, global });
    const cells = w.findAll('tbody td');
    expect(cells[0]!.text()).toContain(FINDING_VERDICT_WORDS.fail);
    expect(cells[0]!.text()).toContain('§ H4.1.1');
    expect(cells[0]!.text()).toMatch(/plate area at least 120(\.0)? cm²/);
    expect(cells[1]!.text()).toContain('No rule here');
    expect(w.find('thead').text()).toContain('Home rulebook');
    // One rulebook alone sets the limit: nothing to be stricter than.
    expect(w.text()).not.toContain('strictest');
  });

  test('"strictest" marks the larger least area, and nothing when both ask the same', () => {
    const differ = mount(SideBySideMatrix, { props: { result: result([12000, 15484]), units: 'metric' }, global });
    const cells = differ.findAll('tbody td');
    expect(cells[0]!.text()).not.toContain('strictest');
    expect(cells[1]!.text()).toContain('strictest');
    const same = mount(SideBySideMatrix, { props: { result: result([12000, 12000]), units: 'metric' }, global });
    expect(same.text()).not.toContain('strictest');
  });
});

describe('SideBySidePicker', () => {
  const options: SideBySideOptions = {
    home: { rulesetVersionId: 'h', rulebookTitle: 'Home book', publisher: 'P', edition: '2027', club: { id: 'c1', name: 'Club A' }, classId: 'hs', className: 'Hill Saloon' },
    options: [{ rulesetVersionId: 'o', rulebookTitle: 'Other book', publisher: 'Q', edition: '2027', effectiveDate: '2026-10-01', club: { id: 'c2', name: 'Club B' }, classes: [{ id: 'x', name: 'Sports' }, { id: 'y', name: 'Libre' }], suggestedClassId: null }],
  };

  test('a ticked rulebook without a class asks for one; picking a class ticks it', async () => {
    const w = mount(SideBySidePicker, { props: { options, busy: false, picks: { o: { checked: false, classId: '' } } }, global });
    expect(w.text()).toContain('Home book');
    await w.get('input[type="checkbox"]').setValue(true);
    let picks = w.emitted('update:picks')!.at(-1)![0] as Record<string, { checked: boolean; classId: string }>;
    expect(picks.o).toEqual({ checked: true, classId: '' });
    await w.setProps({ picks });
    expect(w.text()).toContain('pick the one you would enter');
    expect(w.get('input[type="checkbox"]').attributes('aria-describedby')).toBe('sbs-need-o');
    await w.get('select').setValue('y');
    picks = w.emitted('update:picks')!.at(-1)![0] as Record<string, { checked: boolean; classId: string }>;
    expect(picks.o).toEqual({ checked: true, classId: 'y' });
    await w.setProps({ picks });
    expect(w.text()).not.toContain('pick the one you would enter');
    await w.get('form').trigger('submit');
    expect(w.emitted('compare')).toHaveLength(1);
  });
});
