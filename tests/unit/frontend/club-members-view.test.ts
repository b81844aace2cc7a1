// The members page: nothing is removed without a confirmation, the last-admin refusal reads clearly,
// role changes and additions send the right bodies, and an invitation link is shown to copy.
import { afterEach, beforeEach, describe, expect, test, vi } from 'vitest';
import ClubMembersView from '@/views/ClubMembersView.vue';
import { http } from '@/api/http';
import { useSessionStore } from '@/stores/session';
import { apiError, createFetchMock, csrfToken, json } from './fetch-mock';
import { member, session, tarnwick } from './fixtures';
import { mountAt, settle } from './mount-app';

const me = session([{ club: tarnwick, roles: ['admin', 'builder'] }]);
const pat = member(me.user.id, me.user.email, me.user.displayName, ['admin', 'builder']);
const robin = member('b0000000-0000-4000-8000-00000000000b', 'robin@tarnwick.example', 'Robin Ashby', [
  'builder',
]);
const membersPath = `/api/clubs/${tarnwick.id}/members`;

let mock: ReturnType<typeof createFetchMock>;

beforeEach(() => {
  http.resetCsrfToken();
  mock = createFetchMock();
  vi.stubGlobal('fetch', mock.fetch);
  mock.on('GET', '/api/auth/csrf', csrfToken('csrf-m'));
  mock.on('GET', membersPath, json(200, { members: [pat, robin] }));
  // The "Move a car to another member" panel below the list (tests/unit/frontend/car-transfer.test.ts).
  mock.on('GET', `/api/clubs/${tarnwick.id}/cars`, json(200, { cars: [] }));
});
afterEach(() => {
  document.body.innerHTML = '';
});

async function openPage(path = `/clubs/${tarnwick.id}/members`) {
  const mounted = await mountAt(path, ClubMembersView, () => useSessionStore().setSession(me));
  await settle();
  return mounted;
}

function button(label: string): HTMLButtonElement {
  const found = [...document.querySelectorAll('button')].find(
    (b) => b.getAttribute('aria-label') === label || b.textContent?.trim() === label,
  );
  if (!found) throw new Error(`no button "${label}"`);
  return found;
}

const dialog = () => document.querySelector('[role="alertdialog"], [role="dialog"]');
const deletes = () => mock.calls.filter((c) => c.method === 'DELETE');

async function click(label: string) {
  button(label).click();
  await settle();
}

describe('removing a member', () => {
  test('asks first; cancelling sends nothing and keeps the member', async () => {
    await openPage();

    await click('Remove robin@tarnwick.example');

    expect(dialog()?.textContent).toContain('Remove Robin Ashby from Tarnwick Motor Club?');
    expect(deletes()).toHaveLength(0);

    await click('Cancel');

    expect(dialog()).toBeNull();
    expect(deletes()).toHaveLength(0);
    expect(document.body.textContent).toContain('robin@tarnwick.example');
  });

  test('confirming sends the DELETE with the CSRF token and takes the row away', async () => {
    mock.on('DELETE', `${membersPath}/${robin.user.id}`, json(204));
    await openPage();

    await click('Remove robin@tarnwick.example');
    await click('Remove');

    expect(deletes().map((c) => c.path)).toEqual([`${membersPath}/${robin.user.id}`]);
    expect(deletes()[0].headers['x-csrf-token']).toBe('csrf-m');
    expect(document.querySelector('.members__rows')?.textContent).not.toContain('robin@tarnwick.example');
  });

  test('the last-admin refusal (409) is explained and the member stays', async () => {
    mock.on(
      'DELETE',
      `${membersPath}/${pat.user.id}`,
      apiError(409, 'conflict', 'The club would have no admin left.'),
    );
    const { wrapper } = await openPage();

    await click(`Remove ${pat.user.email}`);
    await click('Remove');

    expect(wrapper.find('[role="alert"]').text()).toContain('A club needs at least one admin.');
    expect(document.querySelector('.members__rows')?.textContent).toContain(pat.user.email);
  });
});

describe('roles and additions', () => {
  test('toggling a role sends the full new role list', async () => {
    mock.on('PATCH', `${membersPath}/${robin.user.id}`, (call) =>
      json(200, { member: { ...robin, roles: (call.body as { roles: string[] }).roles } }),
    );
    await openPage();

    const group = document.querySelector(`[aria-label="Roles of ${robin.user.email}"]`)!;
    const steward = [...group.querySelectorAll('button')].find((b) => b.textContent?.trim() === 'Steward')!;
    steward.click();
    await settle();

    expect(mock.calls.find((c) => c.method === 'PATCH')?.body).toEqual({ roles: ['builder', 'steward'] });
  });

  test('adding someone without an account says the invitation is e-mailed, and shows its link to copy', async () => {
    const newcomer = member(
      'c0000000-0000-4000-8000-00000000000c',
      'sam@tarnwick.example',
      '',
      ['builder', 'steward'],
      true,
    );
    mock.on(
      'POST',
      membersPath,
      json(201, {
        member: newcomer,
        invitationUrl: '/invitations/abcdefghijklmnopqrstuvwxyz',
        invitationMailed: true,
      }),
    );
    const { wrapper } = await openPage();

    await wrapper.find('#add-member-email').setValue('sam@tarnwick.example');
    await wrapper.find('#add-role-steward').setValue(true);
    await wrapper.find('form[aria-labelledby="add-member-heading"]').trigger('submit');
    await settle();

    expect(mock.calls.find((c) => c.method === 'POST')?.body).toEqual({
      email: 'sam@tarnwick.example',
      roles: ['builder', 'steward'],
    });
    const link = wrapper.find<HTMLInputElement>('#invitation-link').element.value;
    expect(link).toBe(`${window.location.origin}/invitations/abcdefghijklmnopqrstuvwxyz`);
    expect(wrapper.text()).toContain('We are e-mailing them an invitation');
    expect(wrapper.text()).toContain('Invitation pending');
  });

  test('a link to one member (from the activity log) marks their row', async () => {
    const { wrapper } = await openPage(`/clubs/${tarnwick.id}/members#member-${robin.user.id}`);
    expect(wrapper.find(`#member-${robin.user.id}`).classes()).toContain('member--shown');
    expect(wrapper.findAll('.member--shown')).toHaveLength(1);
  });

  test('an invalid address from the API is shown beside the e-mail field', async () => {
    mock.on(
      'POST',
      membersPath,
      apiError(400, 'validation_failed', 'Some fields are invalid.', [
        { path: 'email', message: 'Must be an e-mail address' },
      ]),
    );
    const { wrapper } = await openPage();

    await wrapper.find('#add-member-email').setValue('sam@x');
    await wrapper.find('form[aria-labelledby="add-member-heading"]').trigger('submit');
    await settle();

    expect(wrapper.find('.add__email .cw-field-error').text()).toBe('Must be an e-mail address');
  });
});

test('a club with no members shows the empty state', async () => {
  mock.on('GET', membersPath, json(200, { members: [] }));
  const { wrapper } = await openPage();

  expect(wrapper.text()).toContain('No members yet');
  expect(wrapper.find('.members__rows').exists()).toBe(false);
});

test('a failed load says so and offers to try again', async () => {
  mock.on(
    'GET',
    membersPath,
    apiError(403, 'forbidden', 'Only club admins can see the members.'),
    json(200, { members: [robin] }),
  );
  const { wrapper } = await openPage();

  expect(wrapper.text()).toContain('Only club admins can see the members.');
  await click('Try again');

  expect(wrapper.find('.members__rows').text()).toContain('robin@tarnwick.example');
});
