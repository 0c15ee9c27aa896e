import 'server-only';
import { getDb, writeTransaction } from '@/db/knex';
import { hashPassword } from '@/lib/server/auth/password';
import { insertFirmWithOwner, insertUser } from '@/db/users';
import { insertMembership } from '@/db/team';
import { recordAudit } from '@/db/audit';
import { seedDemoExtras } from '@/lib/dev/seed/extras';

// An invented scenario: a small consultancy and its people. Domains use the reserved .example TLD.
export const DEMO_FIRM = 'Orrin Vale Consulting Engineers';
export const DEMO_PASSWORD = 'stochos-demo-2026';
export const DEMO_PEOPLE = [
  { email: 'owner@orrinvale.example', name: 'Maren Okafor', role: 'owner' },
  { email: 'author@orrinvale.example', name: 'Tomas Lindqvist', role: 'author' },
  { email: 'author2@orrinvale.example', name: 'Priya Raman', role: 'author' },
  { email: 'checker@orrinvale.example', name: 'Jonah Beck', role: 'checker' },
] as const;

export async function seedDemo(opts: { reset?: boolean } = {}): Promise<string> {
  const db = getDb();
  const existing = await db('users').select('id').where({ email: DEMO_PEOPLE[0].email }).first();
  if (existing && !opts.reset) return 'Demo data already present (use --reset to recreate it).';
  if (existing) {
    const m = await db('memberships').select('firm_id').where({ user_id: existing.id }).first();
    if (m) await db('firms').where({ id: m.firm_id }).delete();
    await db('users').whereIn('email', DEMO_PEOPLE.map((p) => p.email)).delete();
  }
  const hash = await hashPassword(DEMO_PASSWORD);
  const firmId = await writeTransaction(async (trx) => {
    const ids: Record<string, string> = {};
    for (const p of DEMO_PEOPLE) ids[p.email] = await insertUser({ email: p.email, name: p.name, passwordHash: hash, verified: true }, trx);
    const firmId = await insertFirmWithOwner({ name: DEMO_FIRM }, ids[DEMO_PEOPLE[0].email]!, trx);
    for (const p of DEMO_PEOPLE.slice(1)) await insertMembership(firmId, ids[p.email]!, p.role, trx);
    await recordAudit({ firmId, actorUserId: ids[DEMO_PEOPLE[0].email]!, action: 'firm.created', targetType: 'firm', targetId: firmId, detail: { name: DEMO_FIRM, seeded: true } }, trx);
    return firmId;
  });
  await seedDemoExtras(firmId);
  return `Seeded ${DEMO_FIRM} with ${DEMO_PEOPLE.length} people (password ${DEMO_PASSWORD}).`;
}
