import { randomBytes } from 'node:crypto';
import type { DataSource } from 'typeorm';
import { hashPassword, verifyPassword } from '../auth/passwords';
import { Cell, GroupMembership, Notebook, NotebookMember, ResearchGroup, User } from '../db/entities';
import type { CellInput } from '../../shared/notebook/cells';
import { newId } from '../ids';
import type { SignedInUser } from '../auth/sessions';
import type { DatasetService } from '../services/datasets';
import { demoDatasets } from './demoDatasets';
import type { GroupRole, SiteRole } from '../../shared/api/schemas';
import { runSql } from '../db/sql';

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

/** DEMO DATA — an invented scenario: the group checks a two-loop long-range O(3) calculation in d = 3. */
export const demoNotebook: { title: string; summary: string; cells: { label: string; input: CellInput }[] } = {
  title: 'Long-range O(3) in d = 3 at two loops (demo, invented scenario)',
  summary: 'Invented scenario for the demo group: from the one-loop bubble to exponents, and a scan over s.',
  cells: [
    {
      label: 'intro',
      input: {
        kind: 'note',
        text:
          '# Invented scenario\n' +
          'The (invented) Tidewater group wants to check a two-loop result for the long-range O(3) model in $d = 3$ ' +
          'before comparing with their (invented) lattice data. The kinetic term is $(-\\partial^2)^{s/2}$ and we expand in ' +
          '$\\varepsilon = 2s - d$ at fixed $s$.\n\n$$G(a,b) = \\frac{\\Gamma(d/2-a)\\,\\Gamma(d/2-b)\\,\\Gamma(a+b-d/2)}{\\Gamma(a)\\,\\Gamma(b)\\,\\Gamma(d-a-b)}$$',
      },
    },
    { label: 'params', input: { kind: 'setup', model: { preset: 'on', N: 3 }, d: '3', s: '1.75', loops: 2, digits: 20 } },
    { label: 'bubble', input: { kind: 'integral', uses: 'params', form: 'bubble', a: 's/2', b: 's/2', d: '2*s-eps', order: 1 } },
    { label: 'flow', input: { kind: 'flow', uses: 'params' } },
    { label: 'fixed', input: { kind: 'fixedpoints', uses: 'params' } },
    { label: 'exps', input: { kind: 'exponents', uses: 'params' } },
    {
      label: 'scan',
      input: { kind: 'scan', uses: 'params', from: '1.55', to: '1.95', points: 41, quantities: ['nuInv', 'omega'], deltaSigmaShortRange: '0.5181489' },
    },
    {
      label: 'datanote',
      input: {
        kind: 'note',
        text:
          '## Against (invented) numbers\n' +
          'Both datasets of this notebook are **invented demo data** (open *Data*): a table of "lattice" values of $1/\\nu$ ' +
          'with error bars, and an upper bound on $\\Delta_{\\phi^2}$ against $\\Delta_\\phi$ with a kink planted at ' +
          '$\\Delta_\\phi = 0.625$, i.e. $s = d - 2\\Delta_\\phi = 1.75$. The cells below hold them against the series of `scan`.',
      },
    },
    { label: 'vslattice', input: { kind: 'comparison', uses: 'scan', dataset: 'lattice', kinks: false } },
    { label: 'vsbound', input: { kind: 'comparison', uses: 'scan', dataset: 'bound', quantity: 'Delta_phi2', show: 'boundary', kinks: true } },
  ],
};

export interface DemoSeedOptions {
  /**
   * Seeding a server others can reach (production, or any HOST other than loopback): no demo site admin,
   * and the published demo passwords are not used — every demo person gets `password` (DEMO_PASSWORD) or,
   * when that is unset, a random one nobody knows (the account is usable only after a password reset).
   */
  reachable?: { password?: string };
}

/** The demo people a seed creates: everyone on a local start; on a reachable server nobody with site-admin rights. */
export function demoPeopleFor(options: DemoSeedOptions = {}): DemoPerson[] {
  if (!options.reachable) return demoPeople;
  const password = () => options.reachable?.password || randomBytes(24).toString('base64url');
  return demoPeople.filter((person) => person.siteRole !== 'admin').map((person) => ({ ...person, password: password() }));
}

/** Create the demo group and people when the database has no users yet. Returns whether it did. */
export async function seedDemoDataIfEmpty(dataSource: DataSource, options: DemoSeedOptions = {}): Promise<boolean> {
  if ((await dataSource.getRepository(User).count()) > 0) return false;
  const people = demoPeopleFor(options);
  const hashes = await Promise.all(people.map((person) => hashPassword(person.password)));
  await dataSource.transaction(async (manager) => {
    const groupId = newId();
    await manager.insert(ResearchGroup, { id: groupId, ...demoGroup });
    const userIds: string[] = [];
    for (const [index, person] of people.entries()) {
      const userId = newId();
      await manager.insert(User, {
        id: userId,
        name: person.name,
        email: person.email,
        emailKey: person.email.toLowerCase(),
        passwordHash: hashes[index],
        siteRole: person.siteRole,
        emailVerifiedAt: new Date(),
      });
      userIds.push(userId);
      if (person.groupRole) await manager.insert(GroupMembership, { groupId, userId, role: person.groupRole });
    }
    const leadId = userIds[people.findIndex((p) => p.groupRole === 'lead')];
    const notebookId = newId();
    await manager.insert(Notebook, { id: notebookId, title: demoNotebook.title, summary: demoNotebook.summary, ownerId: leadId, groupId });
    await manager.insert(NotebookMember, { id: newId(), notebookId, groupId, role: 'editor', grantedById: leadId });
    for (const [position, cell] of demoNotebook.cells.entries()) {
      await manager.insert(Cell, { id: newId(), notebookId, position, kind: cell.input.kind, label: cell.label, inputJson: JSON.stringify(cell.input), revision: 1 });
    }
  });
  return true;
}

/**
 * Attach the invented demo datasets (server/seed/demoDatasets.ts) to the demo notebook, as its lead pasting
 * them: through the dataset service, the one writer of datasets. Call after seedDemoDataIfEmpty created the data.
 */
export async function attachDemoDatasets(dataSource: DataSource, datasets: Pick<DatasetService, 'paste'>): Promise<void> {
  const lead = demoPeople.find((person) => person.groupRole === 'lead')!;
  const user = await dataSource.getRepository(User).findOneByOrFail({ emailKey: lead.email.toLowerCase() });
  const notebook = await dataSource.getRepository(Notebook).findOneByOrFail({ ownerId: user.id, title: demoNotebook.title });
  const author = { id: user.id, name: user.name, email: user.email, siteRole: user.siteRole, emailVerified: true } as SignedInUser;
  for (const dataset of demoDatasets) await datasets.paste(author, notebook.id, { ...dataset.description, text: dataset.text });
}

/**
 * A database first used by a local start keeps the demo people with their published passwords. When the
 * same file is later served to others (production, or a HOST others can reach), every demo account whose
 * password is still the published one gets a random password and loses site-admin rights. Returns the
 * e-mails changed.
 */
export async function disarmPublishedDemoAccounts(dataSource: DataSource): Promise<string[]> {
  const users = dataSource.getRepository(User);
  const changed: string[] = [];
  for (const person of demoPeople) {
    const user = await users.findOneBy({ emailKey: person.email.toLowerCase() });
    if (!user || !(await verifyPassword(user.passwordHash, person.password))) continue;
    await users.update({ id: user.id }, { passwordHash: await hashPassword(randomBytes(24).toString('base64url')), siteRole: 'member' });
    changed.push(person.email);
  }
  if (changed.length) {
    // Sessions signed in with the published password end too.
    await runSql(
      dataSource,
      `DELETE FROM "sessions" WHERE "userId" IN (SELECT "id" FROM "users" WHERE "emailKey" IN (${changed.map(() => '?').join(', ')}))`,
      changed.map((e) => e.toLowerCase()),
    );
  }
  return changed;
}
