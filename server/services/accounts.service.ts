/**
 * Sign-up, password reset, invitations and role changes. No req/res here: routes call these.
 */
import { and, eq, gt, isNull } from 'drizzle-orm';
import type { Role } from '#shared/schemas/roles';
import type { Database } from '../db/client';
import { invitations, jurisdictions, organisations, passwordResetTokens, users } from '../db/schema';
import { ConflictError, NotFoundError, ValidationError } from '../lib/errors';
import type { Mailer } from '../mail/mailer';
import { forgetUser } from '../auth/current-user';
import { hashPassword, hashToken, newToken } from '../auth/passwords';
import { recordAudit } from './audit.service';

const RESET_MINUTES = 30;
const INVITATION_DAYS = 7;

export function createAccountsService(deps: { db: Database; mailer: Mailer; appUrl: string }) {
  const { db, mailer, appUrl } = deps;

  async function signUp(input: { name: string; email: string; password: string; organisationName?: string; regionId?: string | null }) {
    const email = input.email.toLowerCase();
    const passwordHash = await hashPassword(input.password);
    return db.transaction(async (tx) => {
      const [existing] = await tx.select({ id: users.id }).from(users).where(eq(users.email, email)).limit(1);
      if (existing) {
        throw new ConflictError('An account with this e-mail already exists. Sign in, or reset your password if you forgot it.');
      }
      if (input.regionId) {
        const [region] = await tx.select({ id: jurisdictions.id }).from(jurisdictions).where(eq(jurisdictions.id, input.regionId)).limit(1);
        if (!region) throw new ValidationError('regionId: no region has this id. Pick one from the list, or none.');
      }
      let organisationId: string | null = null;
      if (input.organisationName) {
        const [org] = await tx
          .insert(organisations)
          .values({ name: input.organisationName, kind: 'farm' })
          .onConflictDoNothing()
          .returning({ id: organisations.id });
        if (!org) throw new ConflictError('An organisation with this name already exists. Choose another name or leave it empty.');
        organisationId = org.id;
      }
      const [user] = await tx
        .insert(users)
        .values({ name: input.name, email, passwordHash, role: 'grower', organisationId, jurisdictionId: input.regionId ?? null })
        .returning({ id: users.id, email: users.email, role: users.role });
      await recordAudit(tx, { actorId: user.id, action: 'user.sign-up', subjectType: 'user', subjectId: user.id, after: { email, role: 'grower', regionId: input.regionId ?? null } });
      return user;
    });
  }

  /** Always answers the same way whether or not the address has an account. */
  async function requestPasswordReset(emailRaw: string) {
    const email = emailRaw.toLowerCase();
    const [user] = await db.select().from(users).where(eq(users.email, email)).limit(1);
    if (!user || user.disabled) return;
    const { token, tokenHash } = newToken();
    await db.insert(passwordResetTokens).values({ tokenHash, userId: user.id, expiresAt: new Date(Date.now() + RESET_MINUTES * 60_000) });
    await mailer.send({
      to: email,
      subject: 'Reset your Brackline password',
      text: `Someone asked to reset the password of your Brackline account.\n\nChoose a new password within ${RESET_MINUTES} minutes:\n${appUrl}/reset-password?token=${token}\n\nIf it was not you, ignore this message; your password stays as it is.`,
    });
  }

  async function confirmPasswordReset(token: string, password: string) {
    const tokenHash = hashToken(token);
    const passwordHash = await hashPassword(password);
    const userId = await db.transaction(async (tx) => {
      const [row] = await tx
        .select()
        .from(passwordResetTokens)
        .where(and(eq(passwordResetTokens.tokenHash, tokenHash), isNull(passwordResetTokens.usedAt), gt(passwordResetTokens.expiresAt, new Date())))
        .limit(1);
      if (!row) throw new ValidationError('This reset link is not valid or has expired. Ask for a new one from the sign-in page.');
      await tx.update(passwordResetTokens).set({ usedAt: new Date() }).where(eq(passwordResetTokens.tokenHash, tokenHash));
      const [user] = await tx.select({ sv: users.sessionVersion }).from(users).where(eq(users.id, row.userId));
      // A new password ends every existing session.
      await tx.update(users).set({ passwordHash, sessionVersion: user.sv + 1 }).where(eq(users.id, row.userId));
      await recordAudit(tx, { actorId: row.userId, action: 'user.password-reset', subjectType: 'user', subjectId: row.userId });
      return row.userId;
    });
    // After the commit, so no request can re-read the old row in between.
    forgetUser(userId);
  }

  async function invite(actorId: string, input: { email: string; role: Role; jurisdictionId?: string }) {
    const email = input.email.toLowerCase();
    if ((input.role === 'regulator') && !input.jurisdictionId) {
      throw new ValidationError('jurisdictionId: a regulator must belong to a jurisdiction; choose one.');
    }
    const { token, tokenHash } = newToken();
    const id = await db.transaction(async (tx) => {
      const [existing] = await tx.select({ id: users.id }).from(users).where(eq(users.email, email)).limit(1);
      if (existing) throw new ConflictError('This e-mail already has an account. Change its role on the Users page instead.');
      const [inv] = await tx
        .insert(invitations)
        .values({
          tokenHash,
          email,
          role: input.role,
          jurisdictionId: input.jurisdictionId ?? null,
          invitedBy: actorId,
          expiresAt: new Date(Date.now() + INVITATION_DAYS * 86_400_000),
        })
        .returning({ id: invitations.id });
      await recordAudit(tx, { actorId, action: 'invitation.create', subjectType: 'invitation', subjectId: inv.id, after: { email, role: input.role } });
      return inv.id;
    });
    await mailer.send({
      to: email,
      subject: `You are invited to Brackline as ${input.role === 'adviser' ? 'an adviser' : `a ${input.role}`}`,
      text: `You have been invited to join Brackline as ${input.role}.\n\nAccept within ${INVITATION_DAYS} days and choose your password:\n${appUrl}/invitation?token=${token}\n`,
    });
    return { id };
  }

  async function findInvitation(token: string) {
    const [inv] = await db
      .select()
      .from(invitations)
      .where(and(eq(invitations.tokenHash, hashToken(token)), isNull(invitations.acceptedAt), gt(invitations.expiresAt, new Date())))
      .limit(1);
    if (!inv) throw new NotFoundError('This invitation is not valid, was already used, or has expired. Ask the administrator for a new one.');
    return inv;
  }

  async function acceptInvitation(token: string, input: { name: string; password: string }) {
    const inv = await findInvitation(token);
    const passwordHash = await hashPassword(input.password);
    return db.transaction(async (tx) => {
      const [existing] = await tx.select({ id: users.id }).from(users).where(eq(users.email, inv.email)).limit(1);
      if (existing) throw new ConflictError('This e-mail already has an account. Sign in instead.');
      const [user] = await tx
        .insert(users)
        .values({ name: input.name, email: inv.email, passwordHash, role: inv.role, jurisdictionId: inv.jurisdictionId, emailVerified: new Date() })
        .returning({ id: users.id, email: users.email, role: users.role });
      await tx.update(invitations).set({ acceptedAt: new Date() }).where(eq(invitations.id, inv.id));
      await recordAudit(tx, { actorId: user.id, action: 'invitation.accept', subjectType: 'user', subjectId: user.id, after: { role: inv.role } });
      return user;
    });
  }

  async function changeRole(actorId: string, userId: string, role: Role, jurisdictionId?: string | null) {
    await db.transaction(async (tx) => {
      const [before] = await tx.select().from(users).where(eq(users.id, userId)).limit(1);
      if (!before) throw new NotFoundError('No user with this id. Reload the Users page.');
      if (role === 'regulator' && !(jurisdictionId ?? before.jurisdictionId)) {
        throw new ValidationError('jurisdictionId: a regulator must belong to a jurisdiction; choose one.');
      }
      // A role change ends the user's sessions so the new rights apply at once.
      await tx
        .update(users)
        .set({ role, jurisdictionId: jurisdictionId === undefined ? before.jurisdictionId : jurisdictionId, sessionVersion: before.sessionVersion + 1 })
        .where(eq(users.id, userId));
      await recordAudit(tx, {
        actorId,
        action: 'user.role-change',
        subjectType: 'user',
        subjectId: userId,
        before: { role: before.role, jurisdictionId: before.jurisdictionId },
        after: { role, jurisdictionId: jurisdictionId ?? before.jurisdictionId },
      });
    });
    forgetUser(userId);
  }

  async function signOutEverywhere(userId: string) {
    const [row] = await db.select({ sv: users.sessionVersion }).from(users).where(eq(users.id, userId));
    await db.update(users).set({ sessionVersion: row.sv + 1 }).where(eq(users.id, userId));
    forgetUser(userId);
  }

  return { signUp, requestPasswordReset, confirmPasswordReset, invite, findInvitation, acceptInvitation, changeRole, signOutEverywhere };
}

export type AccountsService = ReturnType<typeof createAccountsService>;
