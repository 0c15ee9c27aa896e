import 'server-only';
import type { z } from 'zod';
import { writeTransaction } from '@/db/knex';
import { recordAudit } from '@/db/audit';
import { clientNameTaken, getClient, insertClient, rotateClientKey, updateClient, type ClientListRow, type ClientRecord } from '@/db/clients';
import { findLivePass, getPass, insertPass, renewPass as renewPassRow, revokeClientPasses, revokePass as revokePassRow, type PassRecord } from '@/db/passes';
import { getPublishedWidget, getWidget } from '@/db/widgets';
import { listClients } from '@/db/clients';
import { listPasses, passDailyCounts, type DailyCounts } from '@/db/passes';
import { AppError, conflict, fieldError, notFound } from '@/lib/server/http/errors';
import { env } from '@/lib/server/env';
import type { Member } from '@/lib/server/auth/guard';
import type { clientCreateSchema, clientPatchSchema, passCreateSchema, passRenewSchema } from '@/lib/core/embed/schemas';
import { mintPassToken } from '@/lib/server/embed/tokens';
import { embedSnippet } from '@/lib/server/embed/snippet';
import { passStatus, PASS_STATUS_LABEL } from '@/lib/core/embed/status';
import type { ClientListView, ClientView, PassView } from '@/lib/core/embed/views';

// Clients and passes: the rules behind the dashboard's buttons, each change audited.

export function clientView(c: ClientRecord): ClientView {
  return {
    id: c.id,
    name: c.name,
    note: c.note,
    allowedOrigins: c.allowedOrigins,
    allowedEmailDomains: c.allowedEmailDomains,
    snapshotAnyAddress: c.snapshotAnyAddress,
    keyVersion: c.keyVersion,
    keyRotatedAt: c.notBefore,
    createdAt: c.createdAt,
    updatedAt: c.updatedAt,
    archivedAt: c.archivedAt,
  };
}

export const clientListView = (c: ClientListRow): ClientListView => ({ ...clientView(c), activePasses: c.activePasses, totalPasses: c.totalPasses, lastViewAt: c.lastViewAt });

export async function passView(p: PassRecord): Promise<PassView> {
  const status = passStatus(p);
  const dead = status === 'revoked' || status === 'key_rotated' || status === 'expired';
  const snippet =
    !dead && p.current && !p.current.revokedAt
      ? embedSnippet({
          appUrl: env().APP_URL,
          passId: p.id,
          token: await mintPassToken({ passId: p.id, clientId: p.clientId, keyVersion: p.current.keyVersion, jti: p.current.jti, issuedAt: p.current.issuedAt, expiresAt: p.current.expiresAt }),
          title: p.widgetTitle,
        })
      : null;
  return {
    id: p.id,
    clientId: p.clientId,
    clientName: p.clientName,
    widgetId: p.widgetId,
    widgetTitle: p.widgetTitle,
    status,
    statusLabel: PASS_STATUS_LABEL[status],
    createdAt: p.createdAt,
    createdByName: p.createdByName,
    expiresAt: p.expiresAt,
    renewedAt: p.renewedAt,
    revokedAt: p.revokedAt,
    lastViewAt: p.lastViewAt,
    counts: p.counts,
    snippet,
    olderSnippetsLive: dead ? 0 : p.olderLive,
  };
}

const nameConflict = () =>
  new AppError('conflict', 'A client with this name already exists.', {
    fields: { name: ['A client with this name already exists (it may be archived: restore it instead).'] },
  });

export async function createClient(m: Member, input: Omit<z.infer<typeof clientCreateSchema>, 'snapshotAnyAddress'> & { snapshotAnyAddress?: boolean }): Promise<ClientRecord> {
  return writeTransaction(async (trx) => {
    if (await clientNameTaken(m.firmId, input.name, null, trx)) throw nameConflict();
    const id = await insertClient(m.firmId, m.userId, input, trx);
    await recordAudit(
      { firmId: m.firmId, actorUserId: m.userId, action: 'client.created', targetType: 'client', targetId: id, detail: { name: input.name, allowedOrigins: input.allowedOrigins, allowedEmailDomains: input.allowedEmailDomains, snapshotAnyAddress: input.snapshotAnyAddress } },
      trx,
    );
    return (await getClient(m.firmId, id, trx))!;
  });
}

export async function editClient(m: Member, id: string, patch: z.infer<typeof clientPatchSchema>): Promise<ClientRecord> {
  return writeTransaction(async (trx) => {
    const before = await getClient(m.firmId, id, trx);
    if (!before) throw notFound('That client');
    if (patch.name !== undefined && (await clientNameTaken(m.firmId, patch.name, id, trx))) throw nameConflict();
    await updateClient(m.firmId, id, m.userId, patch, trx);
    const action = patch.archived === true && !before.archivedAt ? 'client.archived' : patch.archived === false && before.archivedAt ? 'client.restored' : 'client.updated';
    await recordAudit({ firmId: m.firmId, actorUserId: m.userId, action, targetType: 'client', targetId: id, detail: patch }, trx);
    return (await getClient(m.firmId, id, trx))!;
  });
}

/** A new key for the client: every pass issued so far is revoked and every token refused. */
export async function rotateKey(m: Member, id: string): Promise<{ client: ClientRecord; revokedPasses: number }> {
  return writeTransaction(async (trx) => {
    const c = await getClient(m.firmId, id, trx);
    if (!c) throw notFound('That client');
    const keyVersion = await rotateClientKey(m.firmId, id, m.userId, trx);
    const revokedPasses = await revokeClientPasses(m.firmId, id, m.userId, 'key_rotated', trx);
    await recordAudit({ firmId: m.firmId, actorUserId: m.userId, action: 'client.key_rotated', targetType: 'client', targetId: id, detail: { keyVersion, revokedPasses } }, trx);
    return { client: (await getClient(m.firmId, id, trx))!, revokedPasses };
  });
}

const expiryIn = (days: number) => new Date(Date.now() + days * 86_400_000).toISOString();

export async function createPass(m: Member, input: z.infer<typeof passCreateSchema>): Promise<PassRecord> {
  return writeTransaction(async (trx) => {
    const client = await getClient(m.firmId, input.clientId, trx);
    if (!client) throw fieldError('clientId', 'No client of your firm has this id.');
    if (client.archivedAt) throw fieldError('clientId', `${client.name} is archived: restore the client before granting it a widget.`);
    const widget = await getPublishedWidget(m.firmId, input.widgetId, trx);
    if (!widget) {
      const any = await getWidget(m.firmId, input.widgetId, trx);
      throw fieldError('widgetId', any ? 'This widget is not published (or its model is archived): publish it before granting it to a client.' : 'No widget of your firm has this id.');
    }
    if (await findLivePass(m.firmId, client.id, widget.id, trx)) throw conflict(`${client.name} already has a live pass for “${widget.title}”. Renew that pass instead of issuing a second one.`);
    const { passId } = await insertPass({ firmId: m.firmId, clientId: client.id, widgetId: widget.id, userId: m.userId, expiresAt: expiryIn(input.days), keyVersion: client.keyVersion }, trx);
    await recordAudit(
      { firmId: m.firmId, actorUserId: m.userId, action: 'pass.created', targetType: 'pass', targetId: passId, detail: { client: client.name, widget: widget.title, days: input.days } },
      trx,
    );
    return (await getPass(m.firmId, passId, trx))!;
  });
}

export async function renewPass(m: Member, id: string, input: z.infer<typeof passRenewSchema>): Promise<PassRecord> {
  return writeTransaction(async (trx) => {
    const p = await getPass(m.firmId, id, trx);
    if (!p) throw notFound('That pass');
    if (p.revokedAt) throw conflict('A revoked pass cannot be renewed. Issue a new pass instead.');
    if (p.clientArchivedAt) throw conflict(`${p.clientName} is archived: restore the client before renewing its passes.`);
    const expiresAt = expiryIn(input.days);
    await renewPassRow(m.firmId, id, { expiresAt, keyVersion: p.clientKeyVersion, retirePrevious: input.retirePrevious }, trx);
    await recordAudit({ firmId: m.firmId, actorUserId: m.userId, action: 'pass.renewed', targetType: 'pass', targetId: id, detail: { days: input.days, retirePrevious: input.retirePrevious, expiresAt } }, trx);
    return (await getPass(m.firmId, id, trx))!;
  });
}

export async function revokePass(m: Member, id: string): Promise<PassRecord> {
  return writeTransaction(async (trx) => {
    const p = await getPass(m.firmId, id, trx);
    if (!p) throw notFound('That pass');
    if (!p.revokedAt) {
      await revokePassRow(m.firmId, id, m.userId, 'revoked', trx);
      await recordAudit({ firmId: m.firmId, actorUserId: m.userId, action: 'pass.revoked', targetType: 'pass', targetId: id, detail: { client: p.clientName, widget: p.widgetTitle } }, trx);
    }
    return (await getPass(m.firmId, id, trx))!;
  });
}

export async function clientList(m: Member, opts: { includeArchived?: boolean } = {}): Promise<ClientListView[]> {
  return (await listClients(m.firmId, opts)).map(clientListView);
}

/** One client and all its passes (live or not). */
export async function clientDetail(m: Member, id: string): Promise<{ client: ClientView; passes: PassView[] }> {
  const client = await getClient(m.firmId, id);
  if (!client) throw notFound('That client');
  const passes = await Promise.all((await listPasses(m.firmId, { clientId: id })).map(passView));
  return { client: clientView(client), passes };
}

export const clientExists = async (m: Member, id: string): Promise<boolean> => (await getClient(m.firmId, id)) !== null;

export async function passList(m: Member, filters: { clientId?: string; widgetId?: string }): Promise<PassView[]> {
  return Promise.all((await listPasses(m.firmId, filters)).map(passView));
}

const PASS_DAYS = 30;

/** One pass with its page loads and dial moves per day over the last 30 days. */
export async function passDetail(m: Member, id: string): Promise<PassView & { daily: DailyCounts[] }> {
  const p = await getPass(m.firmId, id);
  if (!p) throw notFound('That pass');
  return { ...(await passView(p)), daily: await passDailyCounts(m.firmId, id, PASS_DAYS) };
}

/** The client a pass of the firm belongs to, or null when the firm has no such pass. */
export const passClientId = async (m: Member, passId: string): Promise<string | null> => (await getPass(m.firmId, passId))?.clientId ?? null;
