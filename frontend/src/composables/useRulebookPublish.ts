// Publishing a draft, and following the re-check job's progress until it is done (polled once a
// second; polling stops when the page goes). The impact preview is useRulebookImpact's.
import { onBeforeUnmount, ref, type Ref } from 'vue';
import { jobProgress, publishDraft, retryJob, type JobProgressWire, type PublishedWire } from '@/api/rulebook-admin';
import { errorMessage } from '@/api/errors';

export function useRulebookPublish(versionId: Ref<string>, lockVersion: Ref<number>, options: { pollMs?: number } = {}) {
  const publishing = ref(false);
  const publishError = ref<string | null>(null);
  const job = ref<JobProgressWire | null>(null);
  const published = ref(false);
  /** In force now or scheduled, and from which date: what the server made of the publish. */
  const result = ref<PublishedWire | null>(null);
  let timer: ReturnType<typeof setTimeout> | null = null;

  async function poll(jobId: string): Promise<void> {
    try {
      job.value = await jobProgress(jobId);
    } catch (err) {
      publishError.value = `The re-check's progress cannot be read: ${errorMessage(err)}`;
      return;
    }
    if (job.value.state !== 'completed' && job.value.state !== 'failed') timer = setTimeout(() => void poll(jobId), options.pollMs ?? 1000);
  }

  const rerunning = ref(false);
  /** Runs the re-check again after it finally failed; it continues from the sheets already done. */
  async function rerun(): Promise<void> {
    const current = job.value;
    if (!current || current.state !== 'failed') return;
    rerunning.value = true;
    publishError.value = null;
    try {
      job.value = await retryJob(current.id);
      await poll(current.id);
    } catch (err) {
      publishError.value = `The re-check could not be started again: ${errorMessage(err)}`;
    } finally {
      rerunning.value = false;
    }
  }

  async function publish(effectiveDate: string): Promise<boolean> {
    publishing.value = true;
    publishError.value = null;
    try {
      const answer = await publishDraft(versionId.value, lockVersion.value, effectiveDate);
      result.value = answer;
      published.value = true;
      if (answer.jobId) await poll(answer.jobId);
      return true;
    } catch (err) {
      publishError.value = errorMessage(err);
      return false;
    } finally {
      publishing.value = false;
    }
  }

  onBeforeUnmount(() => {
    if (timer) clearTimeout(timer);
  });

  return { publishing, publishError, publish, job, published, result, rerun, rerunning };
}
