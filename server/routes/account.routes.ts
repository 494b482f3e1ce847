import { z } from 'zod';
import {
  invitationAcceptSchema,
  meSchema,
  passwordResetConfirmSchema,
  passwordResetRequestSchema,
  signUpSchema,
} from '#shared/schemas/auth';
import { ROLES } from '#shared/schemas/roles';
import { defineRoute, type RouteContext } from '../http/route';
import type { AccountsService } from '../services/accounts.service';

const tokenParams = z.object({ token: z.string().min(20, { error: 'token is not valid: use the link from the e-mail' }) });

export function registerAccountRoutes(ctx: RouteContext, accounts: AccountsService): void {
  defineRoute(ctx, {
    method: 'post',
    path: '/account/sign-up',
    operationId: 'signUp',
    summary: 'Create a grower account',
    tags: ['account'],
    access: { public: true },
    body: signUpSchema,
    response: z.object({ id: z.string(), email: z.string(), role: z.enum(ROLES) }),
    successStatus: 201,
    errors: [409, 429],
    handler: ({ body }) => accounts.signUp(body),
  });

  defineRoute(ctx, {
    method: 'post',
    path: '/account/password-reset',
    operationId: 'requestPasswordReset',
    summary: 'E-mail a password reset link (same answer whether or not the account exists)',
    tags: ['account'],
    access: { public: true },
    body: passwordResetRequestSchema,
    response: z.object({ message: z.string() }),
    successStatus: 202,
    errors: [429],
    handler: async ({ body }) => {
      await accounts.requestPasswordReset(body.email);
      return { message: 'If an account uses this e-mail, a reset link is on its way. It works for 30 minutes.' };
    },
  });

  defineRoute(ctx, {
    method: 'post',
    path: '/account/password-reset/confirm',
    operationId: 'confirmPasswordReset',
    summary: 'Set a new password with the e-mailed token; ends all existing sessions',
    tags: ['account'],
    access: { public: true },
    body: passwordResetConfirmSchema,
    response: z.object({ message: z.string() }),
    handler: async ({ body }) => {
      await accounts.confirmPasswordReset(body.token, body.password);
      return { message: 'Your password is changed. Sign in with the new one.' };
    },
  });

  defineRoute(ctx, {
    method: 'get',
    path: '/account/me',
    operationId: 'getMe',
    summary: 'The signed-in user',
    tags: ['account'],
    access: { roles: 'any' },
    response: meSchema,
    handler: ({ user }) => user,
  });

  defineRoute(ctx, {
    method: 'post',
    path: '/account/sign-out-everywhere',
    operationId: 'signOutEverywhere',
    summary: 'End every session of the signed-in user, on every device',
    tags: ['account'],
    access: { roles: 'any' },
    response: z.object({ message: z.string() }),
    handler: async ({ user }) => {
      await accounts.signOutEverywhere(user!.id);
      return { message: 'Signed out on every device.' };
    },
  });

  defineRoute(ctx, {
    method: 'get',
    path: '/invitations/:token',
    summary: 'Read an invitation before accepting it',
    tags: ['account'],
    access: { public: true },
    params: tokenParams,
    response: z.object({ email: z.string(), role: z.enum(ROLES), expiresAt: z.string() }),
    errors: [404],
    handler: async ({ params }) => {
      const inv = await accounts.findInvitation(params.token);
      return { email: inv.email, role: inv.role, expiresAt: inv.expiresAt.toISOString() };
    },
  });

  defineRoute(ctx, {
    method: 'post',
    path: '/invitations/:token/accept',
    summary: 'Accept an invitation: creates the account with the invited role',
    tags: ['account'],
    access: { public: true },
    params: tokenParams,
    body: invitationAcceptSchema,
    response: z.object({ id: z.string(), email: z.string(), role: z.enum(ROLES) }),
    successStatus: 201,
    errors: [404, 409],
    handler: ({ params, body }) => accounts.acceptInvitation(params.token, body),
  });
}
