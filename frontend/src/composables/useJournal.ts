// One build sheet's journal on screen: load it, record, change and remove stages (removing asks
// first), add photos one by one with their progress, and remove photos. Each refusal is kept as a
// message, and at its field for the stage form.
import { ref, type Ref } from 'vue';
import { useConfirm } from 'primevue/useconfirm';
import { useToast } from 'primevue/usetoast';
import { ApiError, errorMessage } from '@/api/errors';
import {
  getJournal, recordStage, removeJournalPhoto, removeStage, updateStage, uploadJournalPhoto, JOURNAL_STAGE_LABELS,
  type Journal, type JournalEntry, type JournalPhoto, type JournalStage,
} from '@/api/journal';

export interface UploadProgress {
  name: string;
  fraction: number;
  error: string | null;
}

export function useJournal(sheetId: Ref<string>) {
  const confirm = useConfirm();
  const toast = useToast();
  const journal = ref<Journal | null>(null);
  const loadError = ref<string | null>(null);
  const actionError = ref<string | null>(null);
  const formErrors = ref<Record<string, string>>({});
  const busy = ref(false);
  const uploads = ref<Record<string, UploadProgress[]>>({});

  async function load(): Promise<void> {
    loadError.value = null;
    try {
      journal.value = await getJournal(sheetId.value);
    } catch (e) {
      loadError.value = errorMessage(e);
    }
  }

  async function act(run: () => Promise<unknown>, success: string): Promise<boolean> {
    busy.value = true;
    actionError.value = null;
    formErrors.value = {};
    try {
      await run();
      toast.add({ severity: 'success', summary: success, life: 2500 });
      await load();
      return true;
    } catch (e) {
      if (e instanceof ApiError) formErrors.value = { ...e.fieldErrors };
      actionError.value = errorMessage(e);
      return false;
    } finally {
      busy.value = false;
    }
  }

  const record = (stage: JournalStage, happenedOn: string, note: string) =>
    act(() => recordStage(sheetId.value, { stage, happenedOn, note }), `${JOURNAL_STAGE_LABELS[stage]}: recorded`);

  const update = (entry: JournalEntry, happenedOn: string, note: string) =>
    act(() => updateStage(entry.id, { happenedOn, note }), `${JOURNAL_STAGE_LABELS[entry.stage]}: changed`);

  function remove(entry: JournalEntry): void {
    confirm.require({
      header: `Remove “${JOURNAL_STAGE_LABELS[entry.stage]}”?`,
      message: entry.photos.length ? `The stage and its ${entry.photos.length} photo${entry.photos.length === 1 ? '' : 's'} will be removed.` : 'The stage will be removed from the journal.',
      acceptProps: { label: 'Remove', severity: 'danger' },
      rejectProps: { label: 'Keep it', severity: 'secondary', outlined: true },
      accept: () => void act(() => removeStage(entry.id), 'Stage removed'),
    });
  }

  function removePhoto(photo: JournalPhoto): void {
    confirm.require({
      header: 'Remove this photo?',
      message: photo.caption ? `“${photo.caption}” will be removed from the journal.` : 'The photo will be removed from the journal.',
      acceptProps: { label: 'Remove', severity: 'danger' },
      rejectProps: { label: 'Keep it', severity: 'secondary', outlined: true },
      accept: () => void act(() => removeJournalPhoto(photo.id), 'Photo removed'),
    });
  }

  /** Sends the files one after another; a refused file says why and the others still go. */
  async function addPhotos(entry: JournalEntry, files: File[], caption: string): Promise<void> {
    const list: UploadProgress[] = files.map((f) => ({ name: f.name, fraction: 0, error: null }));
    uploads.value = { ...uploads.value, [entry.id]: list };
    for (const [i, file] of files.entries()) {
      try {
        await uploadJournalPhoto(entry.id, file, caption, (fr) => (list[i].fraction = fr));
        list[i].fraction = 1;
      } catch (e) {
        list[i].error = errorMessage(e);
      }
      uploads.value = { ...uploads.value, [entry.id]: [...list] };
    }
    await load();
    if (list.every((u) => !u.error)) {
      const { [entry.id]: _done, ...rest } = uploads.value;
      uploads.value = rest;
    }
  }

  return { journal, loadError, actionError, formErrors, busy, uploads, load, record, update, remove, removePhoto, addPhotos };
}
