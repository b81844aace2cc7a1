// The rulebook edition a sheet names is kept on the device once read, so the class list and the live
// pre-check still work with no signal; drafts, which change, are never kept, and a server that answers
// (a 404, say) is believed over the kept copy.
import { afterEach, beforeEach, describe, expect, test, vi } from 'vitest';
import { ApiError } from '@/api/errors';
import { RETRY_DELAYS_MS } from '@/api/http';
import { forgetRulesetVersions, getRulesetVersion, KEPT_EDITIONS } from '@/api/rulesets';
import { reportReachable } from '@/api/connection';
import { apiError, createFetchMock, json } from './fetch-mock';
import { versionBody, versionId } from './garage-fixtures';

let mock: ReturnType<typeof createFetchMock>;
const noSignal = () => {
  throw new TypeError('Failed to fetch');
};
const path = (id: string) => `/api/ruleset-versions/${id}`;
const edition = (id: string, status = 'published') => ({ version: { ...versionBody.version, id, status } });

/** A GET with its retries run out on fake timers. */
async function read(id: string) {
  const pending = getRulesetVersion(id);
  pending.catch(() => undefined);
  await vi.advanceTimersByTimeAsync(RETRY_DELAYS_MS.reduce((a, b) => a + b, 0) + 100);
  return pending;
}

beforeEach(() => {
  localStorage.clear();
  reportReachable();
  forgetRulesetVersions();
  mock = createFetchMock();
  vi.stubGlobal('fetch', mock.fetch);
  vi.useFakeTimers();
});
afterEach(() => vi.useRealTimers());

describe('a rulebook edition with no signal', () => {
  test('an edition read once opens again with no signal, document and classes whole', async () => {
    mock.on('GET', path(versionId), json(200, edition(versionId)));
    const online = await read(versionId);
    forgetRulesetVersions(); // as after a reload of the tab
    mock.on('GET', path(versionId), noSignal);
    const offline = await read(versionId);
    expect(offline).toEqual(online);
    expect(offline.classes.map((c) => c.id)).toEqual(['open-sprint', 'club-saloon']);
  });

  test('a draft is not kept: with no signal it fails as unreachable', async () => {
    const draftId = '7e57e57e-0000-4000-8000-0000000000d1';
    mock.on('GET', path(draftId), json(200, edition(draftId, 'draft')));
    await read(draftId);
    forgetRulesetVersions();
    mock.on('GET', path(draftId), noSignal);
    await expect(read(draftId)).rejects.toBeInstanceOf(ApiError);
  });

  test('a server that answers is believed: a 404 is not replaced by the kept copy', async () => {
    mock.on('GET', path(versionId), json(200, edition(versionId)));
    await read(versionId);
    forgetRulesetVersions();
    mock.on('GET', path(versionId), apiError(404, 'not_found', 'Ruleset version not found.'));
    await expect(read(versionId)).rejects.toMatchObject({ status: 404 });
  });

  test(`the device keeps the ${KEPT_EDITIONS} editions read last`, async () => {
    const ids = Array.from({ length: KEPT_EDITIONS + 2 }, (_, i) => `7e57e57e-0000-4000-8000-0000000001${String(i).padStart(2, '0')}`);
    for (const id of ids) {
      mock.on('GET', path(id), json(200, edition(id)));
      await read(id);
      vi.advanceTimersByTime(1000); // each read a second after the last
    }
    forgetRulesetVersions();
    for (const id of ids) mock.on('GET', path(id), noSignal);
    const opened = await Promise.all(ids.map((id) => read(id).then(() => true, () => false)));
    expect(opened).toEqual([false, false, ...Array<boolean>(KEPT_EDITIONS).fill(true)]);
  });
});
