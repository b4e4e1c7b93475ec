import { z } from 'zod';
import { addMemberInput, changeMemberRoleInput, createGroupInput, idParam } from '../../shared/api/schemas';
import { route } from '../http/route';
import type { Services } from '../services';

const groupParams = z.object({ groupId: idParam });
const memberParams = z.object({ groupId: idParam, userId: idParam });

export function groupRoutes({ groups }: Services) {
  return [
    route({
      method: 'get',
      path: '/groups',
      access: 'signed-in',
      handler: async ({ user }) => ({ groups: await groups.listFor(user!) }),
    }),
    route({
      method: 'post',
      path: '/groups',
      access: 'signed-in',
      body: createGroupInput,
      status: 201,
      handler: async ({ user, body }) => ({ group: await groups.create(user!, body) }),
    }),
    route({
      method: 'get',
      path: '/groups/:groupId',
      access: 'signed-in',
      params: groupParams,
      handler: async ({ user, params }) => ({ group: await groups.detail(user!, params.groupId) }),
    }),
    route({
      method: 'post',
      path: '/groups/:groupId/members',
      access: 'signed-in',
      params: groupParams,
      body: addMemberInput,
      status: 201,
      handler: async ({ user, params, body }) => ({ group: await groups.addMember(user!, params.groupId, body) }),
    }),
    route({
      method: 'patch',
      path: '/groups/:groupId/members/:userId',
      access: 'signed-in',
      params: memberParams,
      body: changeMemberRoleInput,
      handler: async ({ user, params, body }) => ({
        group: await groups.changeRole(user!, params.groupId, params.userId, body.role),
      }),
    }),
    route({
      method: 'delete',
      path: '/groups/:groupId/members/:userId',
      access: 'signed-in',
      params: memberParams,
      handler: async ({ user, params }) => ({ group: await groups.removeMember(user!, params.groupId, params.userId) }),
    }),
  ];
}
