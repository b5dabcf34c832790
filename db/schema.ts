/**
 * Keelson's database, the single source of truth for stored shapes.
 * Conventions: rates and weights are fractions (0.025 = 2.5%) stored as double
 * precision; money is in the scheme's currency units (double precision, exact
 * to the penny for the magnitudes a pension pot reaches); times are timestamptz.
 */
import { relations, sql } from 'drizzle-orm';
import {
  bigserial,
  boolean,
  date,
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
  varchar,
  json,
  customType,
  check,
} from 'drizzle-orm/pg-core';
import { ROLES, type Role } from '../constants/permissions';
// Shapes of the JSON columns: types only (erased), so the schema loads nothing from the server.
import type { ScenarioSnapshot } from '../server/services/scenario';
import type { StoredResult } from '../server/jobs/result';
import type { ReportContent } from '../server/reports/content';
import type { DecisionRecord } from '../server/reports/decisionRecord';

/** The roles come from the permission table, the one list the guards and menus read too. */
export const roleEnum = pgEnum('role', ROLES);

export const users = pgTable(
  'users',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    email: varchar('email', { length: 254 }).notNull(),
    displayName: varchar('display_name', { length: 120 }).notNull(),
    /** scrypt hash `scrypt$N$r$p$salt$hash` (base64); null until an invitation is accepted. */
    passwordHash: text('password_hash'),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex('users_email_lower').on(sql`lower(${t.email})`)],
);

export const schemes = pgTable('schemes', {
  id: uuid('id').primaryKey().defaultRandom(),
  name: varchar('name', { length: 160 }).notNull(),
  /** ISO 4217 code of the scheme's currency. */
  currency: varchar('currency', { length: 3 }).notNull().default('GBP'),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
});

/** One role per user per scheme. */
export const schemeRoles = pgTable(
  'scheme_roles',
  {
    userId: uuid('user_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    schemeId: uuid('scheme_id')
      .notNull()
      .references(() => schemes.id, { onDelete: 'cascade' }),
    role: roleEnum('role').notNull(),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [primaryKey({ columns: [t.userId, t.schemeId] })],
);

/** connect-pg-simple's table, created here by migration rather than at run time. */
export const sessions = pgTable(
  'session',
  {
    sid: varchar('sid').primaryKey(),
    sess: json('sess').notNull(),
    expire: timestamp('expire', { precision: 6 }).notNull(),
  },
  (t) => [index('IDX_session_expire').on(t.expire)],
);

/**
 * Failed sign-ins, per account (`account:<e-mail>`, known or not, so the answers never tell
 * which addresses exist) and per client address (`address:<ip>`). Repeated failures bring
 * progressively longer delays (server/services/signIn.ts); nothing locks for good.
 */
export const signInThrottles = pgTable('sign_in_throttles', {
  key: varchar('key', { length: 300 }).primaryKey(),
  failures: integer('failures').notNull().default(0),
  lastFailureAt: timestamp('last_failure_at', { withTimezone: true }).notNull().defaultNow(),
  /** Until then: an address waits before its next attempt; an account needs e-mail confirmation from new addresses. */
  waitUntil: timestamp('wait_until', { withTimezone: true }),
});

/** Client addresses a person has signed in from (IPv6 by /64), so a new one can be told apart. */
export const signInAddresses = pgTable(
  'sign_in_addresses',
  {
    userId: uuid('user_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    address: varchar('address', { length: 64 }).notNull(),
    firstSeenAt: timestamp('first_seen_at', { withTimezone: true }).notNull().defaultNow(),
    lastSeenAt: timestamp('last_seen_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [primaryKey({ columns: [t.userId, t.address] })],
);

export const tokenKindEnum = pgEnum('token_kind', ['invitation', 'password_reset', 'sign_in_confirmation']);

/**
 * Single-use, expiring links (invitations, password resets, sign-in confirmations). The token
 * is an HMAC of the row id under a key derived from SESSION_SECRET, so it is never stored:
 * only its SHA-256 is (for look-up), and the mail job recomputes it when it sends the message.
 * At most one live link per invitation (scheme, address) and per person for the other kinds.
 */
export const accessTokens = pgTable(
  'access_tokens',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    kind: tokenKindEnum('kind').notNull(),
    tokenHash: varchar('token_hash', { length: 64 }).notNull().unique(),
    email: varchar('email', { length: 254 }).notNull(),
    schemeId: uuid('scheme_id').references(() => schemes.id, { onDelete: 'cascade' }),
    role: roleEnum('role'),
    createdBy: uuid('created_by').references(() => users.id, { onDelete: 'set null' }),
    expiresAt: timestamp('expires_at', { withTimezone: true }).notNull(),
    usedAt: timestamp('used_at', { withTimezone: true }),
    /** Withdrawn: cancelled, replaced by a newer link, or voided when another was used. */
    revokedAt: timestamp('revoked_at', { withTimezone: true }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    uniqueIndex('access_tokens_one_invitation').on(t.schemeId, t.email).where(sql`kind = 'invitation' and used_at is null and revoked_at is null`),
    uniqueIndex('access_tokens_one_personal').on(t.kind, t.email).where(sql`kind <> 'invitation' and used_at is null and revoked_at is null`),
  ],
);

/** Who did what, when, in which scheme, with before/after values where they change. */
export const auditEvents = pgTable(
  'audit_events',
  {
    id: bigserial('id', { mode: 'number' }).primaryKey(),
    at: timestamp('at', { withTimezone: true }).notNull().defaultNow(),
    userId: uuid('user_id').references(() => users.id, { onDelete: 'set null' }),
    actorEmail: varchar('actor_email', { length: 254 }),
    schemeId: uuid('scheme_id').references(() => schemes.id, { onDelete: 'cascade' }),
    action: varchar('action', { length: 80 }).notNull(),
    entity: varchar('entity', { length: 60 }),
    entityId: varchar('entity_id', { length: 80 }),
    before: jsonb('before'),
    after: jsonb('after'),
    ip: varchar('ip', { length: 64 }),
  },
  (t) => [index('audit_scheme_at').on(t.schemeId, t.at)],
);

export const funds = pgTable(
  'funds',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    schemeId: uuid('scheme_id')
      .notNull()
      .references(() => schemes.id, { onDelete: 'cascade' }),
    name: varchar('name', { length: 120 }).notNull(),
    assetClass: varchar('asset_class', { length: 240 }).notNull().default(''),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex('funds_scheme_name').on(t.schemeId, t.name)],
);

export const assumptionStatusEnum = pgEnum('assumption_status', ['draft', 'approved']);

/**
 * A versioned set of capital-market assumptions. A draft may be edited; once a
 * trustee approves it, it is immutable and a change starts a new draft copied from it.
 */
export const assumptionSets = pgTable(
  'assumption_sets',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    schemeId: uuid('scheme_id')
      .notNull()
      .references(() => schemes.id, { onDelete: 'cascade' }),
    version: integer('version').notNull(),
    status: assumptionStatusEnum('status').notNull().default('draft'),
    setAt: date('set_at').notNull(),
    rationale: text('rationale').notNull().default(''),
    inflation: doublePrecision('inflation').notNull(),
    salaryGrowth: doublePrecision('salary_growth').notNull(),
    annuityRealRate: doublePrecision('annuity_real_rate').notNull(),
    annuityYears: integer('annuity_years').notNull(),
    /** Fund ids in the order of the correlation matrix's rows and columns. */
    fundOrder: jsonb('fund_order').$type<string[]>().notNull(),
    correlations: jsonb('correlations').$type<number[][]>().notNull(),
    basedOnId: uuid('based_on_id'),
    createdBy: uuid('created_by').references(() => users.id, { onDelete: 'set null' }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
    /** Who last changed the content: four-eyes approval needs a trustee other than this person. */
    updatedBy: uuid('updated_by').references(() => users.id, { onDelete: 'set null' }),
    /** The approval that completed the set's approvals (every approval is in `approvals`). */
    approvedBy: uuid('approved_by').references(() => users.id, { onDelete: 'set null' }),
    approvedAt: timestamp('approved_at', { withTimezone: true }),
  },
  (t) => [uniqueIndex('assumption_sets_scheme_version').on(t.schemeId, t.version)],
);

export const fundAssumptions = pgTable(
  'fund_assumptions',
  {
    assumptionSetId: uuid('assumption_set_id')
      .notNull()
      .references(() => assumptionSets.id, { onDelete: 'cascade' }),
    fundId: uuid('fund_id')
      .notNull()
      .references(() => funds.id, { onDelete: 'cascade' }),
    /** Arithmetic mean of the annual simple nominal return, a fraction. */
    expectedReturn: doublePrecision('expected_return').notNull(),
    /** Standard deviation of the annual simple return, a fraction. */
    volatility: doublePrecision('volatility').notNull(),
    /** Annual charge, a fraction of the pot. */
    annualCharge: doublePrecision('annual_charge').notNull(),
  },
  (t) => [primaryKey({ columns: [t.assumptionSetId, t.fundId] })],
);

export type GlidePathPoint = { yearsToRetirement: number; weights: Record<string, number> };

/**
 * A candidate default option: its identity across versions. What it invests in (name,
 * description, glide path) lives in its versions; runs and reviews name the version they used.
 */
export const defaultOptions = pgTable('default_options', {
  id: uuid('id').primaryKey().defaultRandom(),
  schemeId: uuid('scheme_id')
    .notNull()
    .references(() => schemes.id, { onDelete: 'cascade' }),
  archived: boolean('archived').notNull().default(false),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
});

/**
 * One version of a default option. A draft may be edited (which withdraws any approvals it
 * had); once approved it never changes, and an edit starts the next version as a draft.
 */
export const optionVersions = pgTable(
  'default_option_versions',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    optionId: uuid('option_id')
      .notNull()
      .references(() => defaultOptions.id, { onDelete: 'cascade' }),
    schemeId: uuid('scheme_id')
      .notNull()
      .references(() => schemes.id, { onDelete: 'cascade' }),
    version: integer('version').notNull(),
    status: assumptionStatusEnum('status').notNull().default('draft'),
    name: varchar('name', { length: 120 }).notNull(),
    description: text('description').notNull().default(''),
    /** Points keyed by fund id; weights are fractions summing to 1. */
    glidePath: jsonb('glide_path').$type<GlidePathPoint[]>().notNull(),
    basedOnId: uuid('based_on_id'),
    createdBy: uuid('created_by').references(() => users.id, { onDelete: 'set null' }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    updatedBy: uuid('updated_by').references(() => users.id, { onDelete: 'set null' }),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
    approvedBy: uuid('approved_by').references(() => users.id, { onDelete: 'set null' }),
    approvedAt: timestamp('approved_at', { withTimezone: true }),
  },
  (t) => [uniqueIndex('option_versions_option_version').on(t.optionId, t.version), index('option_versions_scheme').on(t.schemeId)],
);

/** Each trustee's approval of an assumption set or an option version (exactly one of the two). */
export const approvals = pgTable(
  'approvals',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    schemeId: uuid('scheme_id')
      .notNull()
      .references(() => schemes.id, { onDelete: 'cascade' }),
    assumptionSetId: uuid('assumption_set_id').references(() => assumptionSets.id, { onDelete: 'cascade' }),
    optionVersionId: uuid('option_version_id').references(() => optionVersions.id, { onDelete: 'cascade' }),
    userId: uuid('user_id').references(() => users.id, { onDelete: 'set null' }),
    /** The approver's name when approving, so the record reads the same after they leave. */
    approverName: varchar('approver_name', { length: 120 }).notNull(),
    at: timestamp('at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    uniqueIndex('approvals_set_user').on(t.assumptionSetId, t.userId),
    uniqueIndex('approvals_version_user').on(t.optionVersionId, t.userId),
    check('approvals_one_target', sql`(${t.assumptionSetId} is null) <> (${t.optionVersionId} is null)`),
  ],
);

/** A scheme's governance settings; a scheme without a row has the defaults. */
export const schemeSettings = pgTable(
  'scheme_settings',
  {
    schemeId: uuid('scheme_id')
      .primaryKey()
      .references(() => schemes.id, { onDelete: 'cascade' }),
    /** Trustee approvals an assumption set or option version needs (1 or 2). */
    approvalsRequired: integer('approvals_required').notNull().default(1),
    /** Trustees who must sign a review's decision before it is final. */
    signOffQuorum: integer('sign_off_quorum').notNull().default(2),
    /** Years from a review's sign-off to the next review, unless the review names a date. */
    reviewIntervalYears: integer('review_interval_years').notNull().default(3),
    /** The option members are in today: the baseline of comparisons. */
    currentDefaultOptionId: uuid('current_default_option_id').references(() => defaultOptions.id, { onDelete: 'set null' }),
    nextReviewDue: date('next_review_due'),
    updatedBy: uuid('updated_by').references(() => users.id, { onDelete: 'set null' }),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    check('scheme_settings_approvals', sql`${t.approvalsRequired} between 1 and 2`),
    check('scheme_settings_quorum', sql`${t.signOffQuorum} between 1 and 12`),
    check('scheme_settings_interval', sql`${t.reviewIntervalYears} between 1 and 5`),
  ],
);

export const illustrativeMembers = pgTable('illustrative_members', {
  id: uuid('id').primaryKey().defaultRandom(),
  schemeId: uuid('scheme_id')
    .notNull()
    .references(() => schemes.id, { onDelete: 'cascade' }),
  label: varchar('label', { length: 120 }).notNull(),
  age: integer('age').notNull(),
  retirementAge: integer('retirement_age').notNull(),
  salary: doublePrecision('salary').notNull(),
  /** Overrides the assumption set's salary growth when set. */
  salaryGrowth: doublePrecision('salary_growth'),
  contributionRate: doublePrecision('contribution_rate').notNull(),
  pot: doublePrecision('pot').notNull(),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
});

/** Pseudonymous membership records uploaded by CSV, for membership-wide projections. */
export const schemeMembers = pgTable(
  'scheme_members',
  {
    id: bigserial('id', { mode: 'number' }).primaryKey(),
    schemeId: uuid('scheme_id')
      .notNull()
      .references(() => schemes.id, { onDelete: 'cascade' }),
    reference: varchar('reference', { length: 64 }).notNull(),
    age: integer('age').notNull(),
    salary: doublePrecision('salary').notNull(),
    pot: doublePrecision('pot').notNull(),
    contributionRate: doublePrecision('contribution_rate').notNull(),
    retirementAge: integer('retirement_age').notNull(),
    uploadedAt: timestamp('uploaded_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [uniqueIndex('scheme_members_reference').on(t.schemeId, t.reference)],
);

export const runStatusEnum = pgEnum('run_status', ['queued', 'running', 'done', 'failed']);

/** A projection run: a snapshot of every input, and the engine's results. */
export const projectionRuns = pgTable(
  'projection_runs',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    schemeId: uuid('scheme_id')
      .notNull()
      .references(() => schemes.id, { onDelete: 'cascade' }),
    status: runStatusEnum('status').notNull().default('queued'),
    progress: doublePrecision('progress').notNull().default(0),
    assumptionSetId: uuid('assumption_set_id').references(() => assumptionSets.id, { onDelete: 'set null' }),
    assumptionsDraft: boolean('assumptions_draft').notNull(),
    seed: integer('seed').notNull(),
    paths: integer('paths').notNull(),
    riskAversion: doublePrecision('risk_aversion').notNull(),
    /** Every input of the run as it was requested (engine scenario plus labels and provenance). */
    input: jsonb('input').$type<ScenarioSnapshot>().notNull(),
    /** The stored result once done (see server/jobs/result.ts). */
    result: jsonb('result').$type<StoredResult>(),
    engineVersion: varchar('engine_version', { length: 32 }),
    error: text('error'),
    /** Written every few seconds by the worker running it; an old one means the worker was lost. */
    heartbeatAt: timestamp('heartbeat_at', { withTimezone: true }),
    rerunOf: uuid('rerun_of'),
    /** The scheme's current default option when the run was requested (null: none was marked). */
    baselineOptionId: uuid('baseline_option_id').references(() => defaultOptions.id, { onDelete: 'set null' }),
    requestedBy: uuid('requested_by').references(() => users.id, { onDelete: 'set null' }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    startedAt: timestamp('started_at', { withTimezone: true }),
    finishedAt: timestamp('finished_at', { withTimezone: true }),
  },
  (t) => [index('projection_runs_scheme').on(t.schemeId, t.createdAt)],
);

/** The option versions a run used, in the run's order (runs made before versioning have none). */
export const runOptionVersions = pgTable(
  'run_option_versions',
  {
    runId: uuid('run_id')
      .notNull()
      .references(() => projectionRuns.id, { onDelete: 'cascade' }),
    position: integer('position').notNull(),
    optionId: uuid('option_id')
      .notNull()
      .references(() => defaultOptions.id, { onDelete: 'cascade' }),
    optionVersionId: uuid('option_version_id')
      .notNull()
      .references(() => optionVersions.id),
  },
  (t) => [primaryKey({ columns: [t.runId, t.position] }), index('run_option_versions_version').on(t.optionVersionId)],
);

export const usersRelations = relations(users, ({ many }) => ({ roles: many(schemeRoles) }));
export const schemesRelations = relations(schemes, ({ many }) => ({
  roles: many(schemeRoles),
  funds: many(funds),
  assumptionSets: many(assumptionSets),
  defaultOptions: many(defaultOptions),
  illustrativeMembers: many(illustrativeMembers),
}));
export const schemeRolesRelations = relations(schemeRoles, ({ one }) => ({
  user: one(users, { fields: [schemeRoles.userId], references: [users.id] }),
  scheme: one(schemes, { fields: [schemeRoles.schemeId], references: [schemes.id] }),
}));
export const assumptionSetsRelations = relations(assumptionSets, ({ many, one }) => ({
  funds: many(fundAssumptions),
  scheme: one(schemes, { fields: [assumptionSets.schemeId], references: [schemes.id] }),
}));
export const fundAssumptionsRelations = relations(fundAssumptions, ({ one }) => ({
  set: one(assumptionSets, { fields: [fundAssumptions.assumptionSetId], references: [assumptionSets.id] }),
  fund: one(funds, { fields: [fundAssumptions.fundId], references: [funds.id] }),
}));

export type { Role };
export type User = typeof users.$inferSelect;
export type Scheme = typeof schemes.$inferSelect;

/** Binary column (PDF files, attachments): Buffer in TypeScript, bytea in PostgreSQL. */
const bytea = customType<{ data: Buffer; driverData: Buffer }>({ dataType: () => 'bytea' });

/**
 * Every terminal real pot of one option × member of a finished run, in path order, so
 * certainty equivalents, ranks and differences at any λ are exact (not from a sample).
 * `data` holds the pots as little-endian Float64 split into eight byte planes and deflated
 * (encoding 'f64le-planes-deflate'; server/jobs/result.ts). `variant` is 'base' or 'stressed'.
 */
export const projectionRunPots = pgTable(
  'projection_run_pots',
  {
    runId: uuid('run_id')
      .notNull()
      .references(() => projectionRuns.id, { onDelete: 'cascade' }),
    variant: varchar('variant', { length: 16 }).notNull(),
    optionId: varchar('option_id', { length: 100 }).notNull(),
    memberId: varchar('member_id', { length: 100 }).notNull(),
    paths: integer('paths').notNull(),
    encoding: varchar('encoding', { length: 40 }).notNull(),
    data: bytea('data').notNull(),
  },
  (t) => [primaryKey({ columns: [t.runId, t.variant, t.optionId, t.memberId] })],
);

/** A board scenario report: a PDF made from one finished run, kept as generated (never regenerated). */
export const reports = pgTable(
  'reports',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    schemeId: uuid('scheme_id')
      .notNull()
      .references(() => schemes.id, { onDelete: 'cascade' }),
    runId: uuid('run_id')
      .notNull()
      .references(() => projectionRuns.id, { onDelete: 'cascade' }),
    title: varchar('title', { length: 200 }).notNull(),
    /** Risk aversion λ at which the report states certainty equivalents. */
    riskAversion: doublePrecision('risk_aversion').notNull(),
    draft: boolean('draft').notNull(),
    /** The figures and sentences printed in the PDF, for reading in the app without the file. */
    content: jsonb('content').$type<ReportContent>().notNull(),
    pdf: bytea('pdf').notNull(),
    createdBy: uuid('created_by').references(() => users.id, { onDelete: 'set null' }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('reports_scheme').on(t.schemeId, t.createdAt)],
);

export const mailStatusEnum = pgEnum('mail_status', ['queued', 'retrying', 'sent', 'failed']);

/** Every e-mail Keelson sends, with its delivery status; a job delivers it and retries on failure. */
export const outboxMessages = pgTable(
  'outbox_messages',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    /** Null for mail that belongs to no scheme (password resets). */
    schemeId: uuid('scheme_id').references(() => schemes.id, { onDelete: 'cascade' }),
    kind: varchar('kind', { length: 40 }).notNull(),
    recipients: jsonb('recipients').$type<string[]>().notNull(),
    subject: varchar('subject', { length: 300 }).notNull(),
    body: text('body').notNull(),
    status: mailStatusEnum('status').notNull().default('queued'),
    attempts: integer('attempts').notNull().default(0),
    lastError: text('last_error'),
    /** The receiving server's message id once sent. */
    providerId: varchar('provider_id', { length: 300 }),
    /** The one-use link the body's {{link}} stands for; the job recomputes its token when sending (never stored). */
    linkTokenId: uuid('link_token_id').references(() => accessTokens.id, { onDelete: 'set null' }),
    createdBy: uuid('created_by').references(() => users.id, { onDelete: 'set null' }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    lastAttemptAt: timestamp('last_attempt_at', { withTimezone: true }),
    sentAt: timestamp('sent_at', { withTimezone: true }),
  },
  (t) => [index('outbox_scheme_created').on(t.schemeId, t.createdAt)],
);

export const outboxAttachments = pgTable('outbox_attachments', {
  id: uuid('id').primaryKey().defaultRandom(),
  messageId: uuid('message_id')
    .notNull()
    .references(() => outboxMessages.id, { onDelete: 'cascade' }),
  filename: varchar('filename', { length: 200 }).notNull(),
  contentType: varchar('content_type', { length: 100 }).notNull(),
  content: bytea('content').notNull(),
});

/** What the local stand-in mail server received (development and tests), raw as delivered. */
export const receivedMail = pgTable('received_mail', {
  id: bigserial('id', { mode: 'number' }).primaryKey(),
  receivedAt: timestamp('received_at', { withTimezone: true }).notNull().defaultNow(),
  envelopeFrom: varchar('envelope_from', { length: 254 }),
  envelopeTo: jsonb('envelope_to').$type<string[]>().notNull(),
  raw: bytea('raw').notNull(),
});

export const exportStatusEnum = pgEnum('export_status', ['queued', 'running', 'done', 'failed']);

/** A background export of member statements (a whole membership, or every illustrative member). */
export const statementExports = pgTable(
  'statement_exports',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    schemeId: uuid('scheme_id')
      .notNull()
      .references(() => schemes.id, { onDelete: 'cascade' }),
    runId: uuid('run_id')
      .notNull()
      .references(() => projectionRuns.id, { onDelete: 'cascade' }),
    optionId: varchar('option_id', { length: 64 }).notNull(),
    scope: varchar('scope', { length: 20 }).$type<'illustrative' | 'membership'>().notNull(),
    format: varchar('format', { length: 8 }).$type<'pdf' | 'csv'>().notNull(),
    status: exportStatusEnum('status').notNull().default('queued'),
    progress: doublePrecision('progress').notNull().default(0),
    memberCount: integer('member_count').notNull().default(0),
    error: text('error'),
    filename: varchar('filename', { length: 200 }),
    file: bytea('file'),
    createdBy: uuid('created_by').references(() => users.id, { onDelete: 'set null' }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    finishedAt: timestamp('finished_at', { withTimezone: true }),
  },
  (t) => [index('statement_exports_scheme').on(t.schemeId, t.createdAt)],
);

export const reviewStatusEnum = pgEnum('review_status', ['open', 'signed_off']);
export const reviewDecisionEnum = pgEnum('review_decision', ['option', 'no_change']);

/**
 * A review of the default option: what the trustees looked at (an approved assumption set,
 * option versions, runs, board reports) and what they decided. Signed by the scheme's quorum
 * of trustees it becomes immutable, with its decision record (content and PDF) kept as signed.
 */
export const reviews = pgTable(
  'reviews',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    schemeId: uuid('scheme_id')
      .notNull()
      .references(() => schemes.id, { onDelete: 'cascade' }),
    title: varchar('title', { length: 200 }).notNull(),
    status: reviewStatusEnum('status').notNull().default('open'),
    assumptionSetId: uuid('assumption_set_id').references(() => assumptionSets.id),
    decision: reviewDecisionEnum('decision'),
    /** The option version chosen when the decision is 'option'. */
    chosenVersionId: uuid('chosen_version_id').references(() => optionVersions.id),
    /** The board's risk aversion λ for the decision, and how the board arrived at it. */
    riskAversion: doublePrecision('risk_aversion'),
    lambdaCalibration: text('lambda_calibration').notNull().default(''),
    reasons: text('reasons').notNull().default(''),
    dissent: text('dissent').notNull().default(''),
    /** The date the trustees set for the next review; empty ⇒ the scheme's interval after sign-off. */
    nextReviewDue: date('next_review_due'),
    openedBy: uuid('opened_by').references(() => users.id, { onDelete: 'set null' }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    updatedBy: uuid('updated_by').references(() => users.id, { onDelete: 'set null' }),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
    signedOffAt: timestamp('signed_off_at', { withTimezone: true }),
    /** The decision record as signed: every printed figure and sentence. */
    record: jsonb('record').$type<DecisionRecord>(),
    pdf: bytea('pdf'),
  },
  (t) => [index('reviews_scheme').on(t.schemeId, t.createdAt)],
);

export const reviewOptionVersions = pgTable(
  'review_option_versions',
  {
    reviewId: uuid('review_id')
      .notNull()
      .references(() => reviews.id, { onDelete: 'cascade' }),
    optionVersionId: uuid('option_version_id')
      .notNull()
      .references(() => optionVersions.id),
    position: integer('position').notNull(),
  },
  (t) => [primaryKey({ columns: [t.reviewId, t.optionVersionId] })],
);

export const reviewRuns = pgTable(
  'review_runs',
  {
    reviewId: uuid('review_id')
      .notNull()
      .references(() => reviews.id, { onDelete: 'cascade' }),
    runId: uuid('run_id')
      .notNull()
      .references(() => projectionRuns.id),
    position: integer('position').notNull(),
  },
  (t) => [primaryKey({ columns: [t.reviewId, t.runId] })],
);

export const reviewReports = pgTable(
  'review_reports',
  {
    reviewId: uuid('review_id')
      .notNull()
      .references(() => reviews.id, { onDelete: 'cascade' }),
    reportId: uuid('report_id')
      .notNull()
      .references(() => reports.id),
    position: integer('position').notNull(),
  },
  (t) => [primaryKey({ columns: [t.reviewId, t.reportId] })],
);

/** A trustee's signature on a review's decision (withdrawn if the decision changes before it is final). */
export const reviewSignOffs = pgTable(
  'review_sign_offs',
  {
    reviewId: uuid('review_id')
      .notNull()
      .references(() => reviews.id, { onDelete: 'cascade' }),
    userId: uuid('user_id')
      .notNull()
      .references(() => users.id),
    signerName: varchar('signer_name', { length: 120 }).notNull(),
    at: timestamp('at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [primaryKey({ columns: [t.reviewId, t.userId] })],
);

/**
 * Review reminders sent: one row per trustee, due date and stage (90, 30 or 0 days before).
 * The primary key is what makes the daily job send each reminder exactly once.
 */
export const reviewReminders = pgTable(
  'review_reminders',
  {
    schemeId: uuid('scheme_id')
      .notNull()
      .references(() => schemes.id, { onDelete: 'cascade' }),
    userId: uuid('user_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    dueOn: date('due_on').notNull(),
    daysBefore: integer('days_before').notNull(),
    messageId: uuid('message_id').references(() => outboxMessages.id, { onDelete: 'set null' }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [primaryKey({ columns: [t.schemeId, t.userId, t.dueOn, t.daysBefore] })],
);
