import bcrypt from 'bcryptjs';
import type { MatrixRow } from './types';
import { insertPasswordReset, insertPendingSignUp } from '../../../support/db-direct';

// Sign-up confirmation, password reset and change (issue 13). The public ones: the e-mailed token is the credential.
const PASSWORD = 'correct horse battery';
const everyone = (status: number) => ({ anonymous: status, owner: status, author: status, checker: status, outsider: status });
let hash: string | null = null;

export const rows: MatrixRow[] = [
  {
    method: 'POST',
    route: '/api/sign-up',
    prepare: (_c, p) => ({ path: '/api/sign-up', body: { firmName: 'Matrix firm', name: 'M', email: `matrix-signup-${p}-${Date.now()}@test-firm.example`, password: PASSWORD } }),
    expect: everyone(202),
    note: 'public: sends a confirmation link, creates nothing yet',
  },
  {
    method: 'POST',
    route: '/api/sign-up/confirm',
    prepare: async (c) => {
      hash ??= await bcrypt.hash(PASSWORD, 4);
      return { path: '/api/sign-up/confirm', body: { token: insertPendingSignUp(c.db, hash).token, password: PASSWORD } };
    },
    expect: everyone(201),
    note: 'public: the e-mailed token and the chosen password',
  },
  {
    method: 'POST',
    route: '/api/password-reset',
    prepare: (_c, p) => ({ path: '/api/password-reset', body: { email: `matrix-reset-${p}-${Date.now()}@test-firm.example` } }),
    expect: everyone(202),
    note: 'public: the same answer whether or not the address has an account',
  },
  {
    method: 'POST',
    route: '/api/password-reset/confirm',
    prepare: (c) => ({ path: '/api/password-reset/confirm', body: { token: insertPasswordReset(c.db).token, password: 'a new matrix passphrase' } }),
    expect: everyone(200),
    note: 'public: the e-mailed token is the credential',
  },
  {
    method: 'POST',
    route: '/api/me/password',
    prepare: () => ({ path: '/api/me/password', body: { currentPassword: 'not the current one', newPassword: 'a new matrix passphrase' } }),
    expect: { anonymous: 401, owner: 422, author: 422, checker: 422, outsider: 422 },
    note: 'every member, for their own account only; a wrong current password changes nothing',
  },
];
