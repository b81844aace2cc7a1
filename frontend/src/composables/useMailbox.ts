// The mailbox page's data: the list of caught mails, the one opened, refresh and clear. A 404 from the
// list means the server runs without its fake SMTP server, which the page says in words.
import { ref } from 'vue';
import * as mailboxApi from '@/api/mailbox';
import { errorMessage, isApiError } from '@/api/errors';
import type { MailboxMessage, MailboxSummary } from '@/api/mailbox';

export function useMailbox() {
  const messages = ref<MailboxSummary[]>([]);
  const opened = ref<MailboxMessage | null>(null);
  const loading = ref(false);
  const loadError = ref<string | null>(null);
  const unavailable = ref(false);
  const openError = ref<string | null>(null);

  async function load(): Promise<void> {
    loading.value = true;
    loadError.value = null;
    try {
      messages.value = await mailboxApi.listMailbox();
      unavailable.value = false;
      if (opened.value && !messages.value.some((m) => m.id === opened.value?.id)) opened.value = null;
    } catch (error) {
      messages.value = [];
      if (isApiError(error, 'not_found')) unavailable.value = true;
      else loadError.value = errorMessage(error);
    } finally {
      loading.value = false;
    }
  }

  async function open(id: string): Promise<void> {
    openError.value = null;
    try {
      opened.value = await mailboxApi.getMailboxMessage(id);
    } catch (error) {
      opened.value = null;
      openError.value = errorMessage(error);
    }
  }

  async function clear(): Promise<void> {
    await mailboxApi.clearMailbox();
    messages.value = [];
    opened.value = null;
  }

  return { messages, opened, loading, loadError, unavailable, openError, load, open, clear };
}
