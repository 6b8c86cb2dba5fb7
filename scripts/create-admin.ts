// Creates an admin account in an empty production database and prints its one-time set-password link:
//   VOLTFALL_DATA_DIR=/srv/voltfall node --import tsx scripts/create-admin.ts admin@example.com "Admin Name"
import { randomBytes, randomUUID } from 'node:crypto';
import { appendAudit } from '../server/audit/chain';
import { hashToken } from '../server/auth/routes';
import { loadConfig } from '../server/config';
import { openDatabase } from '../server/db/knex';

const [email, name] = process.argv.slice(2);
if (!email || !name) {
  console.error('usage: create-admin.ts <email> <name>');
  process.exit(2);
}
const config = loadConfig(process.env, {});
const db = await openDatabase(config.dataDir);
const token = randomBytes(32).toString('base64url');
const id = randomUUID();
const now = new Date();
await db.transaction(async (trx) => {
  await trx('user').insert({ id, email: email.toLowerCase(), name, role: 'admin', password_hash: null, disabled_at: null, created_at: now.toISOString() });
  await trx('invite').insert({ user_id: id, token_hash: hashToken(token), expires_at: new Date(now.getTime() + 72 * 3600_000).toISOString(), created_at: now.toISOString() });
  await appendAudit(trx, { actorId: null, action: 'user.create_admin', subjectType: 'user', subjectId: id, payload: { email } });
});
await db.destroy();
console.log(`Admin created. Choose the password within 72 hours at:\n${config.publicUrl ?? `http://localhost:${config.port}`}/set-password?token=${token}`);
