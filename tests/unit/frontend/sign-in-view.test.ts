// The sign-in page: what it sends, where it goes, and that it shows the API's own refusal.
import { afterEach, beforeEach, expect, test, vi } from 'vitest';
import SignInView from '@/views/SignInView.vue';
import { http } from '@/api/http';
import { useSessionStore } from '@/stores/session';
import { apiError, createFetchMock, csrfToken, json } from './fetch-mock';
import { mountAt, settle } from './mount-app';
import { session, tarnwick } from './fixtures';

let mock: ReturnType<typeof createFetchMock>;

beforeEach(() => {
  http.resetCsrfToken();
  mock = createFetchMock();
  vi.stubGlobal('fetch', mock.fetch);
  mock.on('GET', '/api/auth/csrf', csrfToken('csrf-1'));
});
afterEach(() => {
  document.body.innerHTML = '';
});

async function fillAndSubmit(
  wrapper: Awaited<ReturnType<typeof mountAt>>['wrapper'],
  email: string,
  password: string,
) {
  await wrapper.find('input#sign-in-email').setValue(email);
  await wrapper.find('input#sign-in-password').setValue(password);
  await wrapper.find('form').trigger('submit');
  await settle();
}

test('the inputs are labelled "E-mail" and "Password" and the button reads "Sign in"', async () => {
  const { wrapper } = await mountAt('/sign-in', SignInView);
  expect(wrapper.find('label[for="sign-in-email"]').text()).toBe('E-mail');
  expect(wrapper.find('label[for="sign-in-password"]').text()).toBe('Password');
  expect(wrapper.find('button[type="submit"]').text()).toContain('Sign in');
});

test('a wrong password shows the API message and stays on the page', async () => {
  mock.on('POST', '/api/auth/login', apiError(401, 'invalid_credentials', 'E-mail or password is wrong.'));
  const { wrapper, router } = await mountAt('/sign-in', SignInView);

  await fillAndSubmit(wrapper, '  builder@tarnwick.example ', 'not-the-password');

  const login = mock.calls.find((c) => c.path === '/api/auth/login');
  expect(login?.body).toEqual({ email: 'builder@tarnwick.example', password: 'not-the-password' });
  expect(login?.headers['x-csrf-token']).toBe('csrf-1');
  expect(wrapper.find('[role="alert"]').text()).toContain('E-mail or password is wrong.');
  expect(router.currentRoute.value.name).toBe('sign-in');
});

test('too many attempts shows the rate-limit message from the API', async () => {
  mock.on(
    'POST',
    '/api/auth/login',
    apiError(429, 'rate_limited', 'Too many sign-in attempts. Try again in 15 minutes.'),
  );
  const { wrapper } = await mountAt('/sign-in', SignInView);

  await fillAndSubmit(wrapper, 'builder@tarnwick.example', 'whatever-it-is');

  const alert = wrapper.find('[role="alert"]').text();
  expect(alert).toContain('Too many sign-in attempts. Try again in 15 minutes.');
  expect(alert).toContain('paused');
});

test('field errors from the API appear beside their inputs', async () => {
  mock.on(
    'POST',
    '/api/auth/login',
    apiError(400, 'validation_failed', 'Some fields are invalid.', [
      { path: 'email', message: 'Must be an e-mail address' },
    ]),
  );
  const { wrapper } = await mountAt('/sign-in', SignInView);

  await fillAndSubmit(wrapper, 'not-an-address', 'x');

  expect(wrapper.find('#sign-in-email-error').text()).toBe('Must be an e-mail address');
});

test('empty fields are caught before anything is sent', async () => {
  const { wrapper } = await mountAt('/sign-in', SignInView);

  await wrapper.find('form').trigger('submit');
  await settle();

  expect(wrapper.find('#sign-in-email-error').text()).toBe('Enter your e-mail address.');
  expect(wrapper.find('#sign-in-password-error').text()).toBe('Enter your password.');
  expect(mock.calls.filter((c) => c.method === 'POST')).toHaveLength(0);
});

test('success stores the session and returns to the page asked for', async () => {
  mock.on('POST', '/api/auth/login', json(200, session([{ club: tarnwick, roles: ['builder'] }])));
  const { wrapper, router } = await mountAt('/sign-in?redirect=/account', SignInView);

  await fillAndSubmit(wrapper, 'pat@tarnwick.example', 'cagewright-demo');

  expect(router.currentRoute.value.fullPath).toBe('/account');
  expect(useSessionStore().user?.email).toBe('pat@tarnwick.example');
});

test('a return path to another site is ignored in favour of the overview', async () => {
  mock.on('POST', '/api/auth/login', json(200, session([])));
  const { wrapper, router } = await mountAt('/sign-in?redirect=//elsewhere.example/x', SignInView);

  await fillAndSubmit(wrapper, 'pat@tarnwick.example', 'cagewright-demo');

  expect(router.currentRoute.value.name).toBe('home');
});
