import { z } from 'zod';
import { idParam } from '../../shared/api/schemas';
import { AnyJob } from '../../shared/jobs/contract';
import { route } from '../http/route';
import type { Services } from '../services';

const runParams = z.object({ runId: idParam });
/** Any job of the calc CLI contract; validated here, so malformed jobs never reach a worker. */
export const calcRequest = z.strictObject({ job: AnyJob });
const CALC_WAIT_MS = 30_000;

export function runRoutes({ runs, notebooks }: Services) {
  return [
    route({ method: 'post', path: '/calc', access: 'signed-in', summary: 'Run one engine job (the same objects the calc CLI takes, the kinks and compare jobs too; body up to CALC_BODY_LIMIT); waits up to 30 s. 422 job_too_large over the cost limit, 429 queue_full when your queue is full', body: calcRequest, status: 200,
      handler: async ({ user, body }) => {
        const run = await runs.submit({ job: body.job, userId: user!.id });
        return { run: runs.view(await runs.settle(run.id, CALC_WAIT_MS)) };
      } }),
    route({ method: 'get', path: '/runs/:runId', access: 'signed-in', summary: 'State, progress and result of a run; while queued, how many jobs are ahead of it', params: runParams,
      handler: async ({ user, params }) => ({ run: runs.view(await notebooks.runOf(user!, params.runId)) }) }),
    route({ method: 'post', path: '/runs/:runId/cancel', access: 'signed-in', summary: 'Cancel a queued or running job (whoever started it, or an editor of its notebook)', params: runParams,
      handler: async ({ user, params }) => ({ run: runs.view(await notebooks.cancelRun(user!, params.runId)) }) }),
  ];
}
