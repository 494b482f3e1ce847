/** Sharing leases with an adviser or regulator, and notes on a lease: contracts for the forms and the API. */
import { z } from 'zod';
import { emailSchema } from './auth';
import { ROLES } from './roles';

export const MAX_SHARE_LEASES = 500;
export const MAX_NOTE_CHARS = 4000;

export const shareLeasesSchema = z.strictObject({
  leaseIds: z
    .array(z.uuid({ error: 'each lease id must be a UUID' }), { error: 'leaseIds must be a list of lease ids' })
    .min(1, { error: 'choose at least one lease to share' })
    .max(MAX_SHARE_LEASES, { error: `share at most ${MAX_SHARE_LEASES} leases at a time` }),
  email: emailSchema,
});
export type ShareLeases = z.infer<typeof shareLeasesSchema>;

/** The form in the bulk-actions bar: the e-mail only (the leases come from the selection). */
export const shareFormSchema = shareLeasesSchema.pick({ email: true });
export type ShareForm = z.infer<typeof shareFormSchema>;

export const shareResultSchema = z.object({
  shared: z.number().int().describe('How many leases are now shared with the grantee (already-shared ones included)'),
  grantee: z.object({ id: z.string(), name: z.string().nullable(), email: z.string() }),
});
export type ShareResult = z.infer<typeof shareResultSchema>;

export const leaseShareSchema = z.object({
  userId: z.string(),
  name: z.string().nullable(),
  email: z.string(),
  role: z.enum(ROLES),
  grantedAt: z.string(),
});
export type LeaseShare = z.infer<typeof leaseShareSchema>;
export const leaseShareListSchema = z.object({ items: z.array(leaseShareSchema) });

export const noteCreateSchema = z.strictObject({
  body: z
    .string({ error: 'body is required' })
    .trim()
    .min(1, { error: 'write something in the note' })
    .max(MAX_NOTE_CHARS, { error: `a note must be at most ${MAX_NOTE_CHARS} characters` }),
});
export type NoteCreate = z.infer<typeof noteCreateSchema>;

export const leaseNoteSchema = z.object({
  id: z.string(),
  leaseId: z.string(),
  body: z.string(),
  createdAt: z.string(),
  author: z.object({ id: z.string(), name: z.string().nullable(), role: z.enum(ROLES) }),
});
export type LeaseNote = z.infer<typeof leaseNoteSchema>;
export const leaseNoteListSchema = z.object({ items: z.array(leaseNoteSchema) });
