// useForm, the one bookkeeping of the small forms: checks shown only after a first try and then live,
// the API's field errors and message, the busy state, focus on the first field in error, and the
// attributes that tie each input to its message (aria-invalid, aria-describedby).
import { afterEach, expect, test } from 'vitest';
import { mount } from '@vue/test-utils';
import { defineComponent, h, nextTick } from 'vue';
import { ApiError } from '@/api/errors';
import { useForm, type UseFormOptions } from '@/composables/useForm';

type Values = { email: string; password: string };
const ids = { email: 'f-email', password: 'f-password' };
const validate = (v: Values): Record<string, string> => ({
  ...(v.email ? {} : { email: 'Enter your e-mail address.' }),
  ...(v.password.length >= 10 ? {} : { password: 'Use at least 10 characters.' }),
});

/** A form with two inputs, bound as the app's forms bind them; returns the composable's state too. */
function harness(options: Partial<UseFormOptions<Values>> & Pick<UseFormOptions<Values>, 'send'>) {
  let state!: ReturnType<typeof useForm<Values>>;
  const Form = defineComponent({
    setup() {
      state = useForm<Values>({ initial: { email: '', password: '' }, ids, validate, ...options });
      return () =>
        h('form', [
          ...(['email', 'password'] as const).map((f) => [
            h('input', { ...state.fieldAttrs(f, { hint: f === 'password' }), value: state.values[f], onInput: (e: Event) => (state.values[f] = (e.target as HTMLInputElement).value) }),
            state.errors.value[f] ? h('small', { id: state.errorId(f) }, state.errors.value[f]) : null,
          ]).flat(),
        ]);
    },
  });
  const wrapper = mount(Form, { attachTo: document.body });
  return { wrapper, get state() { return state; } };
}

afterEach(() => {
  document.body.innerHTML = '';
});

test('nothing shows before the first try; then the checks show beside their fields and nothing is sent', async () => {
  const sent: Values[] = [];
  const { wrapper, state } = harness({ send: async (v) => void sent.push({ ...v }) });
  expect(state.errors.value).toEqual({});
  expect(wrapper.find('#f-email').attributes('aria-invalid')).toBeUndefined();
  expect(await state.submit()).toBe(false);
  await nextTick();
  expect(sent).toEqual([]);
  expect(state.errors.value).toEqual({ email: 'Enter your e-mail address.', password: 'Use at least 10 characters.' });
  const email = wrapper.find('#f-email');
  expect(email.attributes('aria-invalid')).toBe('true');
  expect(email.attributes('aria-describedby')).toBe('f-email-error');
  expect(wrapper.find('#f-email-error').text()).toBe('Enter your e-mail address.');
  // The first field in error takes focus, so a keyboard or screen reader user lands on it.
  expect(document.activeElement?.id).toBe('f-email');
});

test('after the first try the checks follow the typing, and a field without error points at its hint', async () => {
  const { wrapper, state } = harness({ send: async () => undefined });
  await state.submit();
  state.values.email = 'builder@tarnwick.example';
  await nextTick();
  expect(state.errors.value).toEqual({ password: 'Use at least 10 characters.' });
  expect(wrapper.find('#f-email').attributes('aria-invalid')).toBeUndefined();
  expect(wrapper.find('#f-email').attributes('aria-describedby')).toBeUndefined();
  state.values.password = 'long-enough-password';
  await nextTick();
  expect(wrapper.find('#f-password').attributes('aria-describedby')).toBe('f-password-hint');
});

test('a send is busy while it runs, and a second submit meanwhile sends nothing more', async () => {
  let release!: () => void;
  let calls = 0;
  const { state } = harness({ send: () => new Promise<void>((r) => ((release = r), (calls += 1))) });
  Object.assign(state.values, { email: 'a@b.example', password: 'long-enough-password' });
  const first = state.submit();
  await nextTick();
  expect(state.busy.value).toBe(true);
  expect(await state.submit()).toBe(false);
  release();
  expect(await first).toBe(true);
  expect(state.busy.value).toBe(false);
  expect(calls).toBe(1);
});

test('the API’s field errors go beside their fields, its message above the form, and the next try clears them', async () => {
  const refusal = new ApiError(400, 'validation_failed', 'Some fields are not valid.', [{ path: 'email', message: 'Must be an e-mail address' }]);
  let fail = true;
  const { wrapper, state } = harness({ send: async () => { if (fail) throw refusal; } });
  Object.assign(state.values, { email: 'not-an-address', password: 'long-enough-password' });
  expect(await state.submit()).toBe(false);
  await nextTick();
  expect(state.errors.value).toEqual({ email: 'Must be an e-mail address' });
  expect(state.message.value).toBe('Some fields are not valid.');
  expect(wrapper.find('#f-email').attributes('aria-describedby')).toBe('f-email-error');
  fail = false;
  expect(await state.submit()).toBe(true);
  expect(state.errors.value).toEqual({});
  expect(state.message.value).toBeNull();
});

test('a form may read an error its own way, and reset() empties it again', async () => {
  const wrong = new ApiError(401, 'invalid_credentials', 'The current password is wrong.');
  const { state } = harness({
    send: async () => { throw wrong; },
    failure: (e) => (e instanceof ApiError && e.code === 'invalid_credentials' ? { fieldErrors: { password: e.message }, message: null } : undefined),
  });
  Object.assign(state.values, { email: 'a@b.example', password: 'long-enough-password' });
  await state.submit();
  expect(state.errors.value).toEqual({ password: 'The current password is wrong.' });
  expect(state.message.value).toBeNull();
  state.reset();
  expect(state.values).toEqual({ email: '', password: '' });
  expect(state.errors.value).toEqual({});
  expect(state.touched.value).toBe(false);
});

test('an error that is not the API’s still says something', async () => {
  const { state } = harness({ send: async () => { throw new TypeError('Failed to fetch'); } });
  Object.assign(state.values, { email: 'a@b.example', password: 'long-enough-password' });
  await state.submit();
  expect(state.message.value).toEqual(expect.any(String));
  expect(state.message.value).not.toBe('');
});
