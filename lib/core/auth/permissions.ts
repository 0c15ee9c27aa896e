import type { Role } from '@/lib/core/api-types';

// Who may do what inside a firm. The owner runs the account; seats (authors, checkers) do the engineering.
export const PERMISSIONS = {
  'firm.read': ['owner', 'author', 'checker'],
  'team.manage': ['owner'],
  'settings.manage': ['owner'],
  'billing.manage': ['owner'],
  'audit.read': ['owner', 'checker'],
  'apikeys.manage': ['owner'],
  'models.read': ['owner', 'author', 'checker'],
  'models.edit': ['author'],
  'models.run': ['owner', 'author', 'checker'],
  'versions.check': ['checker'],
  'widgets.publish': ['author', 'owner'],
  'clients.manage': ['owner', 'author'],
} as const satisfies Record<string, readonly Role[]>;

export type Permission = keyof typeof PERMISSIONS;

export function can(role: Role, permission: Permission): boolean {
  return (PERMISSIONS[permission] as readonly Role[]).includes(role);
}

export const PERMISSION_LABELS: Record<Permission, string> = {
  'firm.read': 'members of this firm',
  'team.manage': 'the account owner',
  'settings.manage': 'the account owner',
  'billing.manage': 'the account owner',
  'audit.read': 'the account owner and checkers',
  'apikeys.manage': 'the account owner',
  'models.read': 'members of this firm',
  'models.edit': 'authors',
  'models.run': 'members of this firm',
  'versions.check': 'checkers',
  'widgets.publish': 'authors and the account owner',
  'clients.manage': 'authors and the account owner',
};
