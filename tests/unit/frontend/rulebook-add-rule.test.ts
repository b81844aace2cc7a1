// Writing a new rule without JSON (issue 9 §3: "Each needs its editor control (no JSON needed)"): each
// tab offers the rule kinds it holds, started from the registry's starter; a rule's scope (member kinds,
// plate places), classes and area are ticked and chosen; removing a rule asks first.
import { mount, type DOMWrapper, type VueWrapper } from '@vue/test-utils';
import PrimeVue from 'primevue/config';
import ConfirmationService from 'primevue/confirmationservice';
import ConfirmDialog from 'primevue/confirmdialog';
import { describe, expect, it } from 'vitest';
import { defineComponent, h, nextTick, reactive } from 'vue';
import RulebookEditorTabs, { type EditorTab } from '@/components/rulebook/RulebookEditorTabs.vue';
import type { RulesetDocument } from '../../../backend/src/contracts/ruleset';
import demo from '../../../rulesets/tarnwick-vale-mc-cage-regulations-2027.json';

// The demo cage regulations (invented rulebook).
const demoDocument = (): RulesetDocument => structuredClone(demo) as unknown as RulesetDocument;

function mountTabs(tab: EditorTab, readOnly = false) {
  const document = reactive(demoDocument());
  const Host = defineComponent({
    render: () => [h(RulebookEditorTabs, { document, readOnly, problems: [], tab, 'onUpdate:tab': () => undefined }), h(ConfirmDialog)],
  });
  const w = mount(Host, { attachTo: globalThis.document.body, global: { plugins: [[PrimeVue, { theme: 'none' }], ConfirmationService] } });
  return { w, document };
}

const button = (w: Pick<VueWrapper | DOMWrapper<Element>, 'findAll'>, text: string) => w.findAll<HTMLButtonElement>('button').find((b) => b.text().includes(text));

describe('adding a rule', () => {
  it('offers the kinds of this tab: required members and member against member on the members tab', () => {
    const { w } = mountTabs('members');
    const add = w.get('[role="group"][aria-label="Add a rule"]');
    expect(add.findAll('button').map((b) => b.text())).toEqual(['Members the cage must have', 'Member against member (braces the same size as the hoop)']);
    w.unmount();
  });

  it('adds "braces the same OD and wall as the hoop" (F-NHRA-G1) and edits its scope and classes without JSON', async () => {
    const { w, document } = mountTabs('members');
    const before = document.requirements.length;
    await button(w, 'Member against member')!.trigger('click');
    expect(document.requirements).toHaveLength(before + 1);
    const rule = document.requirements[before]!;
    expect(rule).toMatchObject({
      id: 'new-member-match-1', section: '', severity: 'mandatory', area: 'tubes', scope: { kind: 'member', memberKinds: ['rear_brace'] },
      requires: { template: 'member_match', of: ['main_hoop'], checks: [{ measure: 'od', operator: 'equals' }, { measure: 'wall', operator: 'equals' }] },
    });
    const card = w.findAll('article').at(-1)!;
    // Its member kinds: the checklist, never JSON. A member-only kind offers no other scope.
    expect(card.find('select[aria-label="Checked for"]').exists()).toBe(false);
    const tick = (text: string) => card.findAll('fieldset').find((f) => f.text().startsWith('Checked for'))!.findAll('label').find((l) => l.text() === text)!.get('input');
    await tick('door bar').setValue(true);
    expect(rule.scope).toEqual({ kind: 'member', memberKinds: ['rear_brace', 'door_bar'] });
    await tick('rear brace (backstay)').setValue(false);
    expect(rule.scope).toEqual({ kind: 'member', memberKinds: ['door_bar'] });
    // Classes: ticking one limits the rule to it; none ticked is every class (the field left out).
    const classes = card.findAll('fieldset').find((f) => f.text().startsWith('Classes'))!;
    await classes.findAll('input')[1]!.setValue(true);
    expect(rule.appliesTo).toEqual({ classes: ['club-saloon'] });
    await classes.findAll('input')[1]!.setValue(false);
    expect(rule.appliesTo).toBeUndefined();
    const area = card.findAll('select').find((s) => s.findAll('option').some((o) => o.text() === 'Mounting'))!;
    await area.setValue('members');
    expect(rule.area).toBe('members');
    w.unmount();
  });

  it('a limit rule on plates: the scope is chosen, the places ticked, the first measurement added', async () => {
    const { w, document } = mountTabs('limits');
    await button(w, 'Limits on measurements')!.trigger('click');
    const rule = document.requirements.at(-1)!;
    expect(rule.requires).toEqual({ template: 'limit', checks: [] });
    const card = w.findAll('article').at(-1)!;
    expect(card.text()).toContain('No limit yet');
    await card.get('select[aria-label="Checked for"]').setValue('plate');
    expect(rule.scope).toEqual({ kind: 'plate', locations: ['main_hoop_foot'] });
    const places = card.findAll('fieldset').find((f) => f.text().startsWith('Checked for'))!;
    await places.findAll('label').find((l) => l.text() === 'front hoop feet')!.get('input').setValue(true);
    expect(rule.scope).toEqual({ kind: 'plate', locations: ['main_hoop_foot', 'front_hoop_foot'] });
    await card.get('select[aria-label="Add a limit on a measurement"]').setValue('plate.thicknessMm');
    expect(rule.requires).toEqual({ template: 'limit', checks: [{ fact: 'plate.thicknessMm', operator: 'atLeast', value: 0 }] });
    w.unmount();
  });

  it('gives each new rule its own id', async () => {
    const { w, document } = mountTabs('tubes');
    const add = () => button(w.get('[aria-label="Add a rule"]'), 'Tube sizes (a table')!;
    await add().trigger('click');
    await add().trigger('click');
    expect(document.requirements.slice(-2).map((r) => r.id)).toEqual(['new-tube-table-1', 'new-tube-table-2']);
    w.unmount();
  });

  it('removes a rule only after asking, and keeps it on "Keep it"', async () => {
    const { w, document } = mountTabs('members');
    const before = document.requirements.map((r) => r.id);
    const first = w.findAll('article')[0]!;
    // The members tab lists the member rules in document order.
    const id = document.requirements.find((r) => ['required_members', 'member_match'].includes(r.requires.template))!.id;
    await button(first, 'Remove this rule')!.trigger('click');
    await nextTick();
    const dialog = () => globalThis.document.body.querySelector('[role="alertdialog"], [role="dialog"]') as HTMLElement | null;
    expect(dialog()?.textContent).toContain('Remove this rule?');
    (Array.from(dialog()!.querySelectorAll('button')).find((b) => b.textContent?.includes('Keep it')) as HTMLButtonElement).click();
    await nextTick();
    expect(document.requirements.map((r) => r.id)).toEqual(before);
    await button(first, 'Remove this rule')!.trigger('click');
    await nextTick();
    (Array.from(dialog()!.querySelectorAll('button')).find((b) => b.textContent?.includes('Remove the rule')) as HTMLButtonElement).click();
    await nextTick();
    expect(document.requirements.map((r) => r.id)).toEqual(before.filter((i) => i !== id));
    w.unmount();
  });

  it('offers no adding, removing or ticking on a published version', () => {
    const { w } = mountTabs('members', true);
    expect(w.find('[aria-label="Add a rule"]').exists()).toBe(false);
    expect(button(w, 'Remove this rule')).toBeUndefined();
    expect(w.findAll('fieldset input[type="checkbox"]').every((i) => (i.element as HTMLInputElement).disabled)).toBe(true);
    w.unmount();
  });
});
