import type { Permission } from '@/lib/core/auth/permissions';
import type { NavItem } from './dashboard-shell';

/** Every dashboard section and the permission that shows it in the navigation. */
export const NAV: ReadonlyArray<NavItem & { permission: Permission }> = [
  { href: '/app/models', label: 'Models', icon: 'models', permission: 'models.read' },
  { href: '/app/datasets', label: 'Datasets', icon: 'models', permission: 'models.read' },
  { href: '/app/clients', label: 'Clients', icon: 'clients', permission: 'firm.read' },
  { href: '/app/snapshots', label: 'Snapshots', icon: 'clients', permission: 'clients.manage' },
  { href: '/app/team', label: 'Team', icon: 'team', permission: 'team.manage' },
  { href: '/app/billing', label: 'Billing', icon: 'billing', permission: 'billing.manage' },
  { href: '/app/settings', label: 'Settings', icon: 'settings', permission: 'firm.read' },
  { href: '/app/audit', label: 'Audit log', icon: 'audit', permission: 'audit.read' },
];
