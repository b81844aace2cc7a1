// The draft's impact on the club's build sheets: a background job on the server (so thousands of sheets
// never hold a request), started here and followed once a second until it is done; its result is the
// summary the panel shows. Polling stops when the page goes.
import { computed, onBeforeUnmount, ref, type Ref } from 'vue';
import { jobProgress, startImpact, type ImpactWire, type JobProgressWire } from '@/api/rulebook-admin';
import { errorMessage } from '@/api/errors';

const finished = (j: JobProgressWire) => j.state === 'completed' || j.state === 'failed';

export function useRulebookImpact(versionId: Ref<string>, options: { pollMs?: number } = {}) {
  const job = ref<JobProgressWire | null>(null);
  const requestError = ref<string | null>(null);
  const starting = ref(false);
  let timer: ReturnType<typeof setTimeout> | null = null;

  const impact = computed<ImpactWire | null>(() => (job.value?.state === 'completed' && job.value.result?.kind === 'impact' ? job.value.result.impact : null));
  const running = computed(() => starting.value || (job.value !== null && !finished(job.value)));
  const error = computed(() => requestError.value ?? (job.value?.state === 'failed' ? (job.value.error ?? 'The impact could not be worked out.') : null));

  async function follow(jobId: string): Promise<void> {
    try {
      job.value = await jobProgress(jobId);
    } catch (err) {
      requestError.value = `The impact's progress cannot be read: ${errorMessage(err)}`;
      return;
    }
    if (!finished(job.value)) timer = setTimeout(() => void follow(jobId), options.pollMs ?? 1000);
  }

  /** Starts a new impact job (after a save, so it sees the draft as shown) and follows it. */
  async function run(): Promise<void> {
    if (timer) clearTimeout(timer);
    starting.value = true;
    requestError.value = null;
    try {
      job.value = await startImpact(versionId.value);
    } catch (err) {
      job.value = null;
      requestError.value = errorMessage(err);
      return;
    } finally {
      starting.value = false;
    }
    if (!finished(job.value)) timer = setTimeout(() => void follow(job.value!.id), options.pollMs ?? 1000);
  }

  onBeforeUnmount(() => {
    if (timer) clearTimeout(timer);
  });

  return { job, impact, running, error, run };
}
