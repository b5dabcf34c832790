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
} from 'drizzle-orm/pg-core';

export const roleEnum = pgEnum('role', ['administrator', 'trustee', 'actuary', 'communications', 'board']);

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
 * Failed sign-ins by e-mail address (known or not, so the answer never tells
 * which addresses exist). Repeated failures lock the address for a while.
 */
export const signInFailures = pgTable('sign_in_failures', {
  emailKey: varchar('email_key', { length: 254 }).primaryKey(),
  failures: integer('failures').notNull().default(0),
  lastFailureAt: timestamp('last_failure_at', { withTimezone: true }).notNull().defaultNow(),
  lockedUntil: timestamp('locked_until', { withTimezone: true }),
});

export const tokenKindEnum = pgEnum('token_kind', ['invitation', 'password_reset']);

/** Single-use, expiring links (invitations, password resets). Only a SHA-256 of the token is stored. */
export const accessTokens = pgTable('access_tokens', {
  id: uuid('id').primaryKey().defaultRandom(),
  kind: tokenKindEnum('kind').notNull(),
  tokenHash: varchar('token_hash', { length: 64 }).notNull().unique(),
  email: varchar('email', { length: 254 }).notNull(),
  schemeId: uuid('scheme_id').references(() => schemes.id, { onDelete: 'cascade' }),
  role: roleEnum('role'),
  createdBy: uuid('created_by').references(() => users.id, { onDelete: 'set null' }),
  expiresAt: timestamp('expires_at', { withTimezone: true }).notNull(),
  usedAt: timestamp('used_at', { withTimezone: true }),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
});

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

export const defaultOptions = pgTable('default_options', {
  id: uuid('id').primaryKey().defaultRandom(),
  schemeId: uuid('scheme_id')
    .notNull()
    .references(() => schemes.id, { onDelete: 'cascade' }),
  name: varchar('name', { length: 120 }).notNull(),
  description: text('description').notNull().default(''),
  /** Points keyed by fund id; weights are fractions summing to 1. */
  glidePath: jsonb('glide_path').$type<GlidePathPoint[]>().notNull(),
  archived: boolean('archived').notNull().default(false),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
});

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
    input: jsonb('input').notNull(),
    result: jsonb('result'),
    engineVersion: varchar('engine_version', { length: 32 }),
    error: text('error'),
    rerunOf: uuid('rerun_of'),
    requestedBy: uuid('requested_by').references(() => users.id, { onDelete: 'set null' }),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    startedAt: timestamp('started_at', { withTimezone: true }),
    finishedAt: timestamp('finished_at', { withTimezone: true }),
  },
  (t) => [index('projection_runs_scheme').on(t.schemeId, t.createdAt)],
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

export type Role = (typeof roleEnum.enumValues)[number];
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
    content: jsonb('content').notNull(),
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
