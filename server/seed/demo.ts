import type { DataSource } from 'typeorm';
import { hashPassword } from '../auth/passwords';
import { GroupMembership, ResearchGroup, User } from '../db/entities';
import { newId } from '../ids';
import type { GroupRole, SiteRole } from '../../shared/api/schemas';

/**
 * DEMO DATA — an invented research group with invented people, created on first start so a new
 * installation has something to sign in with. None of these people or the group exist.
 */
export const demoGroup = {
  name: 'Tidewater Institute — Nonlocal Criticality Group (demo, invented)',
  description:
    'Invented demo group. Studies long-range O(N) models in d = 3 with propagator power s between 3/2 and 2.',
};

export interface DemoPerson {
  name: string;
  email: string;
  password: string;
  siteRole: SiteRole;
  groupRole: GroupRole | null;
}

export const demoPeople: DemoPerson[] = [
  { name: 'Orla Penhallow (demo admin)', email: 'admin@demo.rungbook.example', password: 'demo-admin-pass', siteRole: 'admin', groupRole: null },
  { name: 'Teodor Vashti (demo lead)', email: 'lead@demo.rungbook.example', password: 'demo-lead-pass', siteRole: 'member', groupRole: 'lead' },
  { name: 'Imre Castellane (demo member)', email: 'imre@demo.rungbook.example', password: 'demo-member-pass', siteRole: 'member', groupRole: 'member' },
  { name: 'Sunniva Okonkwo-Reyes (demo member)', email: 'sunniva@demo.rungbook.example', password: 'demo-member-pass', siteRole: 'member', groupRole: 'member' },
];

/** Create the demo group and people when the database has no users yet. Returns whether it did. */
export async function seedDemoDataIfEmpty(dataSource: DataSource): Promise<boolean> {
  if ((await dataSource.getRepository(User).count()) > 0) return false;
  const hashes = await Promise.all(demoPeople.map((person) => hashPassword(person.password)));
  await dataSource.transaction(async (manager) => {
    const groupId = newId();
    await manager.insert(ResearchGroup, { id: groupId, ...demoGroup });
    for (const [index, person] of demoPeople.entries()) {
      const userId = newId();
      await manager.insert(User, {
        id: userId,
        name: person.name,
        email: person.email,
        emailKey: person.email.toLowerCase(),
        passwordHash: hashes[index],
        siteRole: person.siteRole,
      });
      if (person.groupRole) await manager.insert(GroupMembership, { groupId, userId, role: person.groupRole });
    }
  });
  return true;
}
