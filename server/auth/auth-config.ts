/**
 * Auth.js configuration: e-mail + password (Credentials) and sign-in links by e-mail
 * (Nodemailer provider), with the Drizzle adapter storing users and verification tokens.
 * Credentials sign-in needs JWT sessions; they stay revocable through users.session_version,
 * which the request guard compares on every call (see current-user.ts).
 */
import { DrizzleAdapter } from '@auth/drizzle-adapter';
import type { ExpressAuthConfig } from '@auth/express';
import { CredentialsSignin } from '@auth/express';
import Credentials from '@auth/express/providers/credentials';
import Nodemailer from '@auth/express/providers/nodemailer';
import { and, eq, gte, sql } from 'drizzle-orm';
import { signInSchema } from '#shared/schemas/auth';
import type { Database } from '../db/client';
import { accounts, sessions, signInFailures, users, verificationTokens } from '../db/schema';
import { logger } from '../lib/logger';
import type { Mailer } from '../mail/mailer';
import { spendPasswordCheckTime, verifyPassword } from './passwords';

class TooManyAttempts extends CredentialsSignin {
  override code = 'too_many_attempts';
}

export interface AuthOptions {
  db: Database;
  mailer: Mailer;
  secret: string;
  appUrl: string;
  sessionMaxAgeSeconds: number;
  maxFailures: number;
  windowMinutes: number;
  mailFrom: string;
}

export function createAuthConfig(o: AuthOptions): ExpressAuthConfig {
  return {
    secret: o.secret,
    trustHost: true,
    basePath: '/auth',
    session: { strategy: 'jwt', maxAge: o.sessionMaxAgeSeconds },
    adapter: DrizzleAdapter(o.db, {
      usersTable: users as never,
      accountsTable: accounts as never,
      sessionsTable: sessions as never,
      verificationTokensTable: verificationTokens as never,
    }),
    pages: { signIn: '/sign-in', error: '/sign-in', verifyRequest: '/sign-in/check-email' },
    logger: {
      error(error) {
        // Wrong passwords are expected traffic, not server errors.
        if ((error as { type?: string }).type === 'CredentialsSignin') return;
        logger.error({ err: error }, 'auth error');
      },
      warn() {},
      debug() {},
    },
    providers: [
      Credentials({
        credentials: { email: { type: 'email' }, password: { type: 'password' } },
        async authorize(raw) {
          const parsed = signInSchema.safeParse(raw);
          if (!parsed.success) return null;
          const email = parsed.data.email.toLowerCase();
          const since = new Date(Date.now() - o.windowMinutes * 60_000);
          const [{ failures }] = await o.db
            .select({ failures: sql<number>`count(*)::int` })
            .from(signInFailures)
            .where(and(eq(signInFailures.email, email), gte(signInFailures.at, since)));
          if (failures >= o.maxFailures) throw new TooManyAttempts();
          const [user] = await o.db.select().from(users).where(eq(users.email, email)).limit(1);
          const ok = user?.passwordHash && !user.disabled ? await verifyPassword(parsed.data.password, user.passwordHash) : false;
          if (!user?.passwordHash) await spendPasswordCheckTime(parsed.data.password);
          if (!ok || !user) {
            await o.db.insert(signInFailures).values({ email });
            return null;
          }
          await o.db.delete(signInFailures).where(eq(signInFailures.email, email));
          return { id: user.id, email: user.email, name: user.name };
        },
      }),
      Nodemailer({
        server: { host: '127.0.0.1', port: 25 },
        from: o.mailFrom,
        maxAge: 15 * 60,
        async sendVerificationRequest({ identifier, url }) {
          // Only existing, enabled accounts get a link; the answer on screen is the same either way.
          const [user] = await o.db.select().from(users).where(eq(users.email, identifier.toLowerCase())).limit(1);
          if (!user || user.disabled) return;
          await o.mailer.send({
            to: identifier,
            subject: 'Your Brackline sign-in link',
            text: `Use this link within 15 minutes to sign in to Brackline:\n\n${url}\n\nIf you did not ask for it, ignore this message.`,
          });
        },
      }),
    ],
    callbacks: {
      async signIn({ user, account }) {
        // Sign-in links never create accounts: sign-up and invitations do.
        if (account?.provider === 'nodemailer') {
          const email = (user.email ?? '').toLowerCase();
          const [row] = await o.db.select({ id: users.id, disabled: users.disabled }).from(users).where(eq(users.email, email)).limit(1);
          return Boolean(row && !row.disabled);
        }
        return true;
      },
      async jwt({ token, user }) {
        if (user?.id) {
          const [row] = await o.db.select({ sv: users.sessionVersion }).from(users).where(eq(users.id, user.id)).limit(1);
          token.uid = user.id;
          token.sv = row?.sv ?? 0;
        }
        return token;
      },
      async session({ session, token }) {
        if (session.user && typeof token.uid === 'string') session.user.id = token.uid;
        return session;
      },
    },
  };
}
