import { z } from 'zod';
import { idParam } from '../../shared/api/schemas';
import { datasetDescription, pastedDataset } from '../../shared/notebook/datasets';
import { FileReply, RawJsonReply, route } from '../http/route';
import type { Services } from '../services';

const notebookParams = z.object({ notebookId: idParam });
const datasetParams = z.object({ notebookId: idParam, datasetId: idParam });
// Any text: a malformed token gets the same 404 as an unknown one.
const sharedDatasetParams = z.object({ token: z.string(), datasetId: idParam });

export function datasetRoutes({ datasets }: Services) {
  return [
    route({ method: 'post', path: '/notebooks/:notebookId/datasets', access: 'signed-in', status: 201, upload: 'file',
      summary: 'Upload a CSV or TSV table (multipart: `file`, and `description` as JSON); 413 over 10 MB, 400 invalid_table with the rows at fault, 409 label taken or notebook full, 429 beyond the hourly upload limit',
      params: notebookParams, body: datasetDescription,
      beforeUpload: async ({ user, params }) => datasets.assertMayUpload(user!, params.notebookId),
      handler: async ({ user, params, body, file }) => ({ dataset: await datasets.upload(user!, params.notebookId, body, file) }) }),
    route({ method: 'post', path: '/notebooks/:notebookId/datasets/pasted', access: 'signed-in', status: 201,
      summary: 'Store a pasted table with its description (same checks as an upload)', params: notebookParams, body: pastedDataset,
      handler: async ({ user, params, body }) => ({ dataset: await datasets.paste(user!, params.notebookId, body) }) }),
    route({ method: 'get', path: '/notebooks/:notebookId/datasets', access: 'signed-in', summary: 'The notebook\'s datasets, without their points', params: notebookParams,
      handler: async ({ user, params }) => ({ datasets: await datasets.list(user!, params.notebookId) }) }),
    route({ method: 'get', path: '/notebooks/:notebookId/datasets/:datasetId', access: 'signed-in', summary: 'One dataset with its points (also one a version still holds)', params: datasetParams,
      handler: async ({ user, params }) => new RawJsonReply(await datasets.getJson(user!, params.notebookId, params.datasetId)) }),
    route({ method: 'get', path: '/notebooks/:notebookId/datasets/:datasetId/download.csv', access: 'signed-in', summary: 'The dataset\'s stored columns as CSV (429 queue_full while the document pool is busy)', params: datasetParams,
      handler: async ({ user, params }) => {
        const { fileName, csv } = await datasets.csv(user!, params.notebookId, params.datasetId);
        return new FileReply('text/csv; charset=utf-8', fileName, csv);
      } }),
    route({ method: 'delete', path: '/notebooks/:notebookId/datasets/:datasetId', access: 'signed-in', summary: 'Take a dataset out of the notebook (a version is saved first; restoring it brings the dataset back)', params: datasetParams,
      handler: async ({ user, params }) => ({ notebook: await datasets.remove(user!, params.notebookId, params.datasetId) }) }),
    route({ method: 'get', path: '/shared/:token/datasets/:datasetId', access: 'public', summary: 'A dataset of the notebook behind a share link, with its points (404 for bad links)', params: sharedDatasetParams,
      handler: async ({ params }) => new RawJsonReply(await datasets.sharedJson(params.token, params.datasetId)) }),
  ];
}
