export type RoleName = 'owner' | 'author' | 'checker';

export const ROLE_LABELS: Record<RoleName, string> = { owner: 'Owner', author: 'Author', checker: 'Checker' };

export const ROLE_DESCRIPTIONS: Record<RoleName, string> = {
  owner: 'Runs the account: seats and billing, team, firm settings. Takes no seat.',
  author: 'Builds models, saves versions, publishes checked versions to clients. Takes a seat.',
  checker: 'Reviews versions and signs them off; reads the audit log. Takes a seat.',
};
