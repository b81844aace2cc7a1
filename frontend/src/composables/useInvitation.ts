// The invitation page's data: which club and e-mail a token belongs to, and accepting it.
import { ref } from 'vue';
import * as clubsApi from '@/api/clubs';
import { ApiError, errorMessage } from '@/api/errors';
import type { InvitationSummary, SessionPayload } from '@/api/types';

export function useInvitation(token: string) {
  const invitation = ref<InvitationSummary | null>(null);
  const loading = ref(true);
  const loadError = ref<string | null>(null);

  async function load(): Promise<void> {
    loading.value = true;
    loadError.value = null;
    try {
      invitation.value = await clubsApi.fetchInvitation(token);
    } catch (error) {
      loadError.value =
        error instanceof ApiError && error.status === 404
          ? 'This invitation link is not valid any more. It may have been used already; ask the club admin for a new one.'
          : errorMessage(error);
    } finally {
      loading.value = false;
    }
  }

  function accept(password: string, displayName: string): Promise<SessionPayload> {
    return clubsApi.acceptInvitation(token, password, displayName.trim() || undefined);
  }

  void load();
  return { invitation, loading, loadError, accept };
}
