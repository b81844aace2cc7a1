// One ruleset version in the editor: loaded, edited in place, autosaved while it is a draft (read
// only once published), checked as it changes with the same validation the server uses, imported
// from a file and deleted.
import { computed, ref, watch, type Ref } from 'vue';
import type { RulesetVersionWire } from '@contracts/checks';
import type { DocumentProblem, RulesetDocument } from '@contracts/ruleset';
import { validateRulesetDocument } from '@domain/rules/validate';
import { deleteDraft, importDraft, loadVersion, saveDraft } from '@/api/rulebook-admin';
import { ApiError, errorMessage } from '@/api/errors';
import { useRulebookAutosave } from './useRulebookAutosave';

export function useRulebookDraft(versionId: Ref<string>) {
  const version = ref<RulesetVersionWire | null>(null);
  const document = ref<RulesetDocument | null>(null) as Ref<RulesetDocument | null>;
  const lockVersion = ref(0);
  const loading = ref(true);
  const loadError = ref<string | null>(null);
  const readOnly = computed(() => version.value?.status !== 'draft');
  const paused = computed(() => loading.value || readOnly.value || document.value === null);

  const autosave = useRulebookAutosave<RulesetDocument | null>({
    document,
    lockVersion,
    paused,
    save: (doc, lock) => saveDraft(versionId.value, lock, doc),
  });

  const problems = computed<DocumentProblem[]>(() => {
    if (!document.value) return [];
    const v = validateRulesetDocument(document.value);
    return v.ok ? [] : v.problems;
  });

  async function load(): Promise<void> {
    loading.value = true;
    loadError.value = null;
    try {
      const v = await loadVersion(versionId.value);
      version.value = v;
      autosave.reset(v.document as RulesetDocument, v.lockVersion);
    } catch (err) {
      loadError.value = errorMessage(err);
    } finally {
      loading.value = false;
    }
  }

  const importErrors = ref<{ path: string; message: string }[]>([]);
  async function importFile(text: string): Promise<boolean> {
    importErrors.value = [];
    await autosave.saveNow();
    try {
      await importDraft(versionId.value, lockVersion.value, text);
      await load();
      return true;
    } catch (err) {
      const details = err instanceof ApiError && Array.isArray(err.details) ? (err.details as { path: string; message: string }[]) : [];
      importErrors.value = details.length ? details : [{ path: '', message: errorMessage(err) }];
      return false;
    }
  }

  async function remove(): Promise<void> {
    await deleteDraft(versionId.value);
  }

  watch(versionId, load, { immediate: true });

  return { version, document, lockVersion, loading, loadError, readOnly, problems, autosave, load, importFile, importErrors, remove };
}
