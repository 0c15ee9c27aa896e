import 'server-only';
import { writeTransaction } from '@/db/knex';
import { insertClient } from '@/db/clients';
import { insertPass } from '@/db/passes';
import { listWidgets } from '@/db/widgets';
import { recordAudit } from '@/db/audit';

// Two invented client organisations of the demo firm (reserved .example domains), each with only its own
// widgets: the pump maker sees the pump models, the harbour trust the quay wall cost range. Both allow the demo
// host page's origin, which serves one portal page per client (lib/dev/host-page.ts).

const DAY = 86_400_000;

export async function seedClients(firmId: string): Promise<{ clients: number; passes: number }> {
  const hostOrigin = new URL(process.env.DEMO_HOST_PAGE_URL ?? 'http://localhost:4100').origin;
  const widgets = await listWidgets(firmId);
  return writeTransaction(async (trx) => {
    const owner = await trx('memberships').where({ firm_id: firmId, role: 'owner', status: 'active' }).select('user_id').first();
    const userId = owner.user_id as string;
    const quillbrook = await insertClient(
      firmId,
      userId,
      {
        name: 'Quillbrook Pumps Ltd',
        note: 'Pump skid redesign, phase 2. Portal run by their IT team.',
        allowedOrigins: [hostOrigin, 'https://portal.quillbrook-pumps.example'],
        allowedEmailDomains: ['quillbrook-pumps.example'],
      },
      trx,
    );
    const saltmere = await insertClient(
      firmId,
      userId,
      {
        name: 'Saltmere Harbour Trust',
        note: 'Quay wall refurbishment: cost risk reviews.',
        allowedOrigins: [hostOrigin, 'https://extranet.saltmere-harbour.example'],
        allowedEmailDomains: ['saltmere-harbour.example', 'saltmere-engineering.example'],
      },
      trx,
    );
    let passes = 0;
    // A cost range belongs to the harbour works; every other demo widget to the pump project.
    for (const w of widgets) {
      const clientId = w.template === 'cost-range' ? saltmere : quillbrook;
      const days = clientId === saltmere ? 10 : 90;
      await insertPass({ firmId, clientId, widgetId: w.id, userId, expiresAt: new Date(Date.now() + days * DAY).toISOString(), keyVersion: 1 }, trx);
      passes++;
    }
    await recordAudit({ firmId, actorUserId: userId, action: 'client.created', targetType: 'client', targetId: quillbrook, detail: { name: 'Quillbrook Pumps Ltd', seeded: true } }, trx);
    await recordAudit({ firmId, actorUserId: userId, action: 'client.created', targetType: 'client', targetId: saltmere, detail: { name: 'Saltmere Harbour Trust', seeded: true } }, trx);
    return { clients: 2, passes };
  });
}
