import { z } from 'zod';
import { idParam } from '../../shared/api/schemas';
import { createCommentInput, updateCommentInput } from '../../shared/notebook/sharing';
import { route } from '../http/route';
import type { Services } from '../services';

const notebookParams = z.object({ notebookId: idParam });
const commentParams = z.object({ commentId: idParam });
// Any text: a malformed token gets the same 404 as an unknown one.
const linkParams = z.object({ token: z.string() });
const candidatesQuery = z.strictObject({ q: z.string().max(100).optional() });

export function commentRoutes({ comments }: Services) {
  return [
    route({ method: 'get', path: '/notebooks/:notebookId/comments', access: 'signed-in', summary: 'Comment threads of a notebook, oldest first (viewer and up)', params: notebookParams,
      handler: async ({ user, params }) => ({ comments: await comments.list(user!, params.notebookId) }) }),
    route({ method: 'post', path: '/notebooks/:notebookId/comments', access: 'signed-in', summary: 'Comment on the notebook or a cell, or reply to a thread (commenter and up); @handles of people with access notify them', params: notebookParams, body: createCommentInput, status: 201,
      handler: async ({ user, params, body }) => ({ comment: await comments.create(user!, params.notebookId, body) }) }),
    route({ method: 'get', path: '/notebooks/:notebookId/mention-candidates', access: 'signed-in', summary: 'People with access who can be @mentioned (commenter and up)', params: notebookParams, query: candidatesQuery,
      handler: async ({ user, params, query }) => ({ people: await comments.mentionCandidates(user!, params.notebookId, query.q) }) }),
    route({ method: 'patch', path: '/comments/:commentId', access: 'signed-in', summary: 'Edit your own comment shortly after posting, or resolve / reopen a thread (needs a role of your own on the notebook: a share link is not enough, even for a comment written through it)', params: commentParams, body: updateCommentInput,
      handler: async ({ user, params, body }) => ({ comment: await comments.update(user!, params.commentId, body) }) }),
    route({ method: 'delete', path: '/comments/:commentId', access: 'signed-in', summary: 'Delete your own comment (the notebook\'s owner may delete any); needs a role of your own on the notebook: a share link is not enough, even for a comment written through it', params: commentParams,
      handler: async ({ user, params }) => comments.remove(user!, params.commentId) }),
    route({ method: 'get', path: '/shared/:token/comments', access: 'public', summary: 'Comment threads of the notebook a share link opens', params: linkParams,
      handler: async ({ user, params }) => ({ comments: await comments.listThroughLink(params.token, user) }) }),
    route({ method: 'post', path: '/shared/:token/comments', access: 'signed-in', summary: 'Comment through a commenter link (confirmed address needed); without a role of your own the comment cannot be edited or deleted afterwards', params: linkParams, body: createCommentInput, status: 201,
      handler: async ({ user, params, body }) => ({ comment: await comments.createThroughLink(user!, params.token, body) }) }),
  ];
}
