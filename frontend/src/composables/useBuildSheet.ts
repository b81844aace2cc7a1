// The build sheet page's data: the sheet and its current revision, the draft being edited, and saving
// a new revision on top of the one the draft started from. A stale base (someone saved meanwhile,
// say from the phone) answers 409; the draft stays exactly as typed and the page offers what to do.
// Until it is saved the draft is kept on this device (useKeptDraft.ts), typed text and all, so a
// dropped signal or a closed tab loses nothing; reopening the sheet offers it back. With no signal
// the sheet opens from the copy this device saw last.
import { computed, onScopeDispose, reactive, ref, shallowRef, toRaw, watch, type Ref } from 'vue';
import * as garageApi from '@/api/garage';
import { ApiError, errorMessage } from '@/api/errors';
import { isUnreachable } from '@/api/http';
import { keep, recall } from '@/api/kept';
import type { BuildSheetDetail } from '@/api/garage';
import type { Specification } from '@contracts/specification';
import type { UnitSystem } from '@domain/index';
import { checkDraft, draftFromSpecification, emptyDraft, plainCopy, problemsByPath, type SheetDraft } from './useBuildSheetDraft';
import { forgetSheetDraft, hasBadText, keepSheetDraft, recallSheetDraft, type KeptSheetDraft, type TypedText } from './useKeptDraft';

/** A pause in typing before the draft is written to this device (and at once when the tab is hidden). */
export const KEEP_DELAY_MS = 400;

/** A draft this device kept for the sheet, offered when the sheet is opened again. */
export interface KeptOffer {
  at: number;
  baseRevision: number;
  kept: KeptSheetDraft;
}

export interface SaveConflict {
  baseRevision: number;
  currentRevision: number | null;
}

function currentRevisionOf(error: ApiError): number | null {
  const details = error.details as { currentRevision?: unknown } | undefined;
  return typeof details?.currentRevision === 'number' ? details.currentRevision : null;
}

export function useBuildSheet(sheetId: Ref<string>, units: Ref<UnitSystem>, userId: Ref<string | null> = ref(null)) {
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
  /** Raw text of every number typed since the sheet was loaded, by input path. */
  const typed = reactive<Record<string, TypedText>>({});
  /** A kept draft waiting for "restore" or "discard"; nothing is written over it meanwhile. */
  const offer = ref<KeptOffer | null>(null);
  /** When the sheet on screen is this device's copy (no signal at opening): when that copy was seen. */
  const keptCopyAt = ref<number | null>(null);
  /** Bumped when a kept draft is restored, so the inputs start again from its typed text. */
  const restoreKey = ref(0);
  /** Unsaved work: a changed draft, or text in an input that the draft cannot hold yet. */
  const unsaved = computed(() => dirty.value || hasBadText(typed));

  function adopt(next: BuildSheetDetail): void {
    detail.value = next;
    classId.value = next.buildSheet.classId;
    baseRevision.value = next.revision.number;
    const spec = next.revision.specification as Specification | undefined;
    draft.value = spec?.vehicle ? draftFromSpecification(spec, next.buildSheet.classId) : emptyDraft(next.buildSheet.classId);
    savedSnapshot.value = JSON.stringify({ d: draft.value, c: classId.value });
  }

  function clearTyped(): void {
    for (const key of Object.keys(typed)) delete typed[key];
  }

  /** Writes the draft to this device now when there is unsaved work, else forgets what was kept. */
  function keepNow(): void {
    clearTimeout(keepTimer);
    const user = userId.value;
    if (!user || !detail.value || offer.value || !canEdit.value) return;
    if (!unsaved.value) return forgetSheetDraft(user, sheetId.value);
    keepSheetDraft(user, sheetId.value, {
      baseRevision: baseRevision.value,
      classId: classId.value,
      units: units.value,
      draft: plainCopy(toRaw(draft.value)),
      typed: plainCopy(typed),
    });
  }
  let keepTimer: ReturnType<typeof setTimeout> | undefined;
  // Text typed in one unit system would read as another value in the other.
  watch(units, clearTyped);
  watch([plainDraft, classId, typed], () => {
    clearTimeout(keepTimer);
    keepTimer = setTimeout(keepNow, KEEP_DELAY_MS);
  }, { deep: true });

  /** Offers the draft this device kept, unless it is what the server has anyway. */
  function offerKept(): void {
    const user = userId.value;
    offer.value = null;
    if (!user) return;
    const kept = recallSheetDraft(user, sheetId.value);
    if (!kept) return;
    const same = JSON.stringify({ d: kept.value.draft, c: kept.value.classId }) === savedSnapshot.value && !hasBadText(kept.value.typed);
    if (same) forgetSheetDraft(user, sheetId.value);
    else offer.value = { at: kept.at, baseRevision: kept.value.baseRevision, kept: kept.value };
  }

  async function load(): Promise<void> {
    loading.value = true;
    loadError.value = null;
    try {
      const next = await garageApi.getSheet(sheetId.value);
      clearTyped();
      adopt(next);
      keptCopyAt.value = null;
      if (userId.value) keep('sheet', userId.value, sheetId.value, next);
      conflict.value = null;
      serverErrors.value = {};
      offerKept();
    } catch (error) {
      const copy = userId.value && isUnreachable(error) ? recall<BuildSheetDetail>('sheet', userId.value, sheetId.value) : null;
      if (copy) {
        clearTyped();
        adopt(copy.value);
        keptCopyAt.value = copy.at;
        offerKept();
      } else loadError.value = errorMessage(error);
    } finally {
      loading.value = false;
    }
  }

  /** Puts the kept draft back on screen, typed text included, on top of the revision it started from. */
  function restoreKept(): void {
    const kept = offer.value?.kept;
    if (!kept) return;
    offer.value = null;
    draft.value = plainCopy(kept.draft);
    if (kept.classId) classId.value = kept.classId;
    baseRevision.value = kept.baseRevision;
    clearTyped();
    // Text typed in other units would read as other values: then the parsed values alone come back.
    if (kept.units === units.value) Object.assign(typed, kept.typed);
    restoreKey.value += 1;
    keepNow();
  }

  function discardKept(): void {
    if (userId.value) forgetSheetDraft(userId.value, sheetId.value);
    offer.value = null;
  }

  /** The conflict view's "load the latest": the builder drops their changes, here and on the device. */
  async function dropMineAndLoad(): Promise<void> {
    if (userId.value) forgetSheetDraft(userId.value, sheetId.value);
    offer.value = null;
    await load();
  }

  // Closing the tab with unsaved work asks first, and writes the draft at once (the pause may not end).
  const onBeforeUnload = (event: BeforeUnloadEvent) => {
    keepNow();
    if (!unsaved.value || !canEdit.value) return;
    event.preventDefault();
    event.returnValue = ''; // older browsers show the prompt only with a returnValue set
  };
  const onHide = () => document.visibilityState === 'hidden' && keepNow();
  if (typeof window !== 'undefined') {
    window.addEventListener('beforeunload', onBeforeUnload);
    window.addEventListener('pagehide', keepNow);
    document.addEventListener('visibilitychange', onHide);
    onScopeDispose(() => {
      keepNow();
      window.removeEventListener('beforeunload', onBeforeUnload);
      window.removeEventListener('pagehide', keepNow);
      document.removeEventListener('visibilitychange', onHide);
    });
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
      const onScreen = draft.value;
      adopt(saved);
      draft.value = onScreen;
      savedSnapshot.value = JSON.stringify({ d: draft.value, c: classId.value });
      conflict.value = null;
      keptCopyAt.value = null;
      clearTyped();
      if (userId.value) {
        forgetSheetDraft(userId.value, sheetId.value);
        keep('sheet', userId.value, sheetId.value, saved);
      }
      return true;
    } catch (error) {
      if (error instanceof ApiError && error.status === 409) {
        conflict.value = { baseRevision: baseRevision.value, currentRevision: currentRevisionOf(error) };
      } else if (isUnreachable(error)) {
        keepNow();
        saveError.value = 'Not saved: the server cannot be reached. Your changes are kept on this device; save again when the signal is back.';
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
    keepNow();
  }

  return {
    detail, draft, plainDraft, classId, baseRevision, loading, loadError, saving, saveError, serverErrors, conflict, dirty, canEdit,
    typed, offer, keptCopyAt, restoreKey, unsaved,
    load, save, keepMine, adopt, restoreKept, discardKept, dropMineAndLoad, keepNow,
  };
}

/** The API reports specification fields as `specification.members.0.wallMm`; inputs know `members.0.wallMm`. */
export function stripPrefix(errors: Readonly<Record<string, string>>): Record<string, string> {
  return problemsByPath(Object.entries(errors).map(([path, message]) => ({ path: path.replace(/^specification\./, ''), message })));
}
