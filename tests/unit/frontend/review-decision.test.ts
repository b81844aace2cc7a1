// The steward's decision form: nothing is chosen until the steward chooses; approving and rejecting ask
// first in a dialog naming the car (and the waivers, in verdict-words' wording); the body each decision
// sends (with the state and version the page saw), notes checked before sending, approval held back while
// findings block it, the server's field errors shown beside the note, and a 409 reloading the page.
import { afterEach, beforeEach, describe, expect, test, vi } from 'vitest';
import { mount } from '@vue/test-utils';
import PrimeVue from 'primevue/config';
import ReviewDecisionForm from '@/components/review/ReviewDecisionForm.vue';
import { ApiError } from '@/api/errors';
import { http } from '@/api/http';
import type { ReviewActionInput } from '@/api/review';
import { useReviewSubmission } from '@/composables/useReviewSubmission';
import { apiError, createFetchMock, csrfToken, json } from './fetch-mock';
import { settle } from './mount-app';

function mountForm(blocking: number, submit: (a: ReviewActionInput) => Promise<ApiError | null>, waivedCount = 0) {
  return mount(ReviewDecisionForm, {
    props: { blocking, busy: false, submit, carName: 'Grey Saloon (No. 17)', waivedCount, pdfUrl: '/api/check-runs/r1/report.pdf?units=metric' },
    global: { plugins: [[PrimeVue, { theme: 'none' }]] }, attachTo: document.body,
  });
}
const dialogText = () => document.querySelector('[data-test="decision-confirm-text"]')?.textContent ?? null;
async function accept(): Promise<void> {
  (document.querySelector('[data-test="decision-accept"]') as HTMLButtonElement).click();
  await settle();
}

afterEach(() => {
  document.body.innerHTML = '';
});

describe('ReviewDecisionForm', () => {
  test('nothing is preselected: sending without a choice says to choose and sends nothing', async () => {
    const submit = vi.fn(async () => null);
    const w = mountForm(0, submit);
    expect(w.findAll<HTMLInputElement>('input[type="radio"]').map((r) => r.element.checked)).toEqual([false, false, false]);
    await w.get('form').trigger('submit');
    await settle();
    expect(submit).not.toHaveBeenCalled();
    expect(w.get('[data-test="choice-error"]').text()).toBe('Choose a decision: approve, request changes or reject.');
    expect(dialogText()).toBeNull();
  });

  test('approving asks first, naming the car and the waivers; “Not yet” sends nothing', async () => {
    const submit = vi.fn(async () => null);
    const w = mountForm(0, submit, 1);
    await w.get('input[value="approve"]').setValue(true);
    await w.get('textarea').setValue('  Seen on the car.  ');
    await w.get('form').trigger('submit');
    await settle();
    expect(submit).not.toHaveBeenCalled();
    expect(document.body.textContent).toContain('Approve Grey Saloon (No. 17)?');
    expect(dialogText()).toContain('Grey Saloon (No. 17) will read “Approved with 1 waiver”');
    expect(dialogText()).toContain('1 waiver goes on the record with its reason.');
    (document.querySelector('[data-test="decision-cancel"]') as HTMLButtonElement).click();
    await settle();
    expect(submit).not.toHaveBeenCalled();
    await w.get('form').trigger('submit');
    await settle();
    await accept();
    expect(submit).toHaveBeenCalledWith({ type: 'approve', note: 'Seen on the car.' });
  });

  test('an approval without waivers says so', async () => {
    const w = mountForm(0, vi.fn(async () => null), 0);
    await w.get('input[value="approve"]').setValue(true);
    await w.get('form').trigger('submit');
    await settle();
    expect(dialogText()).toContain('will read “Approved”');
    expect(dialogText()).toContain('No finding is waived.');
  });

  test('the check run’s PDF opens in a new tab, never embedded', () => {
    const w = mountForm(0, vi.fn());
    const a = w.get('a[data-test="check-pdf"]');
    expect(a.attributes()).toMatchObject({ href: '/api/check-runs/r1/report.pdf?units=metric', target: '_blank', rel: 'noopener' });
    expect(w.find('iframe, embed, object').exists()).toBe(false);
  });

  test('asks for a note before requesting changes, then sends it', async () => {
    const submit = vi.fn(async () => null);
    const w = mountForm(0, submit);
    await w.get('input[value="request_changes"]').setValue(true);
    await w.get('textarea').setValue('thin');
    await w.get('form').trigger('submit');
    await settle();
    expect(submit).not.toHaveBeenCalled();
    expect(w.get('[data-test="decision-error"]').text()).toBe('Write at least 10 characters.');
    await w.get('textarea').setValue('Door bars need 0.095 in wall.');
    await w.get('form').trigger('submit');
    await settle();
    expect(submit).toHaveBeenCalledWith({ type: 'request_changes', note: 'Door bars need 0.095 in wall.' });
  });

  test('rejects with a reason; the server’s field error shows beside it', async () => {
    const submit = vi.fn(async () => new ApiError(400, 'validation_failed', 'Give the reason', [{ path: 'reason', message: 'Give the reason for the rejection (at least 10 characters).' }]));
    const w = mountForm(0, submit);
    await w.get('input[value="reject"]').setValue(true);
    await w.get('textarea').setValue('Bolted-in cage, class needs welded.');
    await w.get('form').trigger('submit');
    await settle();
    expect(submit).not.toHaveBeenCalled();
    expect(document.body.textContent).toContain('Reject Grey Saloon (No. 17)?');
    await accept();
    expect(submit).toHaveBeenCalledWith({ type: 'reject', reason: 'Bolted-in cage, class needs welded.' });
    expect(w.get('[data-test="decision-error"]').text()).toBe('Give the reason for the rejection (at least 10 characters).');
  });

  test('holds approval back while findings block it and says why', () => {
    const w = mountForm(2, vi.fn());
    expect(w.get<HTMLInputElement>('input[value="approve"]').element.disabled).toBe(true);
    expect(w.get<HTMLInputElement>('input[value="request_changes"]').element.checked).toBe(false);
    expect(w.get('[data-test="blocking"]').text()).toContain('2 mandatory findings still block approval');
  });
});

describe('useReviewSubmission', () => {
  const id = 'd0000000-0000-4000-8000-000000000001';
  const path = `/api/submissions/${id}`;
  let mock: ReturnType<typeof createFetchMock>;
  beforeEach(() => {
    http.resetCsrfToken();
    mock = createFetchMock();
    vi.stubGlobal('fetch', mock.fetch);
    mock.on('GET', '/api/auth/csrf', csrfToken('t0k3n'));
  });

  test('sends the state and version it saw; a 409 reloads and keeps the message', async () => {
    mock.on('GET', path, json(200, { submission: { id, state: 'in_review', version: 4 } }), json(200, { submission: { id, state: 'withdrawn', version: 5 } }));
    mock.on('POST', `${path}/actions`, apiError(409, 'conflict', 'The submission changed meanwhile: it is now withdrawn. Reload it and decide again.', { reason: 'conflict', state: 'withdrawn', version: 5 }));
    const r = useReviewSubmission(() => id);
    await settle();
    const err = await r.act({ type: 'approve' });
    expect(mock.calls.find((c) => c.method === 'POST')?.body).toEqual({ type: 'approve', expected: { state: 'in_review', version: 4 } });
    expect(err?.status).toBe(409);
    expect(r.conflict.value).toContain('it is now withdrawn');
    expect(r.submission.value).toMatchObject({ state: 'withdrawn', version: 5 });
  });
});
