import { and, count, desc, eq, inArray, sql } from 'drizzle-orm';
import type { DbOrTx } from '../../db/client';
import { defaultOptions, optionVersions, reviews, schemeRoles, schemeSettings, users } from '../../db/schema';
import { badRequest, conflict } from '../errors';
import { audit } from './audit';
import type { ServiceContext } from './context';

/** A scheme's governance settings, with the defaults for a scheme that never changed them. */
export type SchemeSettings = {
  approvalsRequired: number;
  signOffQuorum: number;
  reviewIntervalYears: number;
  currentDefaultOptionId: string | null;
  nextReviewDue: string | null;
  updatedAt: Date | null;
  updatedBy: string | null;
};

export const DEFAULT_SETTINGS = { approvalsRequired: 1, signOffQuorum: 2, reviewIntervalYears: 3 } as const;

export type SettingsInput = Pick<SchemeSettings, 'approvalsRequired' | 'signOffQuorum' | 'reviewIntervalYears' | 'nextReviewDue'>;

export async function settingsOf(db: DbOrTx, schemeId: string): Promise<SchemeSettings> {
  const [row] = await db
    .select({
      approvalsRequired: schemeSettings.approvalsRequired,
      signOffQuorum: schemeSettings.signOffQuorum,
      reviewIntervalYears: schemeSettings.reviewIntervalYears,
      currentDefaultOptionId: schemeSettings.currentDefaultOptionId,
      nextReviewDue: schemeSettings.nextReviewDue,
      updatedAt: schemeSettings.updatedAt,
      updatedBy: users.displayName,
    })
    .from(schemeSettings)
    .leftJoin(users, eq(users.id, schemeSettings.updatedBy))
    .where(eq(schemeSettings.schemeId, schemeId));
  return row ?? { ...DEFAULT_SETTINGS, currentDefaultOptionId: null, nextReviewDue: null, updatedAt: null, updatedBy: null };
}

/** Writes some settings (creating the row with defaults first), locked against a concurrent change. */
export async function writeSettings(tx: DbOrTx, schemeId: string, actorId: string | null, values: Partial<typeof schemeSettings.$inferInsert>) {
  await tx.insert(schemeSettings).values({ schemeId }).onConflictDoNothing();
  await tx
    .update(schemeSettings)
    .set({ ...values, updatedBy: actorId, updatedAt: new Date() })
    .where(eq(schemeSettings.schemeId, schemeId));
}

/** The scheme's trustees, for the quorum check and for reminders. */
export async function trusteesOf(db: DbOrTx, schemeId: string) {
  return db
    .select({ id: users.id, email: users.email, displayName: users.displayName })
    .from(schemeRoles)
    .innerJoin(users, eq(users.id, schemeRoles.userId))
    .where(and(eq(schemeRoles.schemeId, schemeId), eq(schemeRoles.role, 'trustee')))
    .orderBy(users.displayName);
}

/** The settings screen's view: the settings and how many trustees the scheme has. */
export async function settingsView(db: DbOrTx, schemeId: string) {
  const settings = await settingsOf(db, schemeId);
  const trustees = await trusteesOf(db, schemeId);
  return { ...settings, trustees: trustees.length };
}

/** The administrator changes the governance settings; a quorum larger than the board could never sign. */
export async function updateSettings(db: DbOrTx, ctx: ServiceContext, input: SettingsInput) {
  const schemeId = ctx.schemeId!;
  return db.transaction(async (tx) => {
    const trustees = await trusteesOf(tx, schemeId);
    if (input.signOffQuorum > trustees.length) {
      throw badRequest('Some fields are not valid.', [
        { path: 'signOffQuorum', message: `must be at most ${trustees.length}: the scheme has ${trustees.length} trustee${trustees.length === 1 ? '' : 's'} to sign` },
      ]);
    }
    if (input.approvalsRequired > trustees.length) {
      throw badRequest('Some fields are not valid.', [{ path: 'approvalsRequired', message: `must be at most ${trustees.length}: the scheme has ${trustees.length} trustee${trustees.length === 1 ? '' : 's'}` }]);
    }
    const before = await settingsOf(tx, schemeId);
    await writeSettings(tx, schemeId, ctx.actor?.id ?? null, input);
    const pick = (s: SettingsInput) => ({ approvalsRequired: s.approvalsRequired, signOffQuorum: s.signOffQuorum, reviewIntervalYears: s.reviewIntervalYears, nextReviewDue: s.nextReviewDue });
    await audit(tx, ctx, { action: 'settings.updated', entity: 'scheme_settings', entityId: schemeId, before: pick(before), after: pick(input) });
    return { ...(await settingsOf(tx, schemeId)), trustees: trustees.length };
  });
}

/** The newest approved version of each option (for the current default and reviews). */
export async function newestApproved(db: DbOrTx, optionIds: string[]) {
  if (!optionIds.length) return new Map<string, typeof optionVersions.$inferSelect>();
  const rows = await db
    .select()
    .from(optionVersions)
    .where(and(inArray(optionVersions.optionId, optionIds), eq(optionVersions.status, 'approved')))
    .orderBy(desc(optionVersions.version));
  const out = new Map<string, typeof optionVersions.$inferSelect>();
  for (const r of rows) if (!out.has(r.optionId)) out.set(r.optionId, r);
  return out;
}

/**
 * Marks the scheme's current default option (the baseline of comparisons), or clears it with
 * null. It must be an active option with an approved version.
 */
export async function setCurrentDefault(db: DbOrTx, ctx: ServiceContext, optionId: string | null) {
  const schemeId = ctx.schemeId!;
  return db.transaction(async (tx) => {
    let name: string | null = null;
    if (optionId) {
      const [o] = await tx.select().from(defaultOptions).where(and(eq(defaultOptions.id, optionId), eq(defaultOptions.schemeId, schemeId)));
      if (!o) throw badRequest('Some fields are not valid.', [{ path: 'optionId', message: 'is not a default option of this scheme' }]);
      if (o.archived) throw conflict('An archived option cannot be the current default; restore it first.');
      const approved = (await newestApproved(tx, [optionId])).get(optionId);
      if (!approved) throw conflict('This option has no approved version yet; a trustee other than its last editor must approve it first.');
      name = approved.name;
    }
    const before = await settingsOf(tx, schemeId);
    if (before.currentDefaultOptionId === optionId) return currentDefaultOf(tx, schemeId);
    await writeSettings(tx, schemeId, ctx.actor?.id ?? null, { currentDefaultOptionId: optionId });
    await audit(tx, ctx, {
      action: 'option.current-default-set',
      entity: 'default_option',
      entityId: optionId ?? before.currentDefaultOptionId ?? undefined,
      before: { optionId: before.currentDefaultOptionId },
      after: { optionId, name },
    });
    return currentDefaultOf(tx, schemeId);
  });
}

/** The current default option with the name of its newest approved version, or null. */
export async function currentDefaultOf(db: DbOrTx, schemeId: string) {
  const { currentDefaultOptionId: id } = await settingsOf(db, schemeId);
  if (!id) return null;
  const v = (await newestApproved(db, [id])).get(id);
  return { optionId: id, name: v?.name ?? null, versionId: v?.id ?? null, version: v?.version ?? null };
}

/** What the overview shows about governance: the current default and when the next review is due. */
export async function governanceSummary(db: DbOrTx, schemeId: string) {
  const settings = await settingsOf(db, schemeId);
  const [last] = await db
    .select({ id: reviews.id, title: reviews.title, signedOffAt: reviews.signedOffAt })
    .from(reviews)
    .where(and(eq(reviews.schemeId, schemeId), eq(reviews.status, 'signed_off')))
    .orderBy(desc(reviews.signedOffAt))
    .limit(1);
  const [open] = await db.select({ n: count() }).from(reviews).where(and(eq(reviews.schemeId, schemeId), eq(reviews.status, 'open')));
  // Option drafts waiting for a trustee's approval (the newest version of an active option).
  const pending = await db.execute(sql`
    select v.option_id as "optionId", v.id as "versionId", v.name, v.version from default_option_versions v
    join default_options o on o.id = v.option_id and not o.archived
    where v.scheme_id = ${schemeId} and v.status = 'draft'
      and v.version = (select max(x.version) from default_option_versions x where x.option_id = v.option_id)
    order by v.name`);
  return {
    currentDefault: await currentDefaultOf(db, schemeId),
    nextReviewDue: settings.nextReviewDue,
    lastReview: last ?? null,
    openReviews: Number(open.n),
    optionDrafts: pending.rows as { optionId: string; versionId: string; name: string; version: number }[],
  };
}
