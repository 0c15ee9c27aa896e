import 'server-only';
import type { NextAuthOptions } from 'next-auth';
import type { Adapter, AdapterUser } from 'next-auth/adapters';
import CredentialsProvider from 'next-auth/providers/credentials';
import EmailProvider from 'next-auth/providers/email';
import { z } from 'zod';
import { env } from '@/lib/server/env';
import { getDb } from '@/db/knex';
import { bumpSessionVersion, getActiveMember, getUserCredentials, markEmailVerified } from '@/db/users';
import { consumeVerificationToken, insertVerificationToken } from '@/db/sign-in';
import { burnPasswordCheck, verifyPassword } from '@/lib/server/auth/password';
import { assertSignInAllowed, noteSignInFailure, noteSignInSuccess } from '@/lib/server/auth/rate-limit';
import { linkMail, sendMail } from '@/lib/server/mail/send';
import { AppError } from '@/lib/server/http/errors';
import { clientAddressOfHeaders } from '@/lib/server/http/client-address';
import { recordAudit } from '@/db/audit';
import { safeNext } from '@/lib/core/auth/next-path';

const credentialsSchema = z.object({ email: z.email().max(254), password: z.string().min(1).max(200) });

async function adapterUser(email: string): Promise<AdapterUser | null> {
  const u = await getUserCredentials(email);
  return u ? { id: u.id, email: u.email, name: u.name, emailVerified: null } : null;
}

/**
 * The few adapter methods next-auth's e-mail provider calls. Users are never created through a link:
 * sign-up and invitations create them. Sessions stay JWT (an adapter would otherwise switch them to the database).
 */
const adapter: Adapter = {
  async createUser() {
    throw new Error('Accounts are created by sign-up or invitation, not by a sign-in link.');
  },
  async getUser(id) {
    const row = await getDb()('users').select('id', 'email', 'name').where({ id }).first();
    return row ? { id: row.id, email: row.email, name: row.name, emailVerified: null } : null;
  },
  getUserByEmail: (email) => adapterUser(email),
  async getUserByAccount() {
    return null;
  },
  async updateUser(user) {
    // next-auth calls this with `{ id, emailVerified }` once a sign-in link was followed: that proves the address.
    if (user.emailVerified) await markEmailVerified(user.id);
    const row = await getDb()('users').select('id', 'email', 'name').where({ id: user.id }).first();
    return { id: row.id, email: row.email, name: row.name, emailVerified: new Date() };
  },
  async linkAccount() {
    return undefined;
  },
  async createVerificationToken(token) {
    await insertVerificationToken(token.identifier, token.token, token.expires.toISOString());
    return token;
  },
  async useVerificationToken({ identifier, token }) {
    const row = await consumeVerificationToken(identifier, token);
    return row ? { identifier: row.identifier, token, expires: new Date(row.expiresAt) } : null;
  },
};

export function authOptions(): NextAuthOptions {
  const e = env();
  return {
    secret: e.authSecret,
    // Secure cookies whenever the app is served over https (always in production; see lib/server/env.ts).
    useSecureCookies: new URL(e.APP_URL).protocol === 'https:',
    adapter,
    session: { strategy: 'jwt', maxAge: e.SESSION_MAX_AGE_SECONDS, updateAge: 15 * 60 },
    jwt: { maxAge: e.SESSION_MAX_AGE_SECONDS },
    pages: { signIn: '/sign-in', verifyRequest: '/sign-in/check-email', error: '/sign-in' },
    providers: [
      CredentialsProvider({
        id: 'credentials',
        name: 'E-mail and password',
        credentials: { email: { label: 'E-mail', type: 'email' }, password: { label: 'Password', type: 'password' } },
        async authorize(raw, req) {
          const parsed = credentialsSchema.safeParse(raw);
          if (!parsed.success) return null;
          const { email, password } = parsed.data;
          const address = clientAddressOfHeaders(req?.headers);
          try {
            await assertSignInAllowed(email, address);
          } catch (err) {
            // next-auth passes a thrown message to the client as `error`.
            if (err instanceof AppError) throw new Error(err.message);
            throw err;
          }
          const user = await getUserCredentials(email);
          const ok = user?.passwordHash ? await verifyPassword(password, user.passwordHash) : await burnPasswordCheck(password);
          if (!user || !ok) {
            await noteSignInFailure(email, address);
            return null;
          }
          const member = await getActiveMember(user.id);
          if (!member) {
            await noteSignInFailure(email, address);
            return null;
          }
          await noteSignInSuccess(email);
          // The password was right; but until the owner of the address has followed an e-mailed link, it is not enough.
          if (!user.emailVerifiedAt) {
            throw new Error('Confirm your e-mail address first: open the link in the message we sent when the account was created, or ask for a sign-in link below (it confirms the address too).');
          }
          return { id: user.id, email: user.email, name: user.name };
        },
      }),
      EmailProvider({
        from: e.MAIL_FROM,
        maxAge: 15 * 60,
        server: { host: e.SMTP_HOST, port: e.SMTP_PORT },
        async sendVerificationRequest({ identifier, url }) {
          const user = await getUserCredentials(identifier);
          // Unknown or removed addresses get no mail, and the page says the same either way.
          if (!user || !(await getActiveMember(user.id))) return;
          await sendMail(
            linkMail(identifier, 'Your Stochos sign-in link', [`Hello ${user.name},`, 'Use the button below to sign in to Stochos. The link works once and expires in 15 minutes.', 'If you did not ask for it, ignore this message.'], {
              label: 'Sign in to Stochos',
              url,
            }),
          );
        },
      }),
    ],
    callbacks: {
      // Every callback URL (sign-in links, sign-out) is parsed against our own origin; anything else lands on the dashboard.
      redirect: ({ url, baseUrl }) => new URL(safeNext(url, baseUrl), baseUrl).toString(),
      async signIn({ user, email }) {
        if (email?.verificationRequest) return true;
        const u = user.email ? await getUserCredentials(user.email) : null;
        return Boolean(u && (await getActiveMember(u.id)));
      },
      async jwt({ token, user }) {
        if (user) {
          const u = await getUserCredentials(user.email!);
          token.sub = u!.id;
          token.sv = u!.sessionVersion;
        }
        return token;
      },
      async session({ session, token }) {
        return { ...session, userId: token.sub, sv: token.sv };
      },
    },
    events: {
      async signIn({ user }) {
        const m = await getActiveMember(user.id);
        if (m) await recordAudit({ firmId: m.firmId, actorUserId: m.userId, action: 'user.signed_in' });
      },
      async signOut({ token }) {
        // Signing out ends every session of this user, not just this cookie.
        if (token?.sub) await bumpSessionVersion(token.sub);
      },
    },
  };
}
