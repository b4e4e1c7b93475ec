import type { NotebookSummary } from '../../shared/notebook';
import { GRANTABLE_ROLES, LINK_ROLES, roleAtLeast, type GrantableRole, type LinkRole, type NotebookRole } from '../../shared/notebook/sharing';

export const roleLabels: Record<NotebookRole, string> = {
  viewer: 'Viewer',
  commenter: 'Commenter',
  editor: 'Editor',
  owner: 'Owner',
};

/** What each role lets a person do, in one line for the role picker. */
export const roleHints: Record<NotebookRole, string> = {
  viewer: 'reads the notebook and exports it',
  commenter: 'reads and comments',
  editor: 'edits, runs cells, saves versions and shares',
  owner: 'everything, including deleting the notebook',
};

/** Roles the caller may hand out: never one above their own, and never ownership (that is transferred). */
export const grantableBy = (callerRole: NotebookRole | null | undefined): GrantableRole[] =>
  GRANTABLE_ROLES.filter((role) => roleAtLeast(callerRole, role));

export const linkRolesFor = (callerRole: NotebookRole | null | undefined): LinkRole[] => LINK_ROLES.filter((role) => roleAtLeast(callerRole, role));

/** A grant the caller may change or remove: not the owner's, and not one above the caller's own role. */
export const canManageGrant = (callerRole: NotebookRole, grantRole: NotebookRole) => grantRole !== 'owner' && roleAtLeast(callerRole, grantRole);

export type LinkState = 'active' | 'expired' | 'revoked' | 'creator-lost-role';

/** The server says why an inactive link opens nothing (`inactiveReason`); older replies only carried dates. */
export function linkState(link: { active: boolean; revokedAt: string | null; inactiveReason?: string | null }): LinkState {
  if (link.revokedAt) return 'revoked';
  if (link.active) return 'active';
  return link.inactiveReason && link.inactiveReason !== 'expired' ? 'creator-lost-role' : 'expired';
}

/** How a notebook I do not own reaches me: through a group, or from the person who shared it. */
export function sharedByLine(notebook: Pick<NotebookSummary, 'role' | 'sharedBy' | 'ownerName'>): string | null {
  if (notebook.role === 'owner') return null;
  if (notebook.sharedBy?.groupName) return `via ${notebook.sharedBy.groupName}`;
  return `shared by ${notebook.sharedBy?.personName ?? notebook.ownerName}`;
}
