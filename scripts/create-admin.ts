// Creates an admin account in an empty production database and prints its one-time set-password link:
//   VOLTFALL_DATA_DIR=/srv/voltfall node --import tsx scripts/create-admin.ts admin@example.com "Admin Name"
import { randomUUID } from 'node:crypto';
import { appendAudit } from '../server/audit/chain';
import { issueLink } from '../server/auth/links';
import { systemClock } from '../server/clock';
import { loadConfig } from '../server/config';
import { openDatabase } from '../server/db/knex';

const [email, name] = process.argv.slice(2);
if (!email || !name) {
  console.error('usage: create-admin.ts <email> <name>');
  process.exit(2);
}
const config = loadConfig(process.env, {});
const db = await openDatabase(config.dataDir, { url: config.databaseUrl });
const id = randomUUID();
const link = await db.transaction(async (trx) => {
  await trx('user').insert({
    id,
    email: email.trim().toLowerCase(),
    name,
    role: 'admin',
    password_hash: null,
    disabled_at: null,
    created_at: new Date().toISOString(),
  });
  await appendAudit(trx, { actorId: null, action: 'user.create_admin', subjectType: 'user', subjectId: id, payload: { email } });
  return issueLink(trx, systemClock, id, 'invite');
});
await db.destroy();
console.log(
  `Admin created. Choose the password before ${link.expiresAt.toUTCString()} at:\n${config.publicUrl ?? `http://localhost:${config.port}`}/set-password?token=${link.token}`,
);
