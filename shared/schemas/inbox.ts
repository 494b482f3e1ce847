/** The in-app inbox: closure notices, alerts, invitations and notes, newest first. */
import { z } from 'zod';

export const INBOX_KINDS = ['notice', 'alert', 'invitation', 'note'] as const;

export const inboxMessageSchema = z.object({
  id: z.string(),
  kind: z.enum(INBOX_KINDS),
  title: z.string(),
  body: z.string(),
  link: z.string().nullable().describe('An in-app path to open, or null'),
  createdAt: z.string(),
  readAt: z.string().nullable(),
});
export type InboxMessage = z.infer<typeof inboxMessageSchema>;

export const inboxListSchema = z.object({
  items: z.array(inboxMessageSchema),
  unread: z.number().int().describe('Unread messages in the whole inbox, not only this page'),
});
export type InboxList = z.infer<typeof inboxListSchema>;

export const inboxQuerySchema = z.strictObject({
  limit: z.coerce
    .number({ error: 'limit must be a number' })
    .int({ error: 'limit must be a whole number' })
    .min(1, { error: 'limit must be at least 1' })
    .max(200, { error: 'limit must be at most 200' })
    .default(50),
});
