// One submission on the review page: load it, and run an action with the state and version this page
// last saw. When someone else changed it meanwhile the server says 409: the page reloads and says so,
// so nobody decides on a stale page.
import { ref, watch } from 'vue';
import { actOnSubmission, annotateFinding, getSubmission, type ReviewActionInput, type SubmissionDetail } from '@/api/review';
import { ApiError, errorMessage } from '@/api/errors';

export function useReviewSubmission(submissionId: () => string) {
  const submission = ref<SubmissionDetail | null>(null);
  const loadError = ref<string | null>(null);
  const busy = ref(false);
  const conflict = ref<string | null>(null);

  async function load(): Promise<void> {
    loadError.value = null;
    try {
      submission.value = await getSubmission(submissionId());
    } catch (e) {
      loadError.value = errorMessage(e);
    }
  }

  /** Runs the action; returns null on success, else the error (the caller shows field errors itself). */
  async function act(action: ReviewActionInput): Promise<ApiError | null> {
    const s = submission.value;
    if (!s) return null;
    busy.value = true;
    conflict.value = null;
    try {
      submission.value = await actOnSubmission(s.id, action, { state: s.state, version: s.version });
      return null;
    } catch (e) {
      const err = e instanceof ApiError ? e : new ApiError(0, 'unknown', errorMessage(e));
      if (err.status === 409) {
        conflict.value = err.message;
        await load();
      }
      return err;
    } finally {
      busy.value = false;
    }
  }

  async function annotate(findingKey: string, text: string): Promise<ApiError | null> {
    const s = submission.value;
    if (!s) return null;
    try {
      submission.value = await annotateFinding(s.id, findingKey, text);
      return null;
    } catch (e) {
      return e instanceof ApiError ? e : new ApiError(0, 'unknown', errorMessage(e));
    }
  }

  watch(submissionId, load, { immediate: true });
  return { submission, loadError, busy, conflict, load, act, annotate };
}
