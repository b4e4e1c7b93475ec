import { z } from 'zod';
import { idParam } from '../../shared/api/schemas';
import { addNotebookMemberInput, changeNotebookMemberInput, createShareLinkInput, transferOwnershipInput } from '../../shared/notebook/sharing';
import { route } from '../http/route';
import type { Services } from '../services';

const notebookParams = z.object({ notebookId: idParam });
const memberParams = z.object({ notebookId: idParam, memberId: idParam });
const invitationParams = z.object({ notebookId: idParam, invitationId: idParam });
const linkParams = z.object({ notebookId: idParam, linkId: idParam });
// Any text: a malformed token gets the same 404 as an unknown one.
const sharedParams = z.object({ token: z.string() });

export function sharingRoutes({ sharing }: Services) {
  return [
    route({ method: 'get', path: '/notebooks/:notebookId/members', access: 'signed-in', summary: 'People and groups with a role on the notebook; invitations and share links for those who manage sharing', params: notebookParams,
      handler: async ({ user, params }) => sharing.view(user!, params.notebookId) }),
    route({ method: 'post', path: '/notebooks/:notebookId/members', access: 'signed-in', summary: 'Share with a person by e-mail (invited when without a confirmed account) or with one of your groups (429 beyond the hourly e-mail limit)', params: notebookParams, body: addNotebookMemberInput,
      handler: async ({ user, params, body }) => sharing.addMember(user!, params.notebookId, body) }),
    route({ method: 'patch', path: '/notebooks/:notebookId/members/:memberId', access: 'signed-in', summary: 'Change the role of a person or group', params: memberParams, body: changeNotebookMemberInput,
      handler: async ({ user, params, body }) => sharing.changeMember(user!, params.notebookId, params.memberId, body.role) }),
    route({ method: 'delete', path: '/notebooks/:notebookId/members/:memberId', access: 'signed-in', summary: 'Remove a person or group (anyone may remove their own grant; 204 when nothing is left to show)', params: memberParams,
      handler: async ({ user, params }) => sharing.removeMember(user!, params.notebookId, params.memberId) }),
    route({ method: 'delete', path: '/notebooks/:notebookId/invitations/:invitationId', access: 'signed-in', summary: 'Cancel a pending invitation', params: invitationParams,
      handler: async ({ user, params }) => sharing.cancelInvitation(user!, params.notebookId, params.invitationId) }),
    route({ method: 'post', path: '/notebooks/:notebookId/owner', access: 'signed-in', summary: 'Hand the notebook to someone who already has a role on it (owner only; you stay an editor)', params: notebookParams, body: transferOwnershipInput,
      handler: async ({ user, params, body }) => sharing.transferOwnership(user!, params.notebookId, body.userId) }),
    route({ method: 'post', path: '/notebooks/:notebookId/links', access: 'signed-in', summary: 'Create a share link (the token is shown only in this reply)', params: notebookParams, body: createShareLinkInput, status: 201,
      handler: async ({ user, params, body }) => sharing.createLink(user!, params.notebookId, body) }),
    route({ method: 'delete', path: '/notebooks/:notebookId/links/:linkId', access: 'signed-in', summary: 'Revoke a share link (it stays listed as inactive)', params: linkParams,
      handler: async ({ user, params }) => sharing.revokeLink(user!, params.notebookId, params.linkId) }),
    route({ method: 'get', path: '/shared/:token', access: 'public', summary: 'The notebook behind a share link, read-only (404 for unknown, expired or revoked links)', params: sharedParams,
      handler: async ({ params }) => ({ notebook: await sharing.sharedDetail(params.token) }) }),
  ];
}
