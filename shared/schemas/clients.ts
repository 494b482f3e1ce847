/** Advisers and their clients: invitations, accepting with a choice of leases, ending the link. */
import { z } from 'zod';
import { emailSchema } from './auth';
import { MAX_SHARE_LEASES } from './sharing';

export const MAX_INVITATION_MESSAGE_CHARS = 1000;

/** Body of POST /clients/invitations (an adviser invites a grower). */
export const clientInviteSchema = z.strictObject({
  email: emailSchema,
  message: z
    .string()
    .trim()
    .max(MAX_INVITATION_MESSAGE_CHARS, { error: `message must be at most ${MAX_INVITATION_MESSAGE_CHARS} characters` })
    .optional()
    .describe('A short note shown to the grower with the invitation'),
});
export type ClientInvite = z.infer<typeof clientInviteSchema>;

const leaseIdsField = z
  .array(z.uuid({ error: 'each lease id must be a UUID' }), { error: 'leaseIds must be a list of lease ids' })
  .max(MAX_SHARE_LEASES, { error: `share at most ${MAX_SHARE_LEASES} leases at a time` });

/** Body of POST /advisers/:id/accept: the leases to share now (may be empty, and changed later). */
export const acceptInvitationSchema = z.strictObject({ leaseIds: leaseIdsField });
export type AcceptInvitation = z.infer<typeof acceptInvitationSchema>;

/** Body of PUT /advisers/:id/leases: exactly the leases this adviser should see (others stop being shared). */
export const adviserLeasesSchema = z.strictObject({ leaseIds: leaseIdsField });
export type AdviserLeases = z.infer<typeof adviserLeasesSchema>;

export const INVITATION_STATUSES = ['pending', 'accepted', 'declined', 'ended'] as const;

const person = z.object({ id: z.string().nullable(), name: z.string().nullable(), email: z.string() });

export const sharedLeaseSchema = z.object({
  id: z.string(),
  leaseId: z.string().describe('The lease code'),
  species: z.string().nullable(),
  status: z.string(),
  worstRating: z.enum(['low', 'moderate', 'high', 'severe']).nullable(),
});
export type SharedLease = z.infer<typeof sharedLeaseSchema>;

/** One line of the adviser's Clients screen. */
export const clientSchema = z.object({
  invitationId: z.string(),
  status: z.enum(INVITATION_STATUSES),
  grower: person,
  invitedAt: z.string(),
  respondedAt: z.string().nullable(),
  leases: z.array(sharedLeaseSchema),
});
export type Client = z.infer<typeof clientSchema>;
export const clientListSchema = z.object({ items: z.array(clientSchema) });

/** One line of the grower's Advisers screen. */
export const adviserLinkSchema = z.object({
  invitationId: z.string(),
  status: z.enum(INVITATION_STATUSES),
  adviser: person,
  message: z.string().nullable(),
  invitedAt: z.string(),
  respondedAt: z.string().nullable(),
  leaseIds: z.array(z.string()).describe('Ids of your leases shared with this adviser'),
});
export type AdviserLink = z.infer<typeof adviserLinkSchema>;
export const adviserLinkListSchema = z.object({ items: z.array(adviserLinkSchema) });
