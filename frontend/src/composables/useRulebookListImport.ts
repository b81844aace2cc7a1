// Importing a ruleset file from the rulebook list: into the rulebook's open draft (after a confirm, as
// it replaces the draft's content), or into a new draft started for it. A refused file changes nothing:
// a draft started only for it is deleted again, and the problems are listed with their paths.
import { ref } from 'vue';
import { useConfirm } from 'primevue/useconfirm';
import { ApiError, errorMessage } from '@/api/errors';
import { deleteDraft, importDraft, loadVersion, startDraft } from '@/api/rulebook-admin';
import type { Rulebook } from '@/api/rulesets';

export interface ImportProblem {
  path: string;
  message: string;
}

export function useRulebookListImport(opened: (versionId: string) => Promise<void>) {
  const confirm = useConfirm();
  const importing = ref<string | null>(null);
  /** The refused file's problems, by rulebook id. */
  const problems = ref<Record<string, ImportProblem[]>>({});

  function refusal(err: unknown): ImportProblem[] {
    const details = err instanceof ApiError && Array.isArray(err.details) ? (err.details as ImportProblem[]) : [];
    return details.length ? details.map((d) => ({ path: d.path.replace(/^(document|text)\.?/, ''), message: d.message })) : [{ path: '', message: errorMessage(err) }];
  }

  async function run(book: Rulebook, text: string): Promise<void> {
    importing.value = book.id;
    problems.value = { ...problems.value, [book.id]: [] };
    const existing = book.versions.find((v) => v.status === 'draft');
    let started: string | null = null;
    try {
      const draftId = existing?.id ?? (started = (await startDraft(book.id)).id);
      const draft = await loadVersion(draftId);
      await importDraft(draftId, draft.lockVersion, text);
      await opened(draftId);
    } catch (err) {
      problems.value = { ...problems.value, [book.id]: refusal(err) };
      if (started) await deleteDraft(started).catch(() => undefined);
    } finally {
      importing.value = null;
    }
  }

  function importInto(book: Rulebook, text: string): void {
    const draft = book.versions.find((v) => v.status === 'draft');
    if (!draft) {
      void run(book, text);
      return;
    }
    confirm.require({
      header: 'Replace the open draft?',
      message: `Version ${draft.versionNumber} is an open draft of ${book.title}. The file replaces its content; the edition in force is not touched.`,
      acceptProps: { label: 'Replace the draft', severity: 'danger' },
      rejectProps: { label: 'Keep the draft', severity: 'secondary', outlined: true },
      accept: () => void run(book, text),
    });
  }

  return { importInto, importing, problems };
}
