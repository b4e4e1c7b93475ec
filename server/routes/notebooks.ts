import { z } from 'zod';
import { idParam, latexExportQuery } from '../../shared/api/schemas';
import {
  createCellInput,
  createNotebookInput,
  listNotebooksQuery,
  moveCellInput,
  saveVersionInput,
  updateCellInput,
  updateNotebookInput,
} from '../../shared/notebook/api';
import { notebookDocument } from '../../shared/notebook/exports';
import { FileReply, RawJsonReply, route } from '../http/route';
import type { Services } from '../services';

const notebookParams = z.object({ notebookId: idParam });
const cellParams = z.object({ notebookId: idParam, cellId: idParam });
const versionParams = z.object({ notebookId: idParam, versionId: idParam });
const compareQuery = z.strictObject({ from: idParam, to: idParam });

const fileName = (title: string, extension: string) => `${title.replace(/[^A-Za-z0-9]+/g, '-').replace(/^-|-$/g, '').slice(0, 60) || 'notebook'}.${extension}`;

export function notebookRoutes({ notebooks, versions, documents }: Services) {
  return [
    route({ method: 'get', path: '/notebooks', access: 'signed-in', summary: 'Notebooks you can open, newest first', query: listNotebooksQuery,
      handler: async ({ user, query }) => ({ notebooks: await notebooks.list(user!, query) }) }),
    route({ method: 'post', path: '/notebooks', access: 'signed-in', summary: 'Create a notebook', body: createNotebookInput, status: 201,
      handler: async ({ user, body }) => ({ notebook: await notebooks.create(user!, body) }) }),
    route({ method: 'post', path: '/notebooks/import', access: 'signed-in', summary: 'Create a notebook from an exported JSON file (read only when signed in, up to IMPORT_BODY_LIMIT; parsed and checked in the document pool: 429 queue_full while it is busy)', body: notebookDocument, bodyAsText: true, status: 201,
      handler: async ({ user, text }) => ({ notebook: await versions.importDocument(user!, text) }) }),
    route({ method: 'get', path: '/notebooks/:notebookId', access: 'signed-in', summary: 'A notebook with its cells and their states', params: notebookParams,
      handler: async ({ user, params }) => ({ notebook: await notebooks.detail(user!, params.notebookId) }) }),
    route({ method: 'patch', path: '/notebooks/:notebookId', access: 'signed-in', summary: 'Rename, describe or share a notebook', params: notebookParams, body: updateNotebookInput,
      handler: async ({ user, params, body }) => ({ notebook: await notebooks.update(user!, params.notebookId, body) }) }),
    route({ method: 'delete', path: '/notebooks/:notebookId', access: 'signed-in', summary: 'Delete a notebook (owner only)', params: notebookParams,
      handler: async ({ user, params }) => notebooks.remove(user!, params.notebookId) }),

    route({ method: 'post', path: '/notebooks/:notebookId/cells', access: 'signed-in', summary: 'Add a cell', params: notebookParams, body: createCellInput, status: 201,
      handler: async ({ user, params, body }) => ({ notebook: await notebooks.addCell(user!, params.notebookId, body) }) }),
    route({ method: 'patch', path: '/notebooks/:notebookId/cells/:cellId', access: 'signed-in', summary: 'Edit a cell (409 when the revision is stale; changing a model & parameters cell keeps a version first)', params: cellParams, body: updateCellInput,
      handler: async ({ user, params, body }) => ({ notebook: await notebooks.updateCell(user!, params.notebookId, params.cellId, body) }) }),
    route({ method: 'post', path: '/notebooks/:notebookId/cells/:cellId/move', access: 'signed-in', summary: 'Move a cell', params: cellParams, body: moveCellInput,
      handler: async ({ user, params, body }) => ({ notebook: await notebooks.moveCell(user!, params.notebookId, params.cellId, body.position) }) }),
    route({ method: 'delete', path: '/notebooks/:notebookId/cells/:cellId', access: 'signed-in', summary: 'Delete a cell (a version is saved first)', params: cellParams,
      handler: async ({ user, params }) => ({ notebook: await notebooks.deleteCell(user!, params.notebookId, params.cellId) }) }),
    route({ method: 'post', path: '/notebooks/:notebookId/cells/:cellId/run', access: 'signed-in', summary: 'Run a cell on the server (422 job_too_large over the cost limit or the notebook\'s result budget)', params: cellParams, status: 202,
      handler: async ({ user, params }) => ({ run: await notebooks.runCell(user!, params.notebookId, params.cellId) }) }),
    route({ method: 'post', path: '/notebooks/:notebookId/run-all', access: 'signed-in', summary: 'Run every cell that is not up to date, as far as your queue limit allows; the rest are listed in `waiting`', params: notebookParams, status: 202,
      handler: async ({ user, params }) => notebooks.runAll(user!, params.notebookId) }),

    route({ method: 'get', path: '/notebooks/:notebookId/versions', access: 'signed-in', summary: 'Saved versions, newest first', params: notebookParams,
      handler: async ({ user, params }) => ({ versions: await versions.list(user!, params.notebookId) }) }),
    route({ method: 'post', path: '/notebooks/:notebookId/versions', access: 'signed-in', summary: 'Save a version (409 when the notebook already keeps 200 versions saved by hand; 429 beyond 60 saves per person per hour)', params: notebookParams, body: saveVersionInput, status: 201,
      handler: async ({ user, params, body }) => ({ version: await versions.save(user!, params.notebookId, body.message) }) }),
    route({ method: 'get', path: '/notebooks/:notebookId/versions/compare', access: 'signed-in', summary: 'Compare two versions cell by cell (429 queue_full while the document pool is busy)', params: notebookParams, query: compareQuery,
      handler: async ({ user, params, query }) => ({ comparison: await versions.compare(user!, params.notebookId, query.from, query.to) }) }),
    route({ method: 'get', path: '/notebooks/:notebookId/versions/:versionId', access: 'signed-in', summary: 'One version, read-only', params: versionParams,
      handler: async ({ user, params }) => new RawJsonReply(await versions.getJson(user!, params.notebookId, params.versionId)) }),
    route({ method: 'post', path: '/notebooks/:notebookId/versions/:versionId/restore', access: 'signed-in', summary: 'Restore a version (recorded as a new version; results beyond the notebook\'s result budget are left to run again)', params: versionParams,
      handler: async ({ user, params }) => ({ notebook: await versions.restore(user!, params.notebookId, params.versionId) }) }),

    route({ method: 'get', path: '/notebooks/:notebookId/export.json', access: 'signed-in', summary: 'The notebook as a Rungbook JSON file', params: notebookParams,
      handler: async ({ user, params }) => {
        const document = await versions.exportDocument(user!, params.notebookId);
        return new FileReply('application/json', fileName(document.title, 'json'), document.json);
      } }),
    route({ method: 'get', path: '/notebooks/:notebookId/export.tex', access: 'signed-in', summary: 'The notebook as a LaTeX document; ?digits=N rounds numbers, ?exact=false keeps decimals (429 queue_full while the document pool is busy)', params: notebookParams, query: latexExportQuery,
      handler: async ({ user, params, query }) => {
        const document = await versions.exportDocument(user!, params.notebookId, 'count');
        const style = { digits: query.digits, exact: query.exact !== 'false' };
        return new FileReply('application/x-tex', fileName(document.title, 'tex'), await documents.latex(document.json, user!.id, style));
      } }),
  ];
}
