/**
 * The database schema (Drizzle). Auth.js tables follow the adapter's documented
 * PostgreSQL layout; the user row carries Brackline's own role and session version.
 */
import {
  boolean,
  index,
  integer,
  jsonb,
  pgEnum,
  pgTable,
  primaryKey,
  text,
  timestamp,
  uuid,
} from 'drizzle-orm/pg-core';
import { ROLES } from '../../shared/schemas/roles';

export const roleEnum = pgEnum('role', ROLES);

export const jurisdictions = pgTable('jurisdictions', {
  id: uuid('id').primaryKey().defaultRandom(),
  /** URL-safe short name, used by the public status page (/status/:slug). */
  slug: text('slug').notNull().unique(),
  name: text('name').notNull(),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
});

export const organisations = pgTable('organisations', {
  id: uuid('id').primaryKey().defaultRandom(),
  name: text('name').notNull().unique(),
  kind: text('kind').notNull().default('farm'),
  jurisdictionId: uuid('jurisdiction_id').references(() => jurisdictions.id),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
});

export const users = pgTable(
  'users',
  {
    id: text('id')
      .primaryKey()
      .$defaultFn(() => crypto.randomUUID()),
    name: text('name'),
    email: text('email').notNull().unique(),
    emailVerified: timestamp('email_verified', { mode: 'date', withTimezone: true }),
    image: text('image'),
    role: roleEnum('role').notNull().default('grower'),
    passwordHash: text('password_hash'),
    organisationId: uuid('organisation_id').references(() => organisations.id),
    jurisdictionId: uuid('jurisdiction_id').references(() => jurisdictions.id),
    /** Bumped by sign-out-everywhere, password reset and role change: older sessions stop working. */
    sessionVersion: integer('session_version').notNull().default(1),
    disabled: boolean('disabled').notNull().default(false),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('users_role_idx').on(t.role)],
);

export const accounts = pgTable(
  'accounts',
  {
    userId: text('user_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    type: text('type').notNull(),
    provider: text('provider').notNull(),
    providerAccountId: text('provider_account_id').notNull(),
    refresh_token: text('refresh_token'),
    access_token: text('access_token'),
    expires_at: integer('expires_at'),
    token_type: text('token_type'),
    scope: text('scope'),
    id_token: text('id_token'),
    session_state: text('session_state'),
  },
  (t) => [primaryKey({ columns: [t.provider, t.providerAccountId] })],
);

export const sessions = pgTable('sessions', {
  sessionToken: text('session_token').primaryKey(),
  userId: text('user_id')
    .notNull()
    .references(() => users.id, { onDelete: 'cascade' }),
  expires: timestamp('expires', { mode: 'date', withTimezone: true }).notNull(),
});

export const verificationTokens = pgTable(
  'verification_tokens',
  {
    identifier: text('identifier').notNull(),
    token: text('token').notNull(),
    expires: timestamp('expires', { mode: 'date', withTimezone: true }).notNull(),
  },
  (t) => [primaryKey({ columns: [t.identifier, t.token] })],
);

/** One-use password reset tokens; only the SHA-256 of the token is stored. */
export const passwordResetTokens = pgTable('password_reset_tokens', {
  tokenHash: text('token_hash').primaryKey(),
  userId: text('user_id')
    .notNull()
    .references(() => users.id, { onDelete: 'cascade' }),
  expiresAt: timestamp('expires_at', { withTimezone: true }).notNull(),
  usedAt: timestamp('used_at', { withTimezone: true }),
});

/** Admin invitations for advisers and regulators (and growers); only the token hash is stored. */
export const invitations = pgTable('invitations', {
  id: uuid('id').primaryKey().defaultRandom(),
  tokenHash: text('token_hash').notNull().unique(),
  email: text('email').notNull(),
  role: roleEnum('role').notNull(),
  jurisdictionId: uuid('jurisdiction_id').references(() => jurisdictions.id),
  organisationId: uuid('organisation_id').references(() => organisations.id),
  invitedBy: text('invited_by').references(() => users.id),
  expiresAt: timestamp('expires_at', { withTimezone: true }).notNull(),
  acceptedAt: timestamp('accepted_at', { withTimezone: true }),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
});

/** Failed sign-ins per e-mail address (existing or not), for throttling. */
export const signInFailures = pgTable(
  'sign_in_failures',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    email: text('email').notNull(),
    at: timestamp('at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('sign_in_failures_email_at_idx').on(t.email, t.at)],
);

/** Messages received by the local SMTP fake (development and tests only). */
export const outboxMessages = pgTable(
  'outbox_messages',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    receivedAt: timestamp('received_at', { withTimezone: true }).notNull().defaultNow(),
    envelopeFrom: text('envelope_from'),
    envelopeTo: jsonb('envelope_to').$type<string[]>().notNull(),
    subject: text('subject'),
    textBody: text('text_body'),
    htmlBody: text('html_body'),
    raw: text('raw').notNull(),
  },
  (t) => [index('outbox_received_idx').on(t.receivedAt)],
);

/** Who did what, when; append-only (a database trigger refuses UPDATE and DELETE). */
export const auditEntries = pgTable(
  'audit_entries',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    at: timestamp('at', { withTimezone: true }).notNull().defaultNow(),
    actorId: text('actor_id'),
    action: text('action').notNull(),
    subjectType: text('subject_type').notNull(),
    subjectId: text('subject_id'),
    jurisdictionId: uuid('jurisdiction_id'),
    before: jsonb('before'),
    after: jsonb('after'),
  },
  (t) => [index('audit_subject_idx').on(t.subjectType, t.subjectId)],
);
