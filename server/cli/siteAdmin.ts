import 'reflect-metadata';
import { loadConfig } from '../config';
import { openDatabase } from '../db/data-source';
import { User } from '../db/entities';

/**
 * Grant or revoke site-admin rights from the command line: the only way to make an administrator, so a
 * production installation never ships one. Usage: npm run site-admin -- grant|revoke <e-mail>
 */
async function siteAdmin(action: string | undefined, email: string | undefined) {
  if ((action !== 'grant' && action !== 'revoke') || !email) {
    throw new Error('usage: npm run site-admin -- grant|revoke <e-mail of an existing account>');
  }
  const { databasePath, databaseUrl } = loadConfig();
  const dataSource = await openDatabase(databasePath, databaseUrl);
  try {
    const users = dataSource.getRepository(User);
    const user = await users.findOneBy({ emailKey: email.trim().toLowerCase() });
    if (!user) throw new Error(`no account has the e-mail ${email}`);
    await users.update({ id: user.id }, { siteRole: action === 'grant' ? 'admin' : 'member' });
    process.stdout.write(`${user.email} is now ${action === 'grant' ? 'a site admin' : 'a member'}; their open sessions pick this up within seconds.\n`);
  } finally {
    await dataSource.destroy();
  }
}

siteAdmin(process.argv[2], process.argv[3]).catch((error) => {
  process.stderr.write(`site-admin: ${error instanceof Error ? error.message : String(error)}\n`);
  process.exit(1);
});
