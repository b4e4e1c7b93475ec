import { z } from 'zod';
import { idParam } from '../../shared/api/schemas';
import { activityQuery, markActivityReadInput, notebookActivityQuery } from '../../shared/notebook/sharing';
import { route } from '../http/route';
import type { Services } from '../services';

const notebookParams = z.object({ notebookId: idParam });

export function activityRoutes({ activity }: Services) {
  return [
    route({ method: 'get', path: '/activity', access: 'signed-in', summary: 'Your activity list, newest first (at most 100), and how many entries are unread', query: activityQuery,
      handler: async ({ user, query }) => activity.list(user!, { unreadOnly: query.unreadOnly === 'true' }) }),
    route({ method: 'post', path: '/activity/read', access: 'signed-in', summary: 'Mark entries of your activity list read (all when `ids` is omitted)', body: markActivityReadInput,
      handler: async ({ user, body }) => activity.markRead(user!, body.ids) }),
    route({ method: 'get', path: '/notebooks/:notebookId/follow', access: 'signed-in', summary: 'Whether changes to this notebook reach your activity list', params: notebookParams,
      handler: async ({ user, params }) => activity.following(user!, params.notebookId) }),
    route({ method: 'post', path: '/notebooks/:notebookId/follow', access: 'signed-in', summary: 'Follow a notebook: changes by others reach your activity list (viewer and up)', params: notebookParams,
      handler: async ({ user, params }) => activity.follow(user!, params.notebookId) }),
    route({ method: 'delete', path: '/notebooks/:notebookId/follow', access: 'signed-in', summary: 'Stop following a notebook (its owner always follows it)', params: notebookParams,
      handler: async ({ user, params }) => activity.unfollow(user!, params.notebookId) }),
    route({ method: 'get', path: '/notebooks/:notebookId/activity', access: 'signed-in', summary: 'Who did what in a notebook, newest first, 100 per page (viewer and up)', params: notebookParams, query: notebookActivityQuery,
      handler: async ({ user, params, query }) => ({ events: await activity.notebookEvents(user!, params.notebookId, query) }) }),
  ];
}
