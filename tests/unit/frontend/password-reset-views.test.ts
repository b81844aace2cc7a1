// The password reset pages: asking for a link (what is sent, the same words for any address, refusals),
// and choosing the new password (the shared rules checked before sending, a dead link, back to sign-in).
import { afterEach, beforeEach, expect, test, vi } from 'vitest';
import ForgotPasswordView from '@/views/ForgotPasswordView.vue';
import ResetPasswordView from '@/views/ResetPasswordView.vue';
import SignInView from '@/views/SignInView.vue';
import { http } from '@/api/http';
import { passwordMinLength } from '@contracts/password-rules';
import { apiError, createFetchMock, csrfToken, json } from './fetch-mock';
import { mountAt, settle } from './mount-app';

const token = 'T'.repeat(43);
const sentMessage = 'If an account uses this address, a link to choose a new password is on its way. It works once, within an hour.';
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

test('the sign-in page links to the reset request, and says when a new password was just set', async () => {
  const plain = await mountAt('/sign-in', SignInView);
  const link = plain.wrapper.find('a[href="/forgot-password"]');
  expect(link.text()).toBe('Forgot your password?');
  expect(plain.wrapper.find('[role="status"]').exists()).toBe(false);
  document.body.innerHTML = '';
  const after = await mountAt('/sign-in?reset=done', SignInView);
  expect(after.wrapper.find('[role="status"]').text()).toContain('Your new password is set');
});

test('asking sends the trimmed address and shows the API’s answer', async () => {
  mock.on('POST', '/api/auth/password-reset', json(202, { message: sentMessage }));
  const { wrapper } = await mountAt('/forgot-password', ForgotPasswordView);
  await wrapper.find('input#forgot-email').setValue('  builder@tarnwick.example ');
  await wrapper.find('form').trigger('submit');
  await settle();
  const call = mock.calls.find((c) => c.path === '/api/auth/password-reset');
  expect(call?.body).toEqual({ email: 'builder@tarnwick.example' });
  expect(call?.headers['x-csrf-token']).toBe('csrf-1');
  expect(wrapper.find('[role="status"]').text()).toBe(sentMessage);
  expect(wrapper.find('form').exists()).toBe(false);
});

test('asking with no address is caught before sending; a refusal shows the API’s words', async () => {
  mock.on('POST', '/api/auth/password-reset', apiError(429, 'rate_limited', 'Too many reset requests from here. Wait a while and try again.'));
  const { wrapper } = await mountAt('/forgot-password', ForgotPasswordView);
  await wrapper.find('form').trigger('submit');
  await settle();
  expect(wrapper.find('#forgot-email-error').text()).toBe('Enter your e-mail address.');
  expect(mock.calls.filter((c) => c.method === 'POST')).toHaveLength(0);
  await wrapper.find('input#forgot-email').setValue('builder@tarnwick.example');
  await wrapper.find('form').trigger('submit');
  await settle();
  expect(wrapper.find('[role="alert"]').text()).toContain('Too many reset requests from here.');
});

test('the reset page names the account, checks the shared password rules, sends, and returns to sign-in', async () => {
  mock.on('GET', `/api/auth/password-reset/${token}`, json(200, { email: 'builder@tarnwick.example' }));
  mock.on('POST', `/api/auth/password-reset/${token}`, json(204));
  const { wrapper, router } = await mountAt(`/reset-password/${token}`, ResetPasswordView);
  await settle();
  expect(wrapper.text()).toContain('builder@tarnwick.example');
  expect(wrapper.text()).toContain(`At least ${passwordMinLength} characters.`);

  await wrapper.find('input#reset-password').setValue('x'.repeat(passwordMinLength - 1));
  await wrapper.find('input#reset-confirm').setValue('something else');
  await wrapper.find('form').trigger('submit');
  await settle();
  expect(wrapper.text()).toContain(`Use at least ${passwordMinLength} characters.`);
  expect(wrapper.text()).toContain('The two passwords differ.');
  expect(mock.calls.filter((c) => c.method === 'POST')).toHaveLength(0);

  await wrapper.find('input#reset-password').setValue('a-brand-new-password');
  await wrapper.find('input#reset-confirm').setValue('a-brand-new-password');
  await wrapper.find('form').trigger('submit');
  await settle();
  expect(mock.calls.find((c) => c.method === 'POST')?.body).toEqual({ password: 'a-brand-new-password' });
  expect(router.currentRoute.value.fullPath).toBe('/sign-in?reset=done');
});

test('a dead link says so and offers a new one', async () => {
  mock.on('GET', `/api/auth/password-reset/${token}`, apiError(404, 'not_found', 'This link has expired or was already used. Ask for a new one.'));
  const { wrapper } = await mountAt(`/reset-password/${token}`, ResetPasswordView);
  await settle();
  expect(wrapper.find('[role="alert"]').text()).toContain('This link has expired or was already used.');
  expect(wrapper.find('a[href="/forgot-password"]').text()).toBe('Ask for a new link');
  expect(wrapper.find('form').exists()).toBe(false);
});
