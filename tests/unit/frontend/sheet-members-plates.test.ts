// Editing members and plates on the build sheet (issue 13 §2): copying a member works on the draft as
// the editor holds it (Vue's reactive proxies, which structuredClone refuses), removing one can be
// undone with everything typed into it, and a plate welded to the body hides the bolt and
// backing-plate fields (values typed earlier are said to be still there, and can be cleared).
import { mount } from '@vue/test-utils';
import PrimeVue from 'primevue/config';
import { computed, defineComponent, h, reactive, ref, type Component } from 'vue';
import { afterEach, describe, expect, test } from 'vitest';
import SheetMembers from '@/components/sheet/SheetMembers.vue';
import SheetPlates from '@/components/sheet/SheetPlates.vue';
import { provideSheetInputs } from '@/composables/useBuildSheetInputs';
import { copyMember, emptyDraft, type SheetDraft } from '@/composables/useBuildSheetDraft';
import { settle } from './mount-app';

const IN = 25.4; // F-UNIT-1: 1 in = 25.4 mm exactly

function draftWith(): SheetDraft {
  const d = emptyDraft('club-saloon');
  d.members.push(
    { id: 'mh', kind: 'main_hoop', odMm: 1.75 * IN, wallMm: 0.095 * IN, material: 'mild_steel', process: 'dom', bends: [{ clrMm: 6 * IN }] },
    { id: 'db-l', kind: 'door_bar', odMm: 1.5 * IN, wallMm: 0.095 * IN, material: 'mild_steel', side: 'left', label: 'Left door bar' },
  );
  d.plates.push({ id: 'plate-1', location: 'main_hoop_foot', memberId: 'mh', plateFixing: 'welded', footFixing: 'welded', thicknessMm: 3 });
  return d;
}

function mountSection(section: Component, draft = ref(draftWith())) {
  const Host = defineComponent({
    setup() {
      provideSheetInputs(draft, computed(() => 'imperial' as const), computed(() => ({})), computed(() => ({})));
      return () => h(section);
    },
  });
  const wrapper = mount(Host, { attachTo: document.body, global: { plugins: [[PrimeVue, { theme: 'none' }]] } });
  return { wrapper, draft };
}

const button = (label: string) => {
  const b = [...document.querySelectorAll('button')].find((x) => x.getAttribute('aria-label') === label || x.textContent?.trim() === label);
  if (!b) throw new Error(`no button "${label}"`);
  return b;
};
const rowIds = (draft: { value: SheetDraft }) => draft.value.members.map((m) => m.id);

afterEach(() => {
  document.body.innerHTML = '';
});

describe('copying a member', () => {
  test('structuredClone refuses the editor’s reactive rows, which is why the copy reads through them as JSON', () => {
    const live = reactive(draftWith());
    expect(() => structuredClone(live.members[0])).toThrow();
    const copy = copyMember(live.members[0]!, live);
    expect(copy).toEqual({ ...draftWith().members[0], id: 'main-hoop-1' });
    copy.bends![0]!.clrMm = 1;
    expect(live.members[0]!.bends![0]!.clrMm).toBe(6 * IN);
  });

  test('the copy button adds the copy right after the row, under a new id, with every value', async () => {
    const { draft } = mountSection(SheetMembers);
    button('Copy Left door bar').click();
    await settle();
    expect(rowIds(draft)).toEqual(['mh', 'db-l', 'door-bar-1']);
    expect(draft.value.members[2]).toEqual({ ...draft.value.members[1], id: 'door-bar-1' });
    expect(document.querySelectorAll('li.member')).toHaveLength(3);
  });
});

describe('removing a member', () => {
  test('takes the row away and one click puts it back where it was, with what was typed', async () => {
    const { draft } = mountSection(SheetMembers);
    const before = structuredClone(draftWith().members[0]);
    button('Remove Main hoop').click();
    await settle();
    expect(rowIds(draft)).toEqual(['db-l']);
    const note = document.querySelector('[data-test="member-removed"]')!;
    expect(note.getAttribute('role')).toBe('status');
    expect(note.textContent).toContain('Removed Main hoop.');
    button('Undo').click();
    await settle();
    expect(rowIds(draft)).toEqual(['mh', 'db-l']);
    expect(draft.value.members[0]).toEqual(before);
    expect(document.querySelector('[data-test="member-removed"]')).toBeNull();
  });

  test('an undone row whose id a new row took meanwhile comes back under a free id', async () => {
    const { draft } = mountSection(SheetMembers);
    button('Remove Left door bar').click();
    await settle();
    draft.value.members.push({ id: 'db-l', kind: 'door_bar' });
    await settle();
    button('Undo').click();
    await settle();
    expect(rowIds(draft)).toEqual(['mh', 'door-bar-1', 'db-l']);
  });
});

describe('a welded plate', () => {
  const field = (id: string) => document.querySelector(`#in-plates-0-${id}`);

  test('hides the bolt and backing-plate fields; a bolted one shows them', async () => {
    const { draft } = mountSection(SheetPlates);
    expect(field('thicknessMm')).not.toBeNull();
    for (const id of ['backingPlate', 'backingThicknessMm', 'boltCount', 'boltDiameterMm']) expect(field(id), id).toBeNull();
    expect(document.querySelector('[data-test="plate-welded-note"]')!.textContent).toContain('no backing plate, and no bolts while the foot is welded to the plate too');

    // The foot bolted to a welded plate: its bolts count again, a backing plate still does not.
    draft.value.plates[0]!.footFixing = 'bolted';
    await settle();
    expect(field('boltCount')).not.toBeNull();
    expect(field('backingPlate')).toBeNull();

    const select = field('plateFixing') as HTMLSelectElement;
    select.value = 'bolted';
    select.dispatchEvent(new Event('change'));
    await settle();
    expect(draft.value.plates[0]!.plateFixing).toBe('bolted');
    for (const id of ['backingPlate', 'backingThicknessMm', 'boltCount', 'boltDiameterMm']) expect(field(id), id).not.toBeNull();
    expect(document.querySelector('[data-test="plate-welded-note"]')).toBeNull();
  });

  test('says which values typed earlier are still on the sheet, and clears them on request', async () => {
    const draft = ref(draftWith());
    Object.assign(draft.value.plates[0]!, { backingPlate: true, boltCount: 4 });
    mountSection(SheetPlates, draft);
    const note = document.querySelector('[data-test="plate-welded-note"]')!;
    expect(note.textContent).toContain('The backing plate, bolts typed earlier are still on the sheet.');
    button('Clear them').click();
    await settle();
    expect(draft.value.plates[0]).toEqual({ id: 'plate-1', location: 'main_hoop_foot', memberId: 'mh', plateFixing: 'welded', footFixing: 'welded', thicknessMm: 3 });
    expect(document.querySelector('[data-test="plate-welded-note"]')!.textContent).not.toContain('still on the sheet');
  });
});
