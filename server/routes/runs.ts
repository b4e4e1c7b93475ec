import { z } from 'zod';
import { idParam } from '../../shared/api/schemas';
import { CalcJob, FlowCalcJob } from '../../shared/jobs';
import { AppError } from '../http/errors';
import { route } from '../http/route';
import type { SignedInUser } from '../auth/sessions';
import type { Services } from '../services';

const runParams = z.object({ runId: idParam });
/** Any job of the calc CLI contract; validated here, so malformed jobs never reach a worker. */
const calcRequest = z.strictObject({ job: z.union([CalcJob, FlowCalcJob]) });
const CALC_WAIT_MS = 30_000;

export function runRoutes({ runs, notebooks }: Services) {
  async function visibleRun(user: SignedInUser, runId: string) {
    const run = await runs.find(runId);
    if (run.requestedBy !== user.id) {
      // Runs of a shared notebook's cells are visible to everyone who can open the notebook (site admins included: no more).
      const cellNotebook = run.cellId ? (await notebooks.cellNotebookId(run.cellId)) : null;
      if (!cellNotebook) throw new AppError('not_found', 'No such run.');
      await notebooks.access(user, cellNotebook);
    }
    return run;
  }

  return [
    route({ method: 'post', path: '/calc', access: 'signed-in', summary: 'Run one engine job (the same objects the calc CLI takes); waits up to 30 s. 422 job_too_large over the cost limit, 429 queue_full when your queue is full', body: calcRequest, status: 200,
      handler: async ({ user, body }) => {
        const run = await runs.submit({ job: body.job, userId: user!.id });
        return { run: runs.view(await runs.settle(run.id, CALC_WAIT_MS)) };
      } }),
    route({ method: 'get', path: '/runs/:runId', access: 'signed-in', summary: 'State, progress and result of a run; while queued, how many jobs are ahead of it', params: runParams,
      handler: async ({ user, params }) => ({ run: runs.view(await visibleRun(user!, params.runId)) }) }),
    route({ method: 'post', path: '/runs/:runId/cancel', access: 'signed-in', summary: 'Cancel a queued or running job (whoever started it, or an editor of its notebook)', params: runParams,
      handler: async ({ user, params }) => {
        const run = await visibleRun(user!, params.runId);
        if (run.requestedBy !== user!.id) {
          const notebookId = run.cellId ? await notebooks.cellNotebookId(run.cellId) : null;
          if (!notebookId) throw new AppError('forbidden', 'Only whoever started this run can cancel it.');
          await notebooks.editable(user!, notebookId);
        }
        return { run: runs.view(await runs.cancel(params.runId)) };
      } }),
  ];
}
