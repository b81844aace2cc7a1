// The records page's data: one page of the club's cage records, the search (record number, car,
// race number: sent a moment after typing stops), the status filter and paging. A new search or
// filter goes back to page 1; an answer that arrives after a newer request is dropped.
import { ref, watch, type Ref } from 'vue';
import { listClubRecords, type RecordFilter, type RecordList } from '@/api/records';
import { errorMessage } from '@/api/errors';

export const recordsPageSize = 20;

export function useClubRecords(clubId: Ref<string>, initial: { q?: string; status?: RecordFilter } = {}) {
  const list = ref<RecordList | null>(null);
  const q = ref(initial.q ?? '');
  const status = ref<RecordFilter>(initial.status ?? 'all');
  const page = ref(1);
  const loading = ref(false);
  const loadError = ref<string | null>(null);
  let asked = 0;

  async function load(): Promise<void> {
    const mine = ++asked;
    loading.value = true;
    loadError.value = null;
    try {
      const answer = await listClubRecords(clubId.value, { q: q.value, status: status.value, page: page.value, pageSize: recordsPageSize });
      if (mine === asked) list.value = answer;
    } catch (error) {
      if (mine === asked) loadError.value = errorMessage(error);
    } finally {
      if (mine === asked) loading.value = false;
    }
  }

  let timer: ReturnType<typeof setTimeout> | undefined;
  watch(q, () => {
    clearTimeout(timer);
    timer = setTimeout(() => {
      if (page.value !== 1) page.value = 1;
      else void load();
    }, 250);
  });
  watch(status, () => {
    if (page.value !== 1) page.value = 1;
    else void load();
  });
  watch([clubId, page], load, { immediate: true });

  return { list, q, status, page, loading, loadError, load };
}
