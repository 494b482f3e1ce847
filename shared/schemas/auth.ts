/** Sign-in, sign-up, reset and invitation forms: the same schemas on the client and the server. */
import { z } from 'zod';
import { ROLES } from './roles';

export const emailSchema = z
  .string({ error: 'email is required' })
  .trim()
  .min(1, { error: 'email is required' })
  .max(254, { error: 'email must be at most 254 characters' })
  .email({ error: 'email must be an address like name@example.org' });

export const passwordSchema = z
  .string({ error: 'password is required' })
  .min(10, { error: 'password must be at least 10 characters' })
  .max(200, { error: 'password must be at most 200 characters' });

export const signInSchema = z.object({
  email: emailSchema,
  password: z.string({ error: 'password is required' }).min(1, { error: 'password is required' }),
});
export type SignInInput = z.infer<typeof signInSchema>;

export const signUpSchema = z.strictObject({
  name: z.string({ error: 'name is required' }).trim().min(1, { error: 'name is required' }).max(120, { error: 'name must be at most 120 characters' }),
  email: emailSchema,
  password: passwordSchema,
  organisationName: z.string().trim().max(160, { error: 'organisationName must be at most 160 characters' }).optional(),
  /** The region picked at sign-up (GET /regions), or none. */
  regionId: z.uuid({ error: 'regionId must be a region id (UUID) from the list, or left out for none' }).nullable().optional(),
});
export type SignUpInput = z.infer<typeof signUpSchema>;

export const passwordResetRequestSchema = z.strictObject({ email: emailSchema });
export const passwordResetConfirmSchema = z.strictObject({
  token: z.string({ error: 'token is required' }).min(20, { error: 'token is not valid: use the link from the e-mail' }),
  password: passwordSchema,
});

export const invitationCreateSchema = z.strictObject({
  email: emailSchema,
  role: z.enum(ROLES, { error: `role must be one of ${ROLES.join(', ')}` }),
  jurisdictionId: z.uuid({ error: 'jurisdictionId must be a jurisdiction id (UUID)' }).optional(),
});
export const invitationAcceptSchema = z.strictObject({
  name: z.string({ error: 'name is required' }).trim().min(1, { error: 'name is required' }).max(120),
  password: passwordSchema,
});

export const meSchema = z.object({
  id: z.string(),
  email: z.string(),
  name: z.string().nullable(),
  role: z.enum(ROLES),
  organisationId: z.string().nullable(),
  jurisdictionId: z.string().nullable(),
});
export type Me = z.infer<typeof meSchema>;
