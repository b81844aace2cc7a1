// The track inspection form (issue 13 §3): wall readings typed in the steward's units through the
// shared number reader, a reading under the rulebook's minimum flagged as typed, a unit slip refused
// where it is typed and never sent, the body in canonical millimetres, and a server refusal shown at
// the member it names with everything typed kept.
import { afterEach, beforeEach, expect, test, vi } from 'vitest';
import { defineComponent, h } from 'vue';
import RecordInspectionForm from '@/components/records/RecordInspectionForm.vue';
import { http } from '@/api/http';
import { apiError, createFetchMock, csrfToken, json } from './fetch-mock';
import { mountAt, settle } from './mount-app';

let mock: ReturnType<typeof createFetchMock>;
beforeEach(() => {
  http.resetCsrfToken();
  mock = createFetchMock();
  vi.stubGlobal('fetch', mock.fetch);
  mock.on('GET', '/api/auth/csrf', csrfToken('t'.repeat(43)));
});
afterEach(() => {
  document.body.innerHTML = '';
});

const members = [
  { id: 'mh', name: 'main hoop', wallMm: 3.048, minWallMm: 2.413 },
  { id: 'fh', name: 'front hoop', wallMm: 3.048, minWallMm: null },
];
const Host = defineComponent({ render: () => h(RecordInspectionForm, { recordId: 'r1', recordNumber: 'TVMC-2026-0007', members }) });

/** Types and then leaves the input, as a person does (the blur comes after Vue has passed the value down). */
async function type(id: string, value: string): Promise<void> {
  const input = document.getElementById(id) as HTMLInputElement;
  input.value = value;
  input.dispatchEvent(new Event('input'));
  await settle();
  input.dispatchEvent(new Event('blur'));
}

test('flags a reading under the minimum, refuses a unit slip where typed, and sends millimetres', async () => {
  mock.on('POST', '/api/cage-records/r1/inspections', json(201, { inspections: [], members, canRecord: true }));
  await mountAt('/', Host);
  await type('inspection-seal', 'TV-S-0417');
  await type('wall-mh', '2.1');
  await type('wall-fh', '0.095');
  await settle();
  const mh = document.querySelector('[data-test="wall-mh"]')!;
  expect(mh.textContent).toContain('Under the rulebook’s minimum of 2.41 mm');
  expect(document.querySelector('[data-test="wall-fh"]')!.textContent).toMatch(/measured wall is 0\.3 to 10 mm/i);
  await type('wall-mh', '2.5');
  await settle();
  expect(mh.querySelector('[data-test="wall-below"]')).toBeNull();
  (document.querySelector('[data-test="inspection-save"]') as HTMLButtonElement).click();
  await settle();
  const post = mock.calls.find((c) => c.method === 'POST')!;
  expect(post.body).toEqual({ sealNumber: 'TV-S-0417', readings: [{ memberId: 'mh', wallMm: 2.5 }] });
});

test('a refusal shows at the member it names and keeps what was typed', async () => {
  mock.on('POST', '/api/cage-records/r1/inspections', apiError(400, 'validation_failed', 'A measured wall is 0.3 to 10 mm: check the units.', [
    { path: 'readings.0.wallMm', message: 'A measured wall is 0.3 to 10 mm (0.012 to 0.394 in): check the units.' },
  ]));
  await mountAt('/', Host);
  await type('inspection-seal', 'TV-S-0418');
  await type('wall-fh', '3.1');
  await settle();
  (document.querySelector('[data-test="inspection-save"]') as HTMLButtonElement).click();
  await settle();
  expect(document.querySelector('[data-test="wall-fh"]')!.textContent).toContain('0.012 to 0.394 in');
  expect(document.querySelector('[data-test="inspection-error"]')!.textContent).toContain('Nothing was saved');
  expect((document.getElementById('wall-fh') as HTMLInputElement).value).toBe('3.10');
  expect((document.getElementById('inspection-seal') as HTMLInputElement).value).toBe('TV-S-0418');
});
