// The public /verify page for a check run's code (issue 9 §5): it says what the code is (a pre-check
// of that date, not a cage record) and the result in the PDF's words, with no people or photos.
import { afterEach, beforeEach, expect, test, vi } from 'vitest';
import VerifyView from '@/views/VerifyView.vue';
import { http } from '@/api/http';
import { createFetchMock, json } from './fetch-mock';
import { mountAt, settle } from './mount-app';

let mock: ReturnType<typeof createFetchMock>;
beforeEach(() => {
  http.resetCsrfToken();
  mock = createFetchMock();
  vi.stubGlobal('fetch', mock.fetch);
});
afterEach(() => {
  document.body.innerHTML = '';
});

test('a check-run code is answered as a pre-check of its date, not a cage record', async () => {
  mock.on('GET', /^\/api\/verify\//, json(200, {
    kind: 'check_run',
    checkRun: { checkedOn: '2026-12-02', timeZone: 'Pacific/Auckland', verdict: 'fail', className: 'Open Sprint (roll bar)', rulebookTitle: 'Tarnwick Vale MC Cage Regulations', edition: '2027', carName: 'Grey hatch', raceNumber: '27' },
  }));
  await mountAt('/verify/7K2Q-MX9D-4HBT-0ZRS-5WNC-8EPA-QQQQ', VerifyView);
  await settle();
  expect(document.querySelector('[data-test="verify-kind"]')!.textContent!.trim()).toBe('Pre-check of 2026-12-02');
  const text = document.querySelector('.vc')!.textContent!;
  expect(text).toContain('not a cage record');
  // The date is the club's, and the page says whose.
  expect(text).toContain("made on 2026-12-02 (the club's date, Pacific/Auckland)");
  expect(document.querySelector('[data-test="verify-run-result"]')!.textContent).toBe('Does not pass the pre-check');
  expect(document.querySelector('[data-test="verify-status"]')).toBeNull();
});

test('a cage record code shows the record: number, club, make and model, expiry and the latest seal', async () => {
  mock.on('GET', /^\/api\/verify\//, json(200, {
    kind: 'cage_record',
    record: {
      recordNumber: 'TVMC-2026-0007', clubName: 'Tarnwick Vale Motor Club', carName: 'Grey hatch', make: 'Varden', model: 'Corsair', raceNumber: '27',
      className: 'Open Sprint', rulebookTitle: 'Tarnwick', edition: '2027', status: 'valid', expiresAt: '2027-12-02T10:00:00.000Z', expiresOn: '2027-12-02',
      lastInspection: { inspectedOn: '2027-03-14', sealNumber: 'TV-S-0417' },
    },
  }));
  await mountAt('/verify/ABCD', VerifyView);
  await settle();
  const text = (sel: string) => document.querySelector(`[data-test="${sel}"]`)!.textContent!.trim();
  expect(text('verify-status')).toContain('Valid');
  expect(text('verify-number')).toBe('TVMC-2026-0007');
  expect(text('verify-club')).toBe('Tarnwick Vale Motor Club');
  expect(text('verify-make-model')).toBe('Varden Corsair');
  expect(text('verify-expiry')).toBe('2 Dec 2027');
  expect(text('verify-inspection')).toContain('14 Mar 2027, seal TV-S-0417');
  expect(document.querySelectorAll('img')).toHaveLength(0);
});
