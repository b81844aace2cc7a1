// The impact job (queue `ruleset.impact`): a draft against every active build sheet of the classes its
// changes concern, worked out in the check service's bulk pool while the admin watches its progress
// (GET /api/jobs/:id); the summary is kept with the job's progress as its result. It stores nothing
// else, so a retry after a crash simply starts again. A draft deleted or published before the job runs
// fails it at once with that reason (retrying could not help).
import { FinalJobError, type Jobs } from '../jobs';
import { impactQueueName, ImpactCannotRunError, type ImpactJobData, type RulebookAdminService } from '../rulebook-admin.service';

export async function registerImpactWorker(jobs: Jobs, deps: { rulebookAdmin: RulebookAdminService }): Promise<void> {
  await jobs.work<ImpactJobData>(impactQueueName, async (job) => {
    try {
      const impact = await deps.rulebookAdmin.computeImpact(job.data, job.progress, job.attempt);
      await job.progress.setResult({ kind: 'impact', impact });
    } catch (err) {
      if (err instanceof ImpactCannotRunError) throw new FinalJobError(err.message);
      throw err;
    }
  });
}
