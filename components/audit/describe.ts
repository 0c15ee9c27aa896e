import type { AuditEntry } from '@/components/hooks/use-audit';

const ROLE: Record<string, string> = { owner: 'owner', author: 'author', checker: 'checker' };
const SETTING: Record<string, string> = {
  name: 'firm name',
  unitsDefault: 'default units',
  currencyDefault: 'default currency',
  brandColor: 'brand colour',
  requireCheck: 'publishing rule',
  paperSize: 'PDF paper size',
};

const str = (v: unknown): string | null => (typeof v === 'string' && v ? v : null);
const role = (v: unknown): string => ROLE[String(v)] ?? String(v ?? '');

/** The action in plain words, e.g. "Changed the role from author to checker". */
export function describeAction(e: AuditEntry): string {
  const d = e.detail ?? {};
  switch (e.action) {
    case 'user.signed_in':
      return 'Signed in';
    case 'user.password_changed':
      return 'Changed their password (other sessions signed out)';
    case 'user.password_reset':
      return 'Set a new password with an e-mailed link (other sessions signed out)';
    case 'firm.created':
      return d.seeded ? 'Created the firm’s account (demo data)' : 'Created the firm’s account';
    case 'member.invited':
      return `Invited someone to join as ${role(d.role)}`;
    case 'invitation.revoked':
      return 'Revoked an invitation';
    case 'member.joined':
      return `Accepted an invitation and joined as ${role(d.role)}`;
    case 'member.role_changed':
      return `Changed a member’s role from ${role(d.from)} to ${role(d.to)}`;
    case 'member.removed':
      return `Removed a member (${role(d.role)})`;
    case 'member.reactivated':
      return 'Reactivated a removed member';
    case 'notifications.changed': {
      const off = Object.entries(d).filter(([, v]) => v === false).length;
      return off ? `Changed their own e-mail notifications (${off} turned off)` : 'Changed their own e-mail notifications';
    }
    case 'settings.changed': {
      const keys = Object.keys(d).map((k) => SETTING[k] ?? k);
      return keys.length ? `Changed settings: ${keys.join(', ')}` : 'Changed settings';
    }
    default: {
      // Unknown actions still read as words: "model.version_saved" → "Model: version saved".
      const [subject, ...rest] = e.action.split('.');
      const verb = rest.join(' ').replace(/_/g, ' ');
      const s = subject.replace(/_/g, ' ');
      return verb ? `${s.charAt(0).toUpperCase()}${s.slice(1)}: ${verb}` : s;
    }
  }
}

const TARGET_TYPE: Record<string, string> = { user: 'Account', firm: 'Firm', member: 'Member', invitation: 'Invitation', model: 'Model', version: 'Version', widget: 'Widget', client: 'Client', pass: 'Pass' };

/** What the action was about: the person's e-mail, the firm's name, or the kind of record. */
export function describeTarget(e: AuditEntry): string {
  const d = e.detail ?? {};
  const named = str(d.email) ?? (e.targetType === 'firm' ? str(d.name) : null) ?? str(d.name);
  const kind = e.targetType ? (TARGET_TYPE[e.targetType] ?? e.targetType) : null;
  if (named && kind) return `${kind}: ${named}`;
  if (named) return named;
  return kind ?? '—';
}
