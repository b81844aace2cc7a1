// Issue 13 §4 in the rulebook screens: a tube table changed while its explanation still quotes the old
// size shows a warning at the requirement (never a block); the list creates a new rulebook (blank, with
// field errors checked before and after sending) and imports a file into a draft.
import { mount } from '@vue/test-utils';
import PrimeVue from 'primevue/config';
import ConfirmationService from 'primevue/confirmationservice';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { nextTick, reactive } from 'vue';
import RulebookRequirementCard from '@/components/rulebook/RulebookRequirementCard.vue';
import RulebooksView from '@/views/RulebooksView.vue';
import { http } from '@/api/http';
import { useSessionStore } from '@/stores/session';
import type { RulesetDocument } from '../../../backend/src/contracts/ruleset';
import { createFetchMock, json } from './fetch-mock';
import { session, tarnwick } from './fixtures';
import { mountAt, settle } from './mount-app';

const global = { plugins: [[PrimeVue, { theme: 'none' }], ConfirmationService] as [typeof PrimeVue, object][] };

function documentWithTubes(): RulesetDocument {
  // An invented rulebook, imperial: one tube table whose explanation quotes its first size.
  return {
    formatVersion: 1,
    rulebook: { publisher: 'Tarnwick Motor Club', title: 'Cage rules', edition: '2027', effectiveDate: '2027-01-01' },
    unitSystem: 'imperial',
    measurementTolerance: {},
    acceptPrintedEquivalents: false,
    printedEquivalents: [],
    classes: [{ id: 'sprint', name: 'Sprint', weightBasis: 'with_driver' }],
    requirements: [{
      id: 'sprint-tubes', title: 'Hoop tubes', section: '4.1', severity: 'mandatory', area: 'tubes',
      scope: { kind: 'member', memberKinds: ['main_hoop'] },
      requires: { template: 'tube_table', bands: [{ rows: [{ alternatives: [{ od: 1.5, wall: 0.095 }, { od: 1.625, wall: 0.083 }] }] }] },
      explanation: 'Light cars may use 1.500 × 0.095 in.',
    }],
  };
}

describe('the explanation warning', () => {
  const mountCard = (doc: RulesetDocument, readOnly = false) =>
    mount(RulebookRequirementCard, { props: { document: doc, index: 0, readOnly, problems: [] }, global, attachTo: document.body });
  afterEach(() => (document.body.innerHTML = ''));

  it('warns at the requirement once the quoted size leaves the table, and clears when the text is updated', async () => {
    const doc = reactive(documentWithTubes());
    const w = mountCard(doc);
    expect(w.find('.rb-req__stale').exists()).toBe(false);
    await w.get('input[aria-label="Band 1, row 1, size 1: wall (in)"]').setValue('0.12');
    await nextTick();
    const warning = w.get('.rb-req__stale');
    expect(warning.text()).toContain('The explanation still quotes 1.500 × 0.095 in, which the tube table no longer lists.');
    expect(w.get('textarea').attributes('aria-describedby')).toBe(warning.attributes('id'));
    // Not a block: the document holds the change.
    expect(doc.requirements[0]!.requires).toMatchObject({ bands: [{ rows: [{ alternatives: [{ od: 1.5, wall: 0.12 }, { od: 1.625, wall: 0.083 }] }] }] });
    await w.get('textarea').setValue('Light cars may use 1.500 × 0.120 in.');
    expect(w.find('.rb-req__stale').exists()).toBe(false);
  });

  it('says nothing while the quoted size is still listed, or for a size the table never had', async () => {
    const doc = reactive(documentWithTubes());
    doc.requirements[0]!.explanation = 'Light cars may use 1.500 × 0.095 in; the schedule prints 38 × 2.5 mm beside it.';
    const w = mountCard(doc);
    await w.get('input[aria-label="Band 1, row 1, size 2: wall (in)"]').setValue('0.095');
    await nextTick();
    expect(w.find('.rb-req__stale').exists()).toBe(false);
  });
});

describe('the rulebook list', () => {
  const me = session([{ club: tarnwick, roles: ['admin'] }]);
  const listPath = `/api/clubs/${tarnwick.id}/rulebooks`;
  const book = {
    id: '7b000000-0000-4000-8000-000000000001', clubId: tarnwick.id, slug: 'cage-rules', title: 'Cage rules', publisher: 'Tarnwick Motor Club', createdAt: '2026-01-01T00:00:00.000Z',
    versions: [{ id: '7c000000-0000-4000-8000-000000000001', versionNumber: 1, status: 'published', edition: '2027', effectiveDate: '2027-01-01', classes: [], requirementCount: 4 }],
  };
  const created = { id: '7c000000-0000-4000-8000-000000000009', rulebook: { title: 'Quarry Sprint rules' } };
  let mock: ReturnType<typeof createFetchMock>;
  beforeEach(() => {
    http.resetCsrfToken();
    mock = createFetchMock();
    mock.on('GET', '/api/auth/csrf', json(200, { token: 'csrf-token' }));
    vi.stubGlobal('fetch', mock.fetch);
  });
  afterEach(() => (document.body.innerHTML = ''));

  const open = async () => {
    const mounted = await mountAt(`/clubs/${tarnwick.id}/rulebooks`, RulebooksView, () => useSessionStore().setSession(me));
    await settle();
    return mounted;
  };
  const button = (label: string) => [...document.querySelectorAll('button')].find((b) => b.textContent?.trim() === label) as HTMLButtonElement;
  const input = (label: string) => [...document.querySelectorAll('label')].find((l) => l.textContent?.includes(label))!.querySelector('input, select') as HTMLInputElement;
  const type = async (label: string, value: string) => {
    const el = input(label);
    el.value = value;
    el.dispatchEvent(new Event(el.tagName === 'SELECT' ? 'change' : 'input'));
    await settle();
  };

  it('an empty club says so and offers to create one; a blank rulebook is checked, sent and opened', async () => {
    mock.on('GET', listPath, json(200, { rulebooks: [] }));
    mock.on('POST', listPath, json(400, { error: { code: 'validation_failed', message: 'Some fields are invalid.', details: [{ path: 'title', message: 'The club already has a rulebook called “Quarry Sprint rules”.' }] } }), json(201, { version: created }));
    const { router } = await open();
    expect(document.body.textContent).toContain('No rulebooks yet');
    button('Create a rulebook').click();
    await settle();
    button('Create the rulebook').click();
    await settle();
    // Checked in the form first: nothing was sent.
    expect(document.body.textContent).toContain('Give the title');
    expect(mock.calls.filter((c) => c.method === 'POST')).toHaveLength(0);
    expect(input('Published by').value).toBe('Tarnwick Motor Club');
    await type('Title', 'Quarry Sprint rules');
    await type('Sizes written in', 'metric');
    button('Create the rulebook').click();
    await settle();
    expect(document.body.textContent).toContain('The club already has a rulebook called “Quarry Sprint rules”.');
    button('Create the rulebook').click();
    await settle();
    const posts = mock.calls.filter((c) => c.method === 'POST' && c.path === listPath);
    expect(posts.at(-1)!.body).toEqual({ start: 'blank', title: 'Quarry Sprint rules', publisher: 'Tarnwick Motor Club', edition: String(new Date().getFullYear() + 1), unitSystem: 'metric' });
    expect(router.currentRoute.value.fullPath).toBe(`/ruleset-versions/${created.id}`);
  });

  it('imports a file from the list into a new draft, and lists a refused file’s problems (the draft goes again)', async () => {
    const draftId = '7c000000-0000-4000-8000-000000000002';
    mock.on('GET', listPath, json(200, { rulebooks: [book] }));
    mock.on('POST', `/api/rulebooks/${book.id}/drafts`, json(201, { version: { id: draftId } }));
    mock.on('GET', `/api/ruleset-versions/${draftId}`, json(200, { version: { id: draftId, lockVersion: 3 } }));
    mock.on('POST', `/api/ruleset-drafts/${draftId}/import`, json(400, { error: { code: 'validation_failed', message: 'Some fields are invalid.', details: [{ path: 'document.requirements.0.section', message: 'Required' }] } }));
    mock.on('DELETE', `/api/ruleset-drafts/${draftId}`, json(204));
    await open();
    const picker = document.querySelector('input[type="file"]') as HTMLInputElement;
    Object.defineProperty(picker, 'files', { value: [new File(['{"formatVersion":1}'], 'rules.json', { type: 'application/json' })] });
    picker.dispatchEvent(new Event('change'));
    await settle();
    await settle();
    expect(mock.calls.find((c) => c.path.endsWith('/import'))!.body).toEqual({ lockVersion: 3, text: '{"formatVersion":1}' });
    expect(document.body.textContent).toContain('The file was not imported; no draft was started.');
    expect(document.body.textContent).toContain('requirements.0.section Required');
    expect(mock.calls.some((c) => c.method === 'DELETE' && c.path === `/api/ruleset-drafts/${draftId}`)).toBe(true);
  });
});
