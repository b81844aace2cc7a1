// One form's bookkeeping, shared by every small form (sign-in, password reset and change, invitation):
// the values, the checks made here before sending (shown once the person has tried to send), the
// API's field errors and form-level message, and the busy state while the request runs. It also
// gives each input the attributes that tie it to its message (aria-invalid, aria-describedby), and
// moves focus to the first field in error when sending is refused here.
import { computed, nextTick, reactive, ref, type UnwrapNestedRefs } from 'vue';
import { ApiError, errorMessage } from '@/api/errors';

export type FieldErrors = Record<string, string>;

/** What a failed send shows: messages beside fields, and one for the whole form (null for none). */
export interface FormFailure {
  fieldErrors: FieldErrors;
  message: string | null;
}

export interface UseFormOptions<T extends object> {
  initial: T;
  /** Each field's input id; its message gets `<id>-error`, its standing hint `<id>-hint`. */
  ids: { readonly [K in keyof T]?: string };
  /** The checks made before sending: a message per field that is not acceptable yet. */
  validate?: (values: T) => FieldErrors;
  /** Sends the form. A throw becomes field errors and the form's message (see `failure`). */
  send: (values: T) => Promise<void>;
  /**
   * Turns a throw into what the form shows. The default takes an ApiError's field errors and the
   * error's message (errorMessage); return `undefined` to keep the default for this error.
   */
  failure?: (error: unknown) => Partial<FormFailure> | undefined;
}

/** The default reading of an error: the API's field errors beside their fields, its message on top. */
export function defaultFailure(error: unknown): FormFailure {
  return { fieldErrors: error instanceof ApiError ? { ...error.fieldErrors } : {}, message: errorMessage(error) };
}

export function useForm<T extends object>(options: UseFormOptions<T>) {
  const values = reactive({ ...options.initial }) as UnwrapNestedRefs<T>;
  /** Set by the first attempt to send: from then on the checks show as the person types. */
  const touched = ref(false);
  const serverErrors = ref<FieldErrors>({});
  const message = ref<string | null>(null);
  const busy = ref(false);

  const localErrors = computed<FieldErrors>(() => options.validate?.(values as T) ?? {});
  /** What shows beside each field: the local checks once touched, and the API's answer. */
  const errors = computed<FieldErrors>(() => ({ ...(touched.value ? localErrors.value : {}), ...serverErrors.value }));

  const inputId = (field: keyof T & string): string => options.ids[field] ?? field;
  const errorId = (field: keyof T & string): string => `${inputId(field)}-error`;
  const hintId = (field: keyof T & string): string => `${inputId(field)}-hint`;

  /**
   * Attributes for a field's input: its id, PrimeVue's `invalid`, `aria-invalid` and
   * `aria-describedby` naming the error when there is one, else the hint when the field has one.
   */
  function fieldAttrs(field: keyof T & string, opts: { hint?: boolean } = {}) {
    const error = errors.value[field];
    const describedBy = error ? errorId(field) : opts.hint ? hintId(field) : undefined;
    return {
      id: inputId(field),
      invalid: Boolean(error),
      'aria-invalid': error ? ('true' as const) : undefined,
      'aria-describedby': describedBy,
    };
  }

  async function focusFirstError(): Promise<void> {
    await nextTick();
    const first = (Object.keys(options.ids) as (keyof T & string)[]).find((f) => errors.value[f]);
    if (first) document.getElementById(inputId(first))?.focus();
  }

  /** Sends when the local checks pass; true when the send succeeded. */
  async function submit(): Promise<boolean> {
    if (busy.value) return false;
    touched.value = true;
    serverErrors.value = {};
    message.value = null;
    if (Object.keys(localErrors.value).length > 0) {
      await focusFirstError();
      return false;
    }
    busy.value = true;
    try {
      await options.send(values as T);
      return true;
    } catch (error) {
      const shown = { ...defaultFailure(error), ...(options.failure?.(error) ?? {}) };
      serverErrors.value = shown.fieldErrors;
      message.value = shown.message;
      if (Object.keys(shown.fieldErrors).length > 0) await focusFirstError();
      return false;
    } finally {
      busy.value = false;
    }
  }

  /** Back to the first values, with nothing shown (after a change that succeeded, say). */
  function reset(): void {
    Object.assign(values, options.initial);
    touched.value = false;
    serverErrors.value = {};
    message.value = null;
  }

  return { values, touched, errors, localErrors, serverErrors, message, busy, submit, reset, fieldAttrs, errorId, hintId };
}
