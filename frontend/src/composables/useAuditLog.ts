// The activity log page's data: one page of a club's entries, the action filter, and paging.
import { ref, watch, type Ref } from 'vue';
import { listAudit, type AuditEntry } from '@/api/audit';
import { errorMessage } from '@/api/errors';

export const auditPageSize = 25;

export function useAuditLog(clubId: Ref<string>) {
  const entries = ref<AuditEntry[]>([]);
  const total = ref(0);
  const actions = ref<string[]>([]);
  const page = ref(1);
  const action = ref<string | null>(null);
  const loading = ref(false);
  const loadError = ref<string | null>(null);

  async function load(): Promise<void> {
    loading.value = true;
    loadError.value = null;
    try {
      const answer = await listAudit(clubId.value, {
        page: page.value,
        pageSize: auditPageSize,
        action: action.value,
      });
      entries.value = answer.entries;
      total.value = answer.total;
      actions.value = answer.actions;
    } catch (error) {
      entries.value = [];
      total.value = 0;
      loadError.value = errorMessage(error);
    } finally {
      loading.value = false;
    }
  }

  watch(action, () => {
    if (page.value !== 1) page.value = 1;
    else void load();
  });
  watch([clubId, page], load, { immediate: true });

  return { entries, total, actions, page, action, loading, loadError, load };
}
