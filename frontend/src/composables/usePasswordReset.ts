// The reset page's data: which address a reset link belongs to, and setting the new password with it.
import { ref } from 'vue';
import * as authApi from '@/api/auth';
import { ApiError, errorMessage } from '@/api/errors';

export const deadLinkText = 'This link has expired or was already used. Links work once, within an hour of asking.';

export function usePasswordReset(token: string) {
  const email = ref<string | null>(null);
  const loading = ref(true);
  const loadError = ref<string | null>(null);

  async function load(): Promise<void> {
    loading.value = true;
    loadError.value = null;
    try {
      email.value = (await authApi.fetchPasswordReset(token)).email;
    } catch (error) {
      loadError.value = error instanceof ApiError && error.status === 404 ? deadLinkText : errorMessage(error);
    } finally {
      loading.value = false;
    }
  }

  function complete(password: string): Promise<void> {
    return authApi.resetPassword(token, password);
  }

  void load();
  return { email, loading, loadError, complete };
}
