// One stock list on screen (a club's list or the builder's own sizes): load, add, change and remove,
// each refusal kept at its field or as one message; removing asks first.
import { ref, type Ref } from 'vue';
import { useConfirm } from 'primevue/useconfirm';
import { useToast } from 'primevue/usetoast';
import { ApiError, errorMessage } from '@/api/errors';
import {
  addClubStock, addCommonSizes, addMyStock, deleteClubStock, deleteMyStock, listClubStock, listMyStock, updateClubStock, updateMyStock,
  type StockTube, type StockTubeBody, type StockTubePatch,
} from '@/api/tube-stock';

export type StockListKey = { kind: 'club'; clubId: string } | { kind: 'mine' };

export function useTubeStock(key: Ref<StockListKey>) {
  const confirm = useConfirm();
  const toast = useToast();
  const tubes = ref<StockTube[]>([]);
  const canEdit = ref(false);
  const loading = ref(false);
  const loadError = ref<string | null>(null);
  const actionError = ref<string | null>(null);
  const busy = ref(false);
  const formErrors = ref<Record<string, string>>({});

  async function load(): Promise<void> {
    loading.value = true;
    loadError.value = null;
    try {
      const k = key.value;
      const list = k.kind === 'club' ? await listClubStock(k.clubId) : await listMyStock();
      tubes.value = list.tubes;
      canEdit.value = list.canEdit;
    } catch (e) {
      loadError.value = errorMessage(e);
    } finally {
      loading.value = false;
    }
  }

  async function act<T>(run: () => Promise<T>, success: string): Promise<T | undefined> {
    busy.value = true;
    actionError.value = null;
    formErrors.value = {};
    try {
      const out = await run();
      toast.add({ severity: 'success', summary: success, life: 2500 });
      return out;
    } catch (e) {
      if (e instanceof ApiError) formErrors.value = { ...e.fieldErrors };
      actionError.value = errorMessage(e);
      return undefined;
    } finally {
      busy.value = false;
    }
  }

  async function add(body: StockTubeBody): Promise<boolean> {
    const k = key.value;
    const tube = await act(() => (k.kind === 'club' ? addClubStock(k.clubId, body) : addMyStock(body)), 'Size added');
    if (!tube) return false;
    await load();
    return true;
  }

  async function update(tubeId: string, patch: StockTubePatch): Promise<boolean> {
    const k = key.value;
    const tube = await act(() => (k.kind === 'club' ? updateClubStock(k.clubId, tubeId, patch) : updateMyStock(tubeId, patch)), 'Size changed');
    if (!tube) return false;
    tubes.value = tubes.value.map((t) => (t.id === tube.id ? tube : t));
    return true;
  }

  function remove(tube: StockTube): void {
    confirm.require({
      header: 'Remove this size?',
      message: `“${tube.label}” will no longer be offered by the tube chooser.`,
      acceptProps: { label: 'Remove', severity: 'danger' },
      rejectProps: { label: 'Keep it', severity: 'secondary', outlined: true },
      accept: async () => {
        const k = key.value;
        const ok = await act(() => (k.kind === 'club' ? deleteClubStock(k.clubId, tube.id) : deleteMyStock(tube.id)).then(() => true), 'Size removed');
        if (ok) tubes.value = tubes.value.filter((t) => t.id !== tube.id);
      },
    });
  }

  async function restoreCommon(): Promise<void> {
    const k = key.value;
    if (k.kind !== 'club') return;
    const out = await act(() => addCommonSizes(k.clubId), 'Common sizes checked');
    if (out) {
      tubes.value = out.list.tubes;
      if (out.added === 0) toast.add({ severity: 'info', summary: 'Every common size is already on the list', life: 2500 });
    }
  }

  return { tubes, canEdit, loading, loadError, actionError, busy, formErrors, load, add, update, remove, restoreCommon };
}
