// The review queue's data: the filters (kept in the address so a reload or a shared link shows the
// same list), the items, the counts by state and the classes to filter by.
import { computed, ref, watch } from 'vue';
import { useRoute, useRouter } from 'vue-router';
import { getQueue, type Queue, type QueueQuery } from '@/api/review';
import { errorMessage } from '@/api/errors';

export type QueueFilters = Pick<QueueQuery, 'state' | 'age' | 'assigned' | 'sort'> & { classId: string };

export const DEFAULT_FILTERS: QueueFilters = { state: 'open', classId: '', age: 'any', assigned: 'anyone', sort: 'oldest' };

const pick = <T extends string>(value: unknown, allowed: readonly T[], fallback: T): T =>
  typeof value === 'string' && (allowed as readonly string[]).includes(value) ? (value as T) : fallback;

/** Filters read from a route query; anything unknown falls back to the default. */
export function filtersFromQuery(q: Record<string, unknown>): QueueFilters {
  return {
    state: pick(q.state, ['open', 'all', 'pending', 'in_review', 'approved', 'changes_requested', 'rejected', 'withdrawn'] as const, 'open'),
    classId: typeof q.classId === 'string' ? q.classId : '',
    age: pick(q.age, ['any', 'over_3_days', 'over_7_days', 'over_14_days'] as const, 'any'),
    assigned: pick(q.assigned, ['anyone', 'me'] as const, 'anyone'),
    sort: pick(q.sort, ['oldest', 'newest', 'car'] as const, 'oldest'),
  };
}

/** Only the filters that differ from the defaults, for a tidy address and request. */
export function changedFilters(f: QueueFilters): Partial<QueueFilters> {
  return Object.fromEntries(Object.entries(f).filter(([k, v]) => DEFAULT_FILTERS[k as keyof QueueFilters] !== v)) as Partial<QueueFilters>;
}

export function useReviewQueue(clubId: () => string) {
  const route = useRoute();
  const router = useRouter();
  const filters = ref<QueueFilters>(filtersFromQuery(route.query));
  const queue = ref<Queue | null>(null);
  const error = ref<string | null>(null);
  const loading = ref(false);
  let ticket = 0;

  async function load(): Promise<void> {
    const mine = ++ticket;
    loading.value = true;
    error.value = null;
    try {
      const q = changedFilters(filters.value);
      const result = await getQueue(clubId(), q);
      if (mine === ticket) queue.value = result;
    } catch (e) {
      if (mine === ticket) error.value = errorMessage(e);
    } finally {
      if (mine === ticket) loading.value = false;
    }
  }

  function setFilters(next: Partial<QueueFilters>): void {
    filters.value = { ...filters.value, ...next };
    void router.replace({ query: changedFilters(filters.value) });
  }

  watch([filters, clubId], load, { immediate: true, deep: true });
  const openCount = computed(() => (queue.value ? queue.value.counts.pending + queue.value.counts.in_review : 0));
  return { filters, queue, error, loading, load, setFilters, openCount };
}
