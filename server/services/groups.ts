import type { DataSource } from 'typeorm';
import type {
  AddMemberInput,
  CreateGroupInput,
  GroupDetail,
  GroupRole,
  GroupSummary,
} from '../../shared/api/schemas';
import type { SignedInUser } from '../auth/sessions';
import { GroupMembership, ResearchGroup, User } from '../db/entities';
import { AppError } from '../http/errors';
import { newId } from '../ids';
import { emailKey } from './accounts';
import type { NotebookEventBus } from './notebookEvents';

export interface GroupService {
  listFor(viewer: SignedInUser): Promise<GroupSummary[]>;
  create(viewer: SignedInUser, input: CreateGroupInput): Promise<GroupDetail>;
  detail(viewer: SignedInUser, groupId: string): Promise<GroupDetail>;
  addMember(viewer: SignedInUser, groupId: string, input: AddMemberInput): Promise<GroupDetail>;
  changeRole(viewer: SignedInUser, groupId: string, userId: string, role: GroupRole): Promise<GroupDetail>;
  removeMember(viewer: SignedInUser, groupId: string, userId: string): Promise<GroupDetail>;
}

/** `events` hears of every membership change: grants to the group change its members' notebook roles. */
export function createGroupService(dataSource: DataSource, events?: Pick<NotebookEventBus, 'accessChanged'>): GroupService {
  const groups = dataSource.getRepository(ResearchGroup);
  const memberships = dataSource.getRepository(GroupMembership);

  async function loadGroup(groupId: string) {
    const group = await groups.findOne({ where: { id: groupId }, relations: { memberships: { user: true } } });
    if (!group) throw new AppError('not_found', 'No such research group.');
    return group;
  }

  function roleOf(group: ResearchGroup, userId: string): GroupRole | null {
    return group.memberships?.find((m) => m.userId === userId)?.role ?? null;
  }

  function toDetail(group: ResearchGroup, viewer: SignedInUser): GroupDetail {
    const members = (group.memberships ?? [])
      .map((m) => ({ userId: m.userId, name: m.user?.name ?? '', email: m.user?.email ?? '', role: m.role }))
      .sort((a, b) => (a.role === b.role ? a.name.localeCompare(b.name) : a.role === 'lead' ? -1 : 1));
    return {
      id: group.id,
      name: group.name,
      description: group.description,
      myRole: roleOf(group, viewer.id),
      memberCount: members.length,
      members,
    };
  }

  /** Members see their group; site admins see every group. */
  async function viewable(viewer: SignedInUser, groupId: string) {
    const group = await loadGroup(groupId);
    if (viewer.siteRole !== 'admin' && !roleOf(group, viewer.id)) {
      throw new AppError('not_found', 'No such research group.');
    }
    return group;
  }

  /**
   * Leads manage membership of their group; site admins may remove members and change roles in any group,
   * but never their own role (that would let them lead any group and read its notebooks). Adding people
   * is for leads only (addMember).
   */
  async function manageable(viewer: SignedInUser, groupId: string, targetUserId?: string) {
    const group = await viewable(viewer, groupId);
    if (roleOf(group, viewer.id) === 'lead') return group;
    if (viewer.siteRole !== 'admin') throw new AppError('forbidden', 'Only a lead of this group can change its membership.');
    if (targetUserId === viewer.id) {
      throw new AppError('forbidden', 'A site admin cannot change their own role in a group: ask a lead of the group.');
    }
    return group;
  }

  function assertKeepsALead(group: ResearchGroup, userId: string, newRole: GroupRole | null) {
    const leadsAfter = (group.memberships ?? []).filter((m) => (m.userId === userId ? newRole === 'lead' : m.role === 'lead'));
    if (leadsAfter.length === 0) throw new AppError('conflict', 'A research group must keep at least one lead.');
  }

  return {
    async listFor(viewer) {
      const query = groups
        .createQueryBuilder('g')
        .leftJoin('g.memberships', 'all_members')
        .leftJoin('g.memberships', 'mine', 'mine.userId = :viewerId', { viewerId: viewer.id })
        .select(['g.id AS id', 'g.name AS name', 'g.description AS description', 'mine.role AS "myRole"'])
        .addSelect('COUNT(all_members.userId)', 'memberCount')
        .groupBy('g.id')
        // one row of `mine` at most per group; PostgreSQL wants every selected column grouped or aggregated
        .addGroupBy('mine.role')
        .orderBy('g.name');
      if (viewer.siteRole !== 'admin') query.where('mine.userId IS NOT NULL');
      const rows = await query.getRawMany<GroupSummary>();
      return rows.map((row) => ({ ...row, myRole: row.myRole ?? null, memberCount: Number(row.memberCount) }));
    },

    async create(viewer, input) {
      if (!viewer.emailVerified) {
        throw new AppError('email_not_verified', 'Confirm your e-mail address before starting a research group: follow the link we sent you, or ask for a new one.');
      }
      const id = newId();
      await dataSource.transaction(async (manager) => {
        await manager.insert(ResearchGroup, { id, name: input.name, description: input.description });
        await manager.insert(GroupMembership, { groupId: id, userId: viewer.id, role: 'lead' });
      });
      return toDetail(await loadGroup(id), viewer);
    },

    async detail(viewer, groupId) {
      return toDetail(await viewable(viewer, groupId), viewer);
    },

    async addMember(viewer, groupId, input) {
      // Site admins included: an admin who could add people anywhere could bring in a second account of
      // their own and read the group's notebooks.
      const group = await viewable(viewer, groupId);
      if (roleOf(group, viewer.id) !== 'lead') throw new AppError('forbidden', 'Only a lead of this group can add people to it.');
      const user = await dataSource.getRepository(User).findOneBy({ emailKey: emailKey(input.email) });
      // Unknown and unverified addresses get the same answer: a lead learns nothing about who signed up.
      if (!user || user.emailVerifiedAt === null) {
        throw new AppError('email_not_verified', 'No verified Rungbook account has this e-mail. Its owner must sign up and confirm the address first.', {
          email: 'No verified account with this e-mail',
        });
      }
      if (roleOf(group, user.id)) throw new AppError('conflict', `${user.name} is already in this group.`);
      await memberships.insert({ groupId, userId: user.id, role: input.role });
      events?.accessChanged({ userId: user.id });
      return toDetail(await loadGroup(groupId), viewer);
    },

    async changeRole(viewer, groupId, userId, role) {
      const group = await manageable(viewer, groupId, userId);
      if (!roleOf(group, userId)) throw new AppError('not_found', 'This person is not in the group.');
      assertKeepsALead(group, userId, role);
      await memberships.update({ groupId, userId }, { role });
      return toDetail(await loadGroup(groupId), viewer);
    },

    async removeMember(viewer, groupId, userId) {
      // Anyone may leave a group; removing someone else needs a lead.
      const group = userId === viewer.id ? await viewable(viewer, groupId) : await manageable(viewer, groupId);
      if (!roleOf(group, userId)) throw new AppError('not_found', 'This person is not in the group.');
      assertKeepsALead(group, userId, null);
      await memberships.delete({ groupId, userId });
      events?.accessChanged({ userId });
      return toDetail(await loadGroup(groupId), viewer);
    },
  };
}
