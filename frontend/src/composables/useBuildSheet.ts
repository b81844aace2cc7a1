// The build sheet page's data: the sheet and its current revision, the draft being edited, and saving
// a new revision on top of the one the draft started from. A stale base (someone saved meanwhile,
// say from the phone) answers 409; the draft stays exactly as typed and the page offers what to do.
import { computed, ref, shallowRef, toRaw, watch, type Ref } from 'vue';
import * as garageApi from '@/api/garage';
import { ApiError, errorMessage } from '@/api/errors';
import type { BuildSheetDetail } from '@/api/garage';
import type { Specification } from '@contracts/specification';
import type { UnitSystem } from '@domain/index';
import { checkDraft, draftFromSpecification, emptyDraft, problemsByPath, type SheetDraft } from './useBuildSheetDraft';

export interface SaveConflict {
  baseRevision: number;
  currentRevision: number | null;
}

function currentRevisionOf(error: ApiError): number | null {
  const details = error.details as { currentRevision?: unknown } | undefined;
  return typeof details?.currentRevision === 'number' ? details.currentRevision : null;
}

export function useBuildSheet(sheetId: Ref<string>, units: Ref<UnitSystem>) {
  const detail = shallowRef<BuildSheetDetail | null>(null);
  const draft = ref<SheetDraft>(emptyDraft('none'));
  const classId = ref<string | null>(null);
  const baseRevision = ref(0);
  const loading = ref(true);
  const loadError = ref<string | null>(null);
  const saving = ref(false);
  const saveError = ref<string | null>(null);
  const serverErrors = ref<Record<string, string>>({});
  const conflict = ref<SaveConflict | null>(null);
  const savedSnapshot = ref('');

  // One deep walk of the draft per change counts the edits; what must see every change (dirty, the
  // drawing) then reads the plain object underneath, not each value through Vue's proxies again.
  const edits = ref(0);
  watch(draft, () => (edits.value += 1), { deep: true });
  /**
   * The draft as a plain object, a new one after each edit so readers recompute (a shallow copy of
   * the raw object under the proxy; read-only: edit through `draft`).
   */
  const plainDraft = computed<SheetDraft>(() => (edits.value, { ...toRaw(draft.value) }));
  const dirty = computed(() => JSON.stringify({ d: plainDraft.value, c: classId.value }) !== savedSnapshot.value);
  const canEdit = computed(() => detail.value?.access === 'owner' && !detail.value.buildSheet.archivedAt);

  function adopt(next: BuildSheetDetail): void {
    detail.value = next;
    classId.value = next.buildSheet.classId;
    baseRevision.value = next.revision.number;
    const spec = next.revision.specification as Specification | undefined;
    draft.value = spec?.vehicle ? draftFromSpecification(spec, next.buildSheet.classId) : emptyDraft(next.buildSheet.classId);
    savedSnapshot.value = JSON.stringify({ d: draft.value, c: classId.value });
  }

  async function load(): Promise<void> {
    loading.value = true;
    loadError.value = null;
    try {
      adopt(await garageApi.getSheet(sheetId.value));
      conflict.value = null;
      serverErrors.value = {};
    } catch (error) {
      loadError.value = errorMessage(error);
    } finally {
      loading.value = false;
    }
  }

  /**
   * Saves the draft as a new revision. `blocking` are problems the caller knows of that the draft
   * cannot show (text in an input that is not a number yet). Returns true when saved.
   */
  async function save(blocking: Record<string, string> = {}): Promise<boolean> {
    saveError.value = null;
    if (!detail.value || !classId.value) return false;
    const checked = checkDraft({ ...draft.value, vehicle: { ...draft.value.vehicle, classId: classId.value } }, units.value);
    const problemCount = Object.keys(blocking).length + checked.problems.length;
    if (!checked.ok || problemCount > 0) {
      saveError.value = `Nothing was saved: ${problemCount} input${problemCount === 1 ? ' needs' : 's need'} correcting first (marked in red).`;
      return false;
    }
    saving.value = true;
    serverErrors.value = {};
    try {
      const saved = await garageApi.saveRevision(sheetId.value, {
        baseRevision: baseRevision.value,
        rulesetVersionId: detail.value.buildSheet.rulesetVersionId,
        classId: classId.value,
        specification: checked.specification,
      });
      // Keep what is on screen (the same content) but take the new revision as the base.
      const typed = draft.value;
      adopt(saved);
      draft.value = typed;
      savedSnapshot.value = JSON.stringify({ d: draft.value, c: classId.value });
      conflict.value = null;
      return true;
    } catch (error) {
      if (error instanceof ApiError && error.status === 409) {
        conflict.value = { baseRevision: baseRevision.value, currentRevision: currentRevisionOf(error) };
      } else {
        if (error instanceof ApiError) serverErrors.value = stripPrefix(error.fieldErrors);
        saveError.value = errorMessage(error);
      }
      return false;
    } finally {
      saving.value = false;
    }
  }

  /** The builder keeps their changes and will save them over the newer revision. */
  function keepMine(): void {
    if (conflict.value?.currentRevision) baseRevision.value = conflict.value.currentRevision;
    conflict.value = null;
  }

  return {
    detail, draft, plainDraft, classId, baseRevision, loading, loadError, saving, saveError, serverErrors, conflict, dirty, canEdit,
    load, save, keepMine, adopt,
  };
}

/** The API reports specification fields as `specification.members.0.wallMm`; inputs know `members.0.wallMm`. */
export function stripPrefix(errors: Readonly<Record<string, string>>): Record<string, string> {
  return problemsByPath(Object.entries(errors).map(([path, message]) => ({ path: path.replace(/^specification\./, ''), message })));
}
