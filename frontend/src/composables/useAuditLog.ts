// The activity log page's data: one page of a club's entries, the filters (kind of change, car, person)
// and paging. Changing a filter goes back to page 1.
import { ref, watch, type Ref } from 'vue';
import { listAudit, type AuditEntry, type AuditFilterOption } from '@/api/audit';
import { errorMessage } from '@/api/errors';

export const auditPageSize = 25;

export function useAuditLog(
  clubId: Ref<string>,
  initial: { carId?: string | null; personId?: string | null } = {},
) {
  const entries = ref<AuditEntry[]>([]);
  const total = ref(0);
  const actions = ref<string[]>([]);
  const cars = ref<AuditFilterOption[]>([]);
  const people = ref<AuditFilterOption[]>([]);
  const page = ref(1);
  const action = ref<string | null>(null);
  const carId = ref<string | null>(initial.carId ?? null);
  const personId = ref<string | null>(initial.personId ?? null);
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
        carId: carId.value,
        personId: personId.value,
      });
      entries.value = answer.entries;
      total.value = answer.total;
      actions.value = answer.actions;
      cars.value = answer.cars;
      people.value = answer.people;
    } catch (error) {
      entries.value = [];
      total.value = 0;
      loadError.value = errorMessage(error);
    } finally {
      loading.value = false;
    }
  }

  watch([action, carId, personId], () => {
    if (page.value !== 1) page.value = 1;
    else void load();
  });
  watch([clubId, page], load, { immediate: true });

  return { entries, total, actions, cars, people, page, action, carId, personId, loading, loadError, load };
}
