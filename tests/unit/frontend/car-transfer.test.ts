// Selling a car in the browser (issue 13 §3): the seller's panel checks the address before sending,
// asks first, shows the server's refusal beside the field, and then the open offer with a withdraw; the
// buyer's garage lists the offer and takes the car over only after a confirm that says what moves.
/* eslint-disable vue/one-component-per-file -- each test mounts its component through a small host */
import { afterEach, beforeEach, describe, expect, test, vi } from 'vitest';
import { defineComponent, h } from 'vue';
import CarSellPanel from '@/components/garage/CarSellPanel.vue';
import GarageTransferOffers from '@/components/garage/GarageTransferOffers.vue';
import { http } from '@/api/http';
import type { Car } from '@/api/garage';
import type { CarTransfer } from '@/api/carTransfers';
import { apiError, createFetchMock, csrfToken, json } from './fetch-mock';
import { mountAt, settle } from './mount-app';

const car = { id: 'c0000000-0000-4000-8000-00000000000c', name: 'Grey Saloon', make: 'Varden', model: 'Corsair', year: 1996, chassisType: 'unibody', raceNumber: '17', archivedAt: null, createdAt: '', updatedAt: '', buildSheets: [{ id: 's1', review: null }] } as unknown as Car;
const transfer: CarTransfer = {
  id: 't0000000-0000-4000-8000-000000000001', state: 'offered',
  car: { id: car.id, name: 'Grey Saloon', make: 'Varden', model: 'Corsair', year: 1996, raceNumber: '17', sheets: 2, records: 1 },
  from: { id: 'u1', displayName: 'Robin Ashcombe', email: 'builder@tarnwick.example' },
  to: { id: 'u2', displayName: 'Sam Okafor', email: 'builder2@tarnwick.example' },
  createdAt: '2026-12-01T10:00:00.000Z', decidedAt: null,
};

let mock: ReturnType<typeof createFetchMock>;
beforeEach(() => {
  http.resetCsrfToken();
  mock = createFetchMock();
  vi.stubGlobal('fetch', mock.fetch);
  mock.on('GET', '/api/auth/csrf', csrfToken('csrf-t'));
});
afterEach(() => {
  document.body.innerHTML = '';
});

const button = (label: string) => {
  const found = [...document.querySelectorAll('button')].find((b) => b.textContent?.trim() === label);
  if (!found) throw new Error(`no button "${label}"`);
  return found;
};
const dialogButton = (label: string) => [...document.querySelectorAll('[role="alertdialog"] button, [role="dialog"] button')].find((b) => b.textContent?.trim() === label) as HTMLButtonElement;
async function click(el: HTMLElement) {
  el.click();
  await settle();
}
const posts = () => mock.calls.filter((c) => c.method === 'POST');

describe('the seller’s panel', () => {
  const mountPanel = () => mountAt('/garage', defineComponent({ render: () => h(CarSellPanel, { car }) }));

  test('checks the address, asks first, and shows the server’s refusal beside the field', async () => {
    mock.on('GET', '/api/car-transfers', json(200, { incoming: [], outgoing: [] }));
    mock.on('POST', `/api/cars/${car.id}/transfer-offers`, apiError(400, 'validation_failed', 'Some fields are invalid.', [{ path: 'email', message: 'No member of Tarnwick Vale Motor Club has the e-mail address lee@elsewhere.example.' }]));
    await mountPanel();
    await settle();
    const input = document.querySelector<HTMLInputElement>('#sell-email')!;
    input.value = 'not an address';
    input.dispatchEvent(new Event('input'));
    await click(button('Offer the car'));
    expect(document.querySelector('[data-test="sell-error"]')?.textContent).toContain('Give the buyer’s e-mail address');
    expect(posts()).toEqual([]);

    input.value = 'lee@elsewhere.example';
    input.dispatchEvent(new Event('input'));
    await click(button('Offer the car'));
    expect(document.body.textContent).toContain('Offer Grey Saloon to lee@elsewhere.example?');
    expect(posts()).toEqual([]);
    await click(dialogButton('Offer the car'));
    expect(posts().map((c) => c.body)).toEqual([{ email: 'lee@elsewhere.example' }]);
    expect(document.querySelector('[data-test="sell-error"]')?.textContent).toContain('No member of Tarnwick Vale Motor Club');
    expect(input.getAttribute('aria-describedby')).toBe('sell-email-error');
  });

  test('an open offer shows who it is for, and withdraws after a confirm', async () => {
    mock.on('GET', '/api/car-transfers', json(200, { incoming: [], outgoing: [transfer] }), json(200, { incoming: [], outgoing: [] }));
    mock.on('POST', `/api/car-transfers/${transfer.id}/withdraw`, json(200, { transfer: { ...transfer, state: 'withdrawn' } }));
    await mountPanel();
    await settle();
    expect(document.querySelector('[data-test="open-offer"]')?.textContent).toContain('Offered to Sam Okafor');
    await click(button('Withdraw the offer'));
    await click(dialogButton('Withdraw the offer'));
    expect(posts().map((c) => c.path)).toEqual([`/api/car-transfers/${transfer.id}/withdraw`]);
    expect(document.querySelector('#sell-email')).not.toBeNull();
  });
});

describe('the buyer’s garage', () => {
  test('lists the offer and takes the car over only after a confirm naming what moves', async () => {
    mock.on('GET', '/api/car-transfers', json(200, { incoming: [transfer], outgoing: [] }), json(200, { incoming: [], outgoing: [] }));
    mock.on('POST', `/api/car-transfers/${transfer.id}/accept`, json(200, { transfer: { ...transfer, state: 'accepted' } }));
    const changed = vi.fn();
    await mountAt('/garage', defineComponent({ render: () => h(GarageTransferOffers, { onChanged: changed }) }));
    await settle();
    expect(document.querySelector('[data-test="incoming-offer"]')?.textContent).toContain('Robin Ashcombe offers you Grey Saloon (No. 17)');
    await click(button('Take over'));
    expect(document.body.textContent).toContain('moves to your garage with its 2 build sheets and 1 cage record');
    await click(dialogButton('Not now'));
    expect(posts()).toEqual([]);
    await click(button('Take over'));
    await click(dialogButton('Take over the car'));
    expect(posts().map((c) => c.path)).toEqual([`/api/car-transfers/${transfer.id}/accept`]);
    expect(changed).toHaveBeenCalled();
    expect(document.querySelector('[data-test="incoming-offer"]')).toBeNull();
  }, 20_000);
});
