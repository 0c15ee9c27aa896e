import Database from 'better-sqlite3';
import path from 'node:path';
import fs from 'node:fs';
import { SyncPg } from './pg-sync';
import { randomUUID, createHash, randomBytes } from 'node:crypto';

// Direct writes to the test database, for setting up targets that the API under test then acts on.
// Under `npm run test:postgres` the stack leaves the database's URL in `database-url`: the same calls then go to
// PostgreSQL through a synchronous handle with the better-sqlite3 methods the tests use (write portable SQL).
export function openTestDb(dataDir: string): Database.Database {
  const urlFile = path.join(dataDir, 'database-url');
  if (fs.existsSync(urlFile)) return new SyncPg(fs.readFileSync(urlFile, 'utf8').trim()) as unknown as Database.Database;
  const db = new Database(path.join(dataDir, 'stochos.sqlite'));
  db.pragma('busy_timeout = 5000');
  return db;
}

export function firmIdOf(db: Database.Database, email: string): string {
  return (db.prepare("select m.firm_id from memberships m join users u on u.id = m.user_id where u.email = ? and m.status = 'active'").get(email) as { firm_id: string }).firm_id;
}

export function insertInvitation(db: Database.Database, firmId: string, role = 'author'): { id: string; token: string } {
  const id = randomUUID();
  const token = randomBytes(32).toString('base64url');
  db.prepare('insert into invitations (id, firm_id, email, role, token_hash, expires_at, created_at) values (?,?,?,?,?,?,?)').run(
    id,
    firmId,
    `direct-${id}@test-firm.example`,
    role,
    createHash('sha256').update(token).digest('hex'),
    new Date(Date.now() + 86_400_000).toISOString(),
    new Date().toISOString(),
  );
  return { id, token };
}

export function insertMember(db: Database.Database, firmId: string, role: string, status: 'active' | 'removed'): string {
  const userId = randomUUID();
  const id = randomUUID();
  const now = new Date().toISOString();
  db.prepare('insert into users (id, email, name, created_at) values (?,?,?,?)').run(userId, `direct-${userId}@test-firm.example`, 'Direct Member', now);
  db.prepare('insert into memberships (id, firm_id, user_id, role, status, created_at, updated_at) values (?,?,?,?,?,?,?)').run(id, firmId, userId, role, status, now, now);
  return id;
}

export function insertApiKey(db: Database.Database, firmId: string): { id: string; secret: string } {
  const id = randomUUID();
  const secret = `stk_${randomBytes(24).toString('base64url')}`;
  db.prepare('insert into api_keys (id, firm_id, name, prefix, key_hash, created_at) values (?,?,?,?,?,?)').run(
    id,
    firmId,
    'direct key',
    secret.slice(0, 10),
    createHash('sha256').update(secret).digest('hex'),
    new Date().toISOString(),
  );
  return { id, secret };
}

const hashToken = (token: string) => createHash('sha256').update(token).digest('hex');

/** A sign-up waiting for its confirmation, as if its e-mail had been sent; `passwordHash` is a bcrypt hash. */
export function insertPendingSignUp(db: Database.Database, passwordHash: string): { token: string; email: string } {
  const id = randomUUID();
  const token = randomBytes(32).toString('base64url');
  const email = `pending-${id}@test-firm.example`;
  db.prepare('insert into pending_sign_ups (id, email, name, firm_name, password_hash, token_hash, expires_at, created_at) values (?,?,?,?,?,?,?,?)').run(
    id,
    email,
    'Pending Person',
    'Pending firm',
    passwordHash,
    hashToken(token),
    new Date(Date.now() + 3_600_000).toISOString(),
    new Date().toISOString(),
  );
  return { token, email };
}

/** A user with no firm and an open password-reset link. */
export function insertPasswordReset(db: Database.Database): { token: string; email: string } {
  const userId = randomUUID();
  const token = randomBytes(32).toString('base64url');
  const email = `reset-${userId}@test-firm.example`;
  const now = new Date().toISOString();
  db.prepare('insert into users (id, email, name, created_at) values (?,?,?,?)').run(userId, email, 'Reset Person', now);
  db.prepare('insert into password_resets (id, user_id, token_hash, expires_at, created_at) values (?,?,?,?,?)').run(randomUUID(), userId, hashToken(token), new Date(Date.now() + 1_800_000).toISOString(), now);
  return { token, email };
}
