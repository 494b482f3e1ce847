/**
 * The database schema (Drizzle). Auth.js tables follow the adapter's documented
 * PostgreSQL layout; the user row carries Brackline's own role and session version.
 */
import { sql } from 'drizzle-orm';
import {
  boolean,
  check,
  customType,
  doublePrecision,
  index,
  integer,
  jsonb,
  pgEnum,
  pgTable,
  primaryKey,
  text,
  timestamp,
  uniqueIndex,
  uuid,
} from 'drizzle-orm/pg-core';
import { ROLES } from '../../shared/schemas/roles';
import { geometryColumn } from './geometry-column';

const bytea = customType<{ data: Buffer; driverData: Buffer }>({ dataType: () => 'bytea' });

export const roleEnum = pgEnum('role', ROLES);

export const jurisdictions = pgTable('jurisdictions', {
  id: uuid('id').primaryKey().defaultRandom(),
  /** URL-safe short name, used by the public status page (/status/:slug). */
  slug: text('slug').notNull().unique(),
  name: text('name').notNull(),
  /** The region's area (issue #15): a lease saved inside it adds its holder to the jurisdiction. */
  area: geometryColumn('area', 'MultiPolygon'),
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

// ---------------------------------------------------------------------------------------------
// Uploads, leases, coasts and closure zones (issue "Lease and coast upload").

export const uploadKindEnum = pgEnum('upload_kind', ['lease', 'coast', 'zone']);
export const importStatusEnum = pgEnum('import_status', ['needs-crs', 'ready', 'confirmed']);
export const leaseStatusEnum = pgEnum('lease_status', ['held', 'candidate']);

/** One uploaded file, kept with its hash for provenance, staged until the user confirms it. */
export const imports = pgTable(
  'imports',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    kind: uploadKindEnum('kind').notNull(),
    ownerId: text('owner_id')
      .notNull()
      .references(() => users.id),
    jurisdictionId: uuid('jurisdiction_id').references(() => jurisdictions.id),
    fileName: text('file_name').notNull(),
    fileSha256: text('file_sha256').notNull(),
    fileBytes: bytea('file_bytes').notNull(),
    status: importStatusEnum('status').notNull(),
    crs: jsonb('crs').$type<{ found: boolean; epsg?: number; wkt?: string; name?: string }>().notNull(),
    summary: jsonb('summary')
      .$type<{ featureCount: number; geometryTypes: string[]; fields: string[]; warnings: string[]; format: string }>()
      .notNull(),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    confirmedAt: timestamp('confirmed_at', { withTimezone: true }),
  },
  (t) => [index('imports_owner_idx').on(t.ownerId)],
);

/** Features of an import after reprojection, checked and repaired by PostGIS. */
export const importFeatures = pgTable(
  'import_features',
  {
    importId: uuid('import_id')
      .notNull()
      .references(() => imports.id, { onDelete: 'cascade' }),
    featureIndex: integer('feature_index').notNull(),
    layer: text('layer').notNull(),
    properties: jsonb('properties').$type<Record<string, unknown>>().notNull(),
    geom: geometryColumn('geom', 'Geometry').notNull(),
    repaired: boolean('repaired').notNull().default(false),
    invalidReason: text('invalid_reason'),
    areaM2: doublePrecision('area_m2'),
    onLand: boolean('on_land').notNull().default(false),
  },
  (t) => [primaryKey({ columns: [t.importId, t.featureIndex] })],
);

export const leases = pgTable(
  'leases',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    /** The grower's or authority's own lease identifier. */
    leaseCode: text('lease_code').notNull(),
    holder: text('holder'),
    species: text('species'),
    status: leaseStatusEnum('status').notNull().default('held'),
    notes: text('notes'),
    ownerId: text('owner_id')
      .notNull()
      .references(() => users.id),
    organisationId: uuid('organisation_id').references(() => organisations.id),
    jurisdictionId: uuid('jurisdiction_id').references(() => jurisdictions.id),
    importId: uuid('import_id').references(() => imports.id),
    sourceProperties: jsonb('source_properties').$type<Record<string, unknown>>(),
    geom: geometryColumn('geom', 'MultiPolygon').notNull(),
    areaM2: doublePrecision('area_m2').notNull(),
    onLand: boolean('on_land').notNull().default(false),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    index('leases_geom_idx').using('gist', t.geom),
    index('leases_owner_idx').on(t.ownerId),
    index('leases_jurisdiction_status_idx').on(t.jurisdictionId, t.status),
    index('leases_code_idx').on(t.ownerId, t.leaseCode),
    // One per sort the leases table offers, so a long visible list (a regulator's) is read in order and stops at the page.
    index('leases_lease_code_idx').on(t.leaseCode),
    index('leases_holder_idx').on(t.holder),
    index('leases_species_idx').on(t.species),
    index('leases_area_idx').on(t.areaM2),
    index('leases_created_idx').on(t.createdAt),
    index('leases_status_idx').on(t.status),
    index('leases_import_idx').on(t.importId),
  ],
);

/** A lease shared by its holder with another user (an adviser or a regulator). */
export const leaseShares = pgTable(
  'lease_shares',
  {
    leaseId: uuid('lease_id')
      .notNull()
      .references(() => leases.id, { onDelete: 'cascade' }),
    granteeId: text('grantee_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    grantedAt: timestamp('granted_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [primaryKey({ columns: [t.leaseId, t.granteeId] }), index('lease_shares_grantee_idx').on(t.granteeId)],
);

/** A note on a lease by its holder or an adviser it is shared with; newest first on the lease page. */
export const leaseNotes = pgTable(
  'lease_notes',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    leaseId: uuid('lease_id')
      .notNull()
      .references(() => leases.id, { onDelete: 'cascade' }),
    authorId: text('author_id')
      .notNull()
      .references(() => users.id),
    body: text('body').notNull(),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('lease_notes_lease_idx').on(t.leaseId, t.createdAt), check('lease_notes_body_length', sql`char_length(${t.body}) BETWEEN 1 AND 4000`)],
);

export const coasts = pgTable(
  'coasts',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    name: text('name').notNull(),
    /** 'line': a shoreline; 'land': land polygons (the sea is outside them). */
    form: text('form', { enum: ['line', 'land'] }).notNull(),
    ownerId: text('owner_id').references(() => users.id),
    jurisdictionId: uuid('jurisdiction_id').references(() => jurisdictions.id),
    /** Regulators' coasts serve their whole jurisdiction; others' serve their owner. */
    shared: boolean('shared').notNull().default(false),
    importId: uuid('import_id').references(() => imports.id),
    geom: geometryColumn('geom', 'Geometry').notNull(),
    /** 'upload' (a user's file), 'traced' (drawn on the map) or 'builtin' (the open world coastline, clipped to `window`). */
    source: text('source', { enum: ['upload', 'traced', 'builtin'] }).notNull().default('upload'),
    /** Built-in coasts: the box the world coastline was clipped to, and the sea inside it (to tell land from sea). */
    window: geometryColumn('window', 'Geometry'),
    sea: geometryColumn('sea', 'Geometry'),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('coasts_geom_idx').using('gist', t.geom), index('coasts_window_idx').using('gist', t.window)],
);

export const closureZones = pgTable(
  'closure_zones',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    name: text('name').notNull(),
    jurisdictionId: uuid('jurisdiction_id')
      .notNull()
      .references(() => jurisdictions.id),
    importId: uuid('import_id').references(() => imports.id),
    sourceProperties: jsonb('source_properties').$type<Record<string, unknown>>(),
    geom: geometryColumn('geom', 'MultiPolygon').notNull(),
    areaM2: doublePrecision('area_m2').notNull(),
    /** The river whose flow closes the zone, and the gauge whose readings are checked against the trigger. */
    riverId: uuid('river_id').references(() => rivers.id, { onDelete: 'set null' }),
    gaugeId: uuid('gauge_id').references(() => gauges.id, { onDelete: 'set null' }),
    /** The management plan's trigger flow, m³/s: at or above it the zone closes. */
    triggerFlow: doublePrecision('trigger_flow'),
    /** Minimum days a closure lasts before a reopening may be considered. */
    minClosureDays: doublePrecision('min_closure_days'),
    /** The indicator standard for the zone, count per 100 mL (the band the trigger sweep measures). */
    indicatorStandard: doublePrecision('indicator_standard'),
    status: text('status', { enum: ['open', 'closed', 'reopening-pending'] }).notNull().default('open'),
    statusSince: timestamp('status_since', { withTimezone: true }).notNull().defaultNow(),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('closure_zones_geom_idx').using('gist', t.geom)],
);

// ---------------------------------------------------------------------------------------------
// Rivers, flow records, scenarios, footprints and screenings (issue "Plume bands and screening").

export const rivers = pgTable(
  'rivers',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    name: text('name').notNull(),
    jurisdictionId: uuid('jurisdiction_id').references(() => jurisdictions.id),
    ownerId: text('owner_id').references(() => users.id),
    /** Settings in the units of shared/schemas/river.ts (SI, T90 in hours). */
    settings: jsonb('settings').$type<Record<string, unknown>>().notNull(),
    /** Names of the settings still at their documented defaults. */
    defaultsUsed: jsonb('defaults_used').$type<string[]>().notNull().default([]),
    mouth: geometryColumn('mouth', 'Point').notNull(),
    coastId: uuid('coast_id').references(() => coasts.id),
    /** Bumped on every change of settings, record or coast: footprints of older versions are stale. */
    version: integer('version').notNull().default(1),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('rivers_jurisdiction_idx').on(t.jurisdictionId)],
);

export const flowRecords = pgTable('flow_records', {
  id: uuid('id').primaryKey().defaultRandom(),
  riverId: uuid('river_id')
    .notNull()
    .references(() => rivers.id, { onDelete: 'cascade' }),
  fileName: text('file_name').notNull(),
  units: text('units', { enum: ['m3s', 'cfs'] }).notNull(),
  waterYearStart: text('water_year_start').notNull().default('10-01'),
  uploadedBy: text('uploaded_by').references(() => users.id),
  uploadedAt: timestamp('uploaded_at', { withTimezone: true }).notNull().defaultNow(),
  readingCount: integer('reading_count').notNull(),
  firstTime: timestamp('first_time', { withTimezone: true }),
  lastTime: timestamp('last_time', { withTimezone: true }),
  interval: text('interval').notNull(),
  problems: jsonb('problems').notNull(),
  gaps: jsonb('gaps').notNull(),
  annualPeaks: jsonb('annual_peaks').notNull(),
  fit: jsonb('fit'),
  durations: jsonb('durations'),
  percentiles: jsonb('percentiles'),
  active: boolean('active').notNull().default(true),
});

export const flowReadings = pgTable(
  'flow_readings',
  {
    recordId: uuid('record_id')
      .notNull()
      .references(() => flowRecords.id, { onDelete: 'cascade' }),
    t: timestamp('t', { withTimezone: true }).notNull(),
    discharge: doublePrecision('discharge').notNull(),
  },
  (t) => [primaryKey({ columns: [t.recordId, t.t] })],
);

export const scenarios = pgTable(
  'scenarios',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    riverId: uuid('river_id')
      .notNull()
      .references(() => rivers.id, { onDelete: 'cascade' }),
    name: text('name').notNull(),
    kind: text('kind', { enum: ['aep', 'seasonal', 'manual'] }).notNull(),
    /** Annual exceedance probability (0..1) for flood-frequency scenarios. */
    aep: doublePrecision('aep'),
    discharge: doublePrecision('discharge').notNull(),
    durationHours: doublePrecision('duration_hours').notNull(),
    source: jsonb('source').$type<Record<string, unknown>>(),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('scenarios_river_idx').on(t.riverId)],
);

export const footprints = pgTable(
  'footprints',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    riverId: uuid('river_id')
      .notNull()
      .references(() => rivers.id, { onDelete: 'cascade' }),
    scenarioId: uuid('scenario_id').references(() => scenarios.id, { onDelete: 'cascade' }),
    discharge: doublePrecision('discharge').notNull(),
    durationHours: doublePrecision('duration_hours').notNull(),
    modelVersion: text('model_version').notNull(),
    /** Hash of every input (settings, flow, coast, model version): same hash, same footprint. */
    inputHash: text('input_hash').notNull(),
    plume: jsonb('plume').notNull(),
    warnings: jsonb('warnings').$type<string[]>().notNull(),
    path: geometryColumn('path', 'Geometry'),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex('footprints_river_hash_idx').on(t.riverId, t.inputHash), index('footprints_scenario_idx').on(t.scenarioId)],
);

export const footprintBands = pgTable(
  'footprint_bands',
  {
    footprintId: uuid('footprint_id')
      .notNull()
      .references(() => footprints.id, { onDelete: 'cascade' }),
    bandId: text('band_id').notNull(),
    name: text('name').notNull(),
    kind: text('kind').notNull(),
    threshold: doublePrecision('threshold'),
    sortOrder: integer('sort_order').notNull(),
    geom: geometryColumn('geom', 'MultiPolygon').notNull(),
  },
  (t) => [primaryKey({ columns: [t.footprintId, t.bandId] }), index('footprint_bands_geom_idx').using('gist', t.geom)],
);

/** Bands cut into small pieces (ST_Subdivide) so screening joins stay fast (stack.md §8). */
export const footprintBandPieces = pgTable(
  'footprint_band_pieces',
  {
    footprintId: uuid('footprint_id')
      .notNull()
      .references(() => footprints.id, { onDelete: 'cascade' }),
    bandId: text('band_id').notNull(),
    geom: geometryColumn('geom', 'Geometry').notNull(),
  },
  (t) => [index('footprint_band_pieces_geom_idx').using('gist', t.geom), index('footprint_band_pieces_fp_idx').on(t.footprintId)],
);

export const screenings = pgTable(
  'screenings',
  {
    leaseId: uuid('lease_id')
      .notNull()
      .references(() => leases.id, { onDelete: 'cascade' }),
    scenarioId: uuid('scenario_id')
      .notNull()
      .references(() => scenarios.id, { onDelete: 'cascade' }),
    footprintId: uuid('footprint_id')
      .notNull()
      .references(() => footprints.id, { onDelete: 'cascade' }),
    riverId: uuid('river_id')
      .notNull()
      .references(() => rivers.id, { onDelete: 'cascade' }),
    bandFractions: jsonb('band_fractions').$type<Record<string, number>>().notNull(),
    lowestSalinity: doublePrecision('lowest_salinity'),
    highestIndicator: doublePrecision('highest_indicator'),
    daysBelowTolerance: doublePrecision('days_below_tolerance').notNull(),
    rating: text('rating', { enum: ['low', 'moderate', 'high', 'severe'] }).notNull(),
    score: doublePrecision('score').notNull(),
    reasons: jsonb('reasons').$type<string[]>().notNull(),
    numbers: jsonb('numbers').notNull(),
    modelVersion: text('model_version').notNull(),
    inputHash: text('input_hash').notNull(),
    computedAt: timestamp('computed_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [primaryKey({ columns: [t.leaseId, t.scenarioId] }), index('screenings_river_idx').on(t.riverId), index('screenings_rating_idx').on(t.rating)],
);

/** Across a river's flood-frequency scenarios: a lease's yearly figures (shared/scoring/annualise.ts, annual-rating.ts). */
export const leaseAnnualExposure = pgTable(
  'lease_annual_exposure',
  {
    leaseId: uuid('lease_id')
      .notNull()
      .references(() => leases.id, { onDelete: 'cascade' }),
    riverId: uuid('river_id')
      .notNull()
      .references(() => rivers.id, { onDelete: 'cascade' }),
    expectedDaysPerYear: doublePrecision('expected_days_per_year').notNull(),
    probabilityAnyExposure: doublePrecision('probability_any_exposure').notNull(),
    worstRating: text('worst_rating').notNull(),
    /** Expected days a year the indicator on the lease is above the standard (the yearly rating's first figure). */
    closureDaysPerYear: doublePrecision('closure_days_per_year'),
    /** Chance a year of a salinity event harmful to the lease's species (the second figure); null until re-annualised. */
    harmfulSalinityChance: doublePrecision('harmful_salinity_chance'),
    details: jsonb('details'),
    computedAt: timestamp('computed_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [primaryKey({ columns: [t.leaseId, t.riverId] })],
);

const xid8 = customType<{ data: string; driverData: string }>({ dataType: () => 'xid8' });

/**
 * One row per committed transaction that changed what the cached lists read (leases, shares, screenings, yearly
 * figures, scenarios, rivers, holders' names and roles), written by statement triggers (migration
 * 0020_result_change_triggers). server/cache/result-cache.ts keeps a list answer only while no such transaction
 * has committed since the snapshot it was read in: correct across every process, with no lock between writers.
 */
export const resultChanges = pgTable('result_changes', {
  txid: xid8('txid').primaryKey(),
  changedAt: timestamp('changed_at', { withTimezone: true }).notNull().defaultNow(),
});

/** Progress of background screening runs, for the screens that show "Screening 3 of 10 scenarios…". */
export const screeningRuns = pgTable(
  'screening_runs',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    riverId: uuid('river_id')
      .notNull()
      .references(() => rivers.id, { onDelete: 'cascade' }),
    status: text('status', { enum: ['queued', 'running', 'done', 'failed'] }).notNull(),
    total: integer('total').notNull().default(0),
    done: integer('done').notNull().default(0),
    message: text('message'),
    error: text('error'),
    queuedAt: timestamp('queued_at', { withTimezone: true }).notNull().defaultNow(),
    startedAt: timestamp('started_at', { withTimezone: true }),
    finishedAt: timestamp('finished_at', { withTimezone: true }),
  },
  (t) => [index('screening_runs_river_idx').on(t.riverId, t.queuedAt)],
);

/**
 * One chunk of a screening run's leases, screened by one pg-boss job on any worker process.
 * The run is done when every chunk is; `worker` records the process that finished (or last took) it.
 */
export const screeningRunChunks = pgTable(
  'screening_run_chunks',
  {
    runId: uuid('run_id')
      .notNull()
      .references(() => screeningRuns.id, { onDelete: 'cascade' }),
    chunkNo: integer('chunk_no').notNull(),
    leaseIds: uuid('lease_ids').array().notNull(),
    status: text('status', { enum: ['queued', 'running', 'done', 'failed'] }).notNull().default('queued'),
    worker: text('worker'),
    attempts: integer('attempts').notNull().default(0),
    startedAt: timestamp('started_at', { withTimezone: true }),
    finishedAt: timestamp('finished_at', { withTimezone: true }),
  },
  (t) => [primaryKey({ columns: [t.runId, t.chunkNo] })],
);

// ---------------------------------------------------------------------------------------------
// Monitoring stations and samples (loaded with the demo region; calibration builds on them).

export const stations = pgTable(
  'stations',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    code: text('code').notNull(),
    name: text('name'),
    jurisdictionId: uuid('jurisdiction_id').references(() => jurisdictions.id),
    ownerId: text('owner_id').references(() => users.id),
    geom: geometryColumn('geom', 'Point').notNull(),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex('stations_owner_code_idx').on(t.ownerId, t.code), index('stations_geom_idx').using('gist', t.geom)],
);

export const samples = pgTable(
  'samples',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    stationId: uuid('station_id')
      .notNull()
      .references(() => stations.id, { onDelete: 'cascade' }),
    sampledAt: timestamp('sampled_at', { withTimezone: true }).notNull(),
    salinity: doublePrecision('salinity'),
    /** Indicator count per 100 mL; with `indicatorCensored` it is a detection limit ("<2", ">1600"). */
    indicator: doublePrecision('indicator'),
    indicatorCensored: text('indicator_censored', { enum: ['below', 'above'] }),
    indicatorName: text('indicator_name').notNull().default('E. coli'),
    method: text('method'),
    temperature: doublePrecision('temperature'),
    // Issue "Monitoring data and calibration": the indicator's unit as reported (e.g. MPN/100 mL, CFU/100 mL).
    indicatorUnit: text('indicator_unit').notNull().default('per 100 mL'),
  },
  (t) => [uniqueIndex('samples_station_time_idx').on(t.stationId, t.sampledAt)],
);

// ---------------------------------------------------------------------------------------------
// Gauges and their readings (regulator's closure checks and the paid alerts both read them),
// and the in-app inbox (closure notices and alerts both land there).

export const gauges = pgTable(
  'gauges',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    riverId: uuid('river_id')
      .notNull()
      .references(() => rivers.id, { onDelete: 'cascade' }),
    /** The gauge's own code, unique per river (e.g. "AMB-01"). */
    code: text('code').notNull(),
    name: text('name').notNull(),
    /** SHA-256 of the per-gauge upload token; the token itself is shown once. */
    tokenHash: text('token_hash'),
    location: geometryColumn('location', 'Point'),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex('gauges_river_code_idx').on(t.riverId, t.code)],
);

export const gaugeReadings = pgTable(
  'gauge_readings',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    gaugeId: uuid('gauge_id')
      .notNull()
      .references(() => gauges.id, { onDelete: 'cascade' }),
    observedAt: timestamp('observed_at', { withTimezone: true }).notNull(),
    /** Discharge in m³/s. */
    discharge: doublePrecision('discharge').notNull(),
    source: text('source', { enum: ['token', 'csv', 'feed', 'manual'] }).notNull(),
    receivedAt: timestamp('received_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex('gauge_readings_gauge_time_idx').on(t.gaugeId, t.observedAt)],
);

export const inboxMessages = pgTable(
  'inbox_messages',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    userId: text('user_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    kind: text('kind', { enum: ['notice', 'alert', 'invitation', 'note'] }).notNull(),
    title: text('title').notNull(),
    body: text('body').notNull(),
    /** An in-app path to open (e.g. /leases/…), or null. */
    link: text('link'),
    /** Dedupe: the same key is never delivered twice to the same user. */
    dedupeKey: text('dedupe_key'),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    readAt: timestamp('read_at', { withTimezone: true }),
  },
  (t) => [index('inbox_user_idx').on(t.userId, t.createdAt), uniqueIndex('inbox_user_dedupe_idx').on(t.userId, t.dedupeKey)],
);

// ---------------------------------------------------------------------------------------------
// Calibrations of a river's plume against monitoring samples (issue "Monitoring data and calibration").
// A fit stores the settings it started from and the fitted values; applying copies the fitted
// values into the river's settings (kept in `previous` for the rollback).

export const calibrations = pgTable(
  'calibrations',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    riverId: uuid('river_id')
      .notNull()
      .references(() => rivers.id, { onDelete: 'cascade' }),
    createdBy: text('created_by').references(() => users.id),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    /** The fit's options (lag, which parameters). */
    options: jsonb('options').$type<Record<string, unknown>>().notNull(),
    /** The calibrated settings at fit time (start values). */
    startValues: jsonb('start_values').$type<Record<string, number>>().notNull(),
    /** The fitted settings (river units: m, h, fractions). */
    fittedValues: jsonb('fitted_values').$type<Record<string, number>>().notNull(),
    /** Statistics before and after, flow range, sample counts, cautions. */
    result: jsonb('result').$type<Record<string, unknown>>().notNull(),
    status: text('status', { enum: ['fitted', 'applied', 'rolled-back'] }).notNull().default('fitted'),
    /** The river's values replaced when applied (restored by the rollback). */
    previousValues: jsonb('previous_values').$type<Record<string, number>>(),
    appliedBy: text('applied_by').references(() => users.id),
    appliedAt: timestamp('applied_at', { withTimezone: true }),
    rolledBackBy: text('rolled_back_by').references(() => users.id),
    rolledBackAt: timestamp('rolled_back_at', { withTimezone: true }),
  },
  (t) => [index('calibrations_river_idx').on(t.riverId, t.createdAt)],
);

// Advisers and their clients (issue "Grower's app II"): an adviser invites a grower by e-mail;
// the grower (matched by e-mail when they sign in) accepts and chooses leases to share, and can
// end the link at any time (which stops sharing every lease with that adviser).

export const clientInvitations = pgTable(
  'client_invitations',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    adviserId: text('adviser_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    /** The grower's e-mail as typed by the adviser, lower-cased. */
    email: text('email').notNull(),
    /** Set when the grower accepts. */
    growerId: text('grower_id').references(() => users.id, { onDelete: 'cascade' }),
    status: text('status', { enum: ['pending', 'accepted', 'declined', 'ended'] })
      .notNull()
      .default('pending'),
    message: text('message'),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    respondedAt: timestamp('responded_at', { withTimezone: true }),
    endedAt: timestamp('ended_at', { withTimezone: true }),
  },
  (t) => [
    index('client_invitations_adviser_idx').on(t.adviserId, t.status),
    index('client_invitations_email_idx').on(t.email, t.status),
    // One open (pending or accepted) link per adviser and e-mail.
    uniqueIndex('client_invitations_open_idx')
      .on(t.adviserId, t.email)
      .where(sql`status IN ('pending', 'accepted')`),
  ],
);

// Paid alerts plan (issue "Paid alerts plan"): billing accounts kept in step with the payment
// service by signed webhooks (each event processed once), alert rules, and alerts with their
// e-mail delivery state.

export const billingAccounts = pgTable('billing_accounts', {
  userId: text('user_id')
    .primaryKey()
    .references(() => users.id, { onDelete: 'cascade' }),
  customerId: text('customer_id').notNull().unique(),
  subscriptionId: text('subscription_id'),
  /** The payment service's subscription status ('none' before any subscription). */
  status: text('status').notNull().default('none'),
  cancelAtPeriodEnd: boolean('cancel_at_period_end').notNull().default(false),
  currentPeriodEnd: timestamp('current_period_end', { withTimezone: true }),
  updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
});

/** Webhook events already processed, by the payment service's event id. */
export const billingEvents = pgTable('billing_events', {
  id: text('id').primaryKey(),
  type: text('type').notNull(),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull(),
  processedAt: timestamp('processed_at', { withTimezone: true }).notNull().defaultNow(),
});

export const alertRules = pgTable(
  'alert_rules',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    userId: text('user_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    kind: text('kind', { enum: ['lease', 'zone'] }).notNull(),
    riverId: uuid('river_id')
      .notNull()
      .references(() => rivers.id, { onDelete: 'cascade' }),
    leaseId: uuid('lease_id').references(() => leases.id, { onDelete: 'cascade' }),
    zoneId: uuid('zone_id').references(() => closureZones.id, { onDelete: 'cascade' }),
    /** Lease rules: the sweep band whose entry flow is the threshold. */
    bandId: text('band_id'),
    bandName: text('band_name'),
    /** m³/s: a lease rule's band-entry flow, or a zone's trigger flow. */
    thresholdFlow: doublePrecision('threshold_flow').notNull(),
    /** Zone rules: "approaching" fires at this fraction of the trigger flow. */
    approachFraction: doublePrecision('approach_fraction'),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('alert_rules_river_idx').on(t.riverId), index('alert_rules_user_idx').on(t.userId)],
);

export const alerts = pgTable(
  'alerts',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    ruleId: uuid('rule_id')
      .notNull()
      .references(() => alertRules.id, { onDelete: 'cascade' }),
    userId: text('user_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    /** One alert per event per rule: e.g. "<rule>:enters:<gauge>:<time of the crossing reading>". */
    dedupeKey: text('dedupe_key').notNull(),
    level: text('level', { enum: ['enters', 'approaching', 'passing'] }).notNull(),
    source: text('source', { enum: ['reading', 'forecast'] }).notNull(),
    readingId: uuid('reading_id').references(() => gaugeReadings.id, { onDelete: 'set null' }),
    discharge: doublePrecision('discharge').notNull(),
    observedAt: timestamp('observed_at', { withTimezone: true }),
    subject: text('subject').notNull(),
    body: text('body').notNull(),
    emailStatus: text('email_status', { enum: ['pending', 'sent', 'failed'] }).notNull().default('pending'),
    emailAttempts: integer('email_attempts').notNull().default(0),
    emailLastError: text('email_last_error'),
    emailSentAt: timestamp('email_sent_at', { withTimezone: true }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex('alerts_rule_dedupe_idx').on(t.ruleId, t.dedupeKey), index('alerts_user_idx').on(t.userId, t.createdAt)],
);

// Regulator's workspace (issue #8): closure and reopening notices, the zones each covers, and the
// sample results a regulator enters before a zone may reopen.

/** A closure or reopening notice issued by a regulator for one or more zones of its jurisdiction. */
export const notices = pgTable(
  'notices',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    jurisdictionId: uuid('jurisdiction_id')
      .notNull()
      .references(() => jurisdictions.id),
    kind: text('kind', { enum: ['closure', 'reopening'] }).notNull(),
    /** A note to growers, shown in the e-mail, the in-app message and on the public page. */
    message: text('message'),
    /** The flow that prompted a closure (m³/s), when the regulator gave one. */
    flow: doublePrecision('flow'),
    issuedBy: text('issued_by')
      .notNull()
      .references(() => users.id),
    issuedAt: timestamp('issued_at', { withTimezone: true }).notNull().defaultNow(),
    /** Growers told (one e-mail and one in-app message each) and e-mails the SMTP server accepted. */
    recipients: integer('recipients').notNull().default(0),
    emailsSent: integer('emails_sent').notNull().default(0),
  },
  (t) => [index('notices_jurisdiction_idx').on(t.jurisdictionId, t.issuedAt)],
);

export const noticeZones = pgTable(
  'notice_zones',
  {
    noticeId: uuid('notice_id')
      .notNull()
      .references(() => notices.id, { onDelete: 'cascade' }),
    zoneId: uuid('zone_id')
      .notNull()
      .references(() => closureZones.id, { onDelete: 'cascade' }),
    statusBefore: text('status_before').notNull(),
    statusAfter: text('status_after').notNull(),
  },
  (t) => [primaryKey({ columns: [t.noticeId, t.zoneId] }), index('notice_zones_zone_idx').on(t.zoneId)],
);

/** A sample result for a zone, entered by a regulator; a passing one (at or under the standard) allows reopening. */
export const zoneSamples = pgTable(
  'zone_samples',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    zoneId: uuid('zone_id')
      .notNull()
      .references(() => closureZones.id, { onDelete: 'cascade' }),
    sampledAt: timestamp('sampled_at', { withTimezone: true }).notNull(),
    /** Indicator count per 100 mL. */
    indicator: doublePrecision('indicator').notNull(),
    /** The zone's standard when the result was entered, and whether the result is at or under it. */
    standard: doublePrecision('standard').notNull(),
    passed: boolean('passed').notNull(),
    notes: text('notes'),
    enteredBy: text('entered_by')
      .notNull()
      .references(() => users.id),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('zone_samples_zone_idx').on(t.zoneId, t.sampledAt)],
);
