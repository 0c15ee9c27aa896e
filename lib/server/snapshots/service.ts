import 'server-only';
import { listSnapshotJobs, type SnapshotListRow } from '@/db/snapshots';
import type { Member } from '@/lib/server/auth/guard';

/** The firm's snapshot requests and their delivery state, newest first; `clientId` narrows to one client. */
export function snapshotList(m: Member, clientId?: string): Promise<SnapshotListRow[]> {
  return listSnapshotJobs(m.firmId, { clientId });
}
