// The tube-table editor: bands × material rows → OD × wall sizes in the document's units, edited in
// place in the draft; problems shown beside the size they concern; read-only for published versions.
import { mount } from '@vue/test-utils';
import PrimeVue from 'primevue/config';
import { describe, expect, it } from 'vitest';
import { nextTick, reactive } from 'vue';
import RulebookTubeTable from '@/components/rulebook/RulebookTubeTable.vue';
import type { TubeTable } from '../../../backend/src/contracts/ruleset';

function table(): TubeTable {
  // The demo saloon table's shape (invented rulebook): two bands, imperial sizes.
  return {
    template: 'tube_table',
    bands: [
      { label: 'up to 2,200 lb', upTo: 2200, rows: [{ materials: ['mild_steel'], alternatives: [{ od: 1.5, wall: 0.095 }, { od: 1.625, wall: 0.083 }] }] },
      { label: 'over 2,200 lb', rows: [{ materials: ['mild_steel'], alternatives: [{ od: 1.75, wall: 0.12 }] }] },
    ],
    allowances: { thinWallWhenOdExceedsMinimum: { odMargin: 0.25, minWall: 0.095 } },
  };
}

function mountTable(model: TubeTable, extra: { readOnly?: boolean; problems?: { path: string; message: string }[] } = {}) {
  return mount(RulebookTubeTable, {
    props: {
      modelValue: model,
      lengthUnit: 'in',
      massUnit: 'lb',
      readOnly: extra.readOnly ?? false,
      path: 'requirements.3.requires',
      problems: extra.problems ?? [],
    },
    global: { plugins: [[PrimeVue, { theme: 'none' }]] },
  });
}

describe('RulebookTubeTable', () => {
  it('shows every size with the unit, and writes an edited wall into the draft document', async () => {
    const model = reactive(table());
    const w = mountTable(model);
    expect(w.text()).toContain('Acceptable sizes: OD × wall (in)');
    expect(w.text()).toContain('Up to (lb)');
    const wall = w.get('input[aria-label="Band 1, row 1, size 1: wall (in)"]');
    expect((wall.element as HTMLInputElement).value).toBe('0.095');
    await wall.setValue('0.12');
    expect(model.bands[0]!.rows[0]!.alternatives[0]).toEqual({ od: 1.5, wall: 0.12 });
    // The other sizes are untouched.
    expect(model.bands[0]!.rows[0]!.alternatives[1]).toEqual({ od: 1.625, wall: 0.083 });
    await w.get('input[aria-label="Thinner wall allowed: minimum wall"]').setValue('0.12');
    expect(model.allowances?.thinWallWhenOdExceedsMinimum).toEqual({ odMargin: 0.25, minWall: 0.12 });
  });

  it('adds and removes sizes, rows and bands, and clears a band limit to "no limit"', async () => {
    const model = reactive(table());
    const w = mountTable(model);
    const buttons = () => w.findAll('button');
    await buttons().find((b) => b.text() === 'Add a size')!.trigger('click');
    expect(model.bands[0]!.rows[0]!.alternatives).toHaveLength(3);
    await w.get('button[aria-label="Remove size 1 of band 1, row 1"]').trigger('click');
    expect(model.bands[0]!.rows[0]!.alternatives.map((a) => a.od)).toEqual([1.625, 1.625]);
    await buttons().find((b) => b.text() === 'Add a weight band')!.trigger('click');
    expect(model.bands).toHaveLength(3);
    await w.get('input[aria-label="Band 1 up to (lb)"]').setValue('');
    expect(model.bands[0]!.upTo).toBeUndefined();
    await w.get('input[type="checkbox"]').trigger('change');
    // Unticking the only material leaves the row for any material.
    expect(model.bands[0]!.rows[0]!.materials).toBeUndefined();
  });

  it('shows a problem beside the size it concerns, by its JSON path', async () => {
    const w = mountTable(reactive(table()), { problems: [{ path: 'requirements.3.requires.bands.1.rows.0.alternatives.0.wall', message: 'Must be greater than 0' }] });
    await nextTick();
    const band2 = w.get('section[aria-label="Weight band 2"]');
    expect(band2.text()).toContain('Must be greater than 0');
    expect(w.get('section[aria-label="Weight band 1"]').text()).not.toContain('Must be greater than 0');
  });

  it('is read only for a published version: inputs disabled, no add or remove buttons', () => {
    const w = mountTable(reactive(table()), { readOnly: true });
    expect(w.findAll('input').every((i) => (i.element as HTMLInputElement).disabled)).toBe(true);
    expect(w.findAll('button')).toHaveLength(0);
  });
});
