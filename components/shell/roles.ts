import type { Role } from '@/lib/core/api-types';

export const ROLE_LABELS: Record<Role, string> = { owner: 'Owner', author: 'Author', checker: 'Checker' };

export const ROLE_DESCRIPTIONS: Record<Role, string> = {
  owner: 'Runs the account: seats and billing, team, firm settings. Takes no seat.',
  author: 'Builds models, saves versions, publishes checked versions to clients. Takes a seat.',
  checker: 'Reviews versions and signs them off; reads the audit log. Takes a seat.',
};
