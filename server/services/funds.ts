import { and, asc, eq, inArray, sql } from 'drizzle-orm';
import { schemeOf, type ServiceContext } from './context';
import type { DbOrTx } from '../../db/client';
import { fundAssumptions, funds, optionVersions } from '../../db/schema';
import { badRequest, conflict, notFound, type FieldIssue } from '../errors';
import { audit } from './audit';

export type FundRow = typeof funds.$inferSelect;

export async function listFunds(db: DbOrTx, schemeId: string): Promise<FundRow[]> {
  return db.select().from(funds).where(eq(funds.schemeId, schemeId)).orderBy(asc(funds.createdAt), asc(funds.name));
}

/**
 * Checks that every id names a fund of the scheme; otherwise a 400 naming each bad path.
 * `paths[i]` is the request path of `ids[i]`.
 */
export async function assertSchemeFunds(db: DbOrTx, schemeId: string, ids: string[], paths: string[]): Promise<void> {
  // Only well-formed ids can name a fund; anything else is simply unknown (and must not reach a uuid column).
  const unique = [...new Set(ids)].filter((id) => /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i.test(id));
  const found = unique.length ? await db.select({ id: funds.id }).from(funds).where(and(eq(funds.schemeId, schemeId), inArray(funds.id, unique))) : [];
  const known = new Set(found.map((f) => f.id));
  const issues: FieldIssue[] = ids.flatMap((id, i) => (known.has(id) ? [] : [{ path: paths[i], message: `is not a fund of this scheme (${id})` }]));
  if (issues.length) throw badRequest('Some funds are not funds of this scheme.', issues);
}

async function nameTaken(db: DbOrTx, schemeId: string, name: string, exceptId?: string) {
  const rows = await db.select({ id: funds.id }).from(funds).where(and(eq(funds.schemeId, schemeId), sql`lower(${funds.name}) = lower(${name})`));
  return rows.some((r) => r.id !== exceptId);
}

export async function createFund(db: DbOrTx, ctx: ServiceContext, body: { name: string; assetClass: string }): Promise<FundRow> {
  const schemeId = schemeOf(ctx);
  return db.transaction(async (tx) => {
    if (await nameTaken(tx, schemeId, body.name)) throw conflict(`This scheme already has a fund called "${body.name}".`);
    const [row] = await tx.insert(funds).values({ schemeId, name: body.name, assetClass: body.assetClass }).returning();
    await audit(tx, ctx, { action: 'fund.created', entity: 'fund', entityId: row.id, after: { name: row.name, assetClass: row.assetClass } });
    return row;
  });
}

export async function updateFund(db: DbOrTx, ctx: ServiceContext, id: string, body: { name?: string; assetClass?: string }): Promise<FundRow> {
  const schemeId = schemeOf(ctx);
  return db.transaction(async (tx) => {
    const [before] = await tx.select().from(funds).where(and(eq(funds.id, id), eq(funds.schemeId, schemeId))).for('update');
    if (!before) throw notFound('No such fund in this scheme.');
    if (body.name && (await nameTaken(tx, schemeId, body.name, id))) throw conflict(`This scheme already has a fund called "${body.name}".`);
    const [row] = await tx.update(funds).set(body).where(eq(funds.id, id)).returning();
    await audit(tx, ctx, { action: 'fund.updated', entity: 'fund', entityId: id, before: { name: before.name, assetClass: before.assetClass }, after: { name: row.name, assetClass: row.assetClass } });
    return row;
  });
}

/** Removes a fund no assumption set and no default option refers to. */
export async function deleteFund(db: DbOrTx, ctx: ServiceContext, id: string): Promise<void> {
  const schemeId = schemeOf(ctx);
  await db.transaction(async (tx) => {
    const [before] = await tx.select().from(funds).where(and(eq(funds.id, id), eq(funds.schemeId, schemeId))).for('update');
    if (!before) throw notFound('No such fund in this scheme.');
    const [inSets] = await tx.select({ n: sql<number>`count(*)::int` }).from(fundAssumptions).where(eq(fundAssumptions.fundId, id));
    // Every version counts: an approved version is a record and must keep reading the same.
    const options = await tx.select({ name: optionVersions.name, glidePath: optionVersions.glidePath }).from(optionVersions).where(eq(optionVersions.schemeId, schemeId));
    const usedBy = [...new Set(options.filter((o) => o.glidePath.some((p) => (p.weights[id] ?? 0) > 0)).map((o) => o.name))];
    if (inSets.n > 0 || usedBy.length) {
      const why = [inSets.n > 0 ? `${inSets.n} assumption set${inSets.n === 1 ? '' : 's'}` : '', usedBy.length ? `the option${usedBy.length === 1 ? '' : 's'} ${usedBy.map((n) => `"${n}"`).join(', ')}` : '']
        .filter(Boolean)
        .join(' and ');
      throw conflict(`"${before.name}" is used by ${why}, so it cannot be removed.`);
    }
    await tx.delete(funds).where(eq(funds.id, id));
    await audit(tx, ctx, { action: 'fund.removed', entity: 'fund', entityId: id, before: { name: before.name, assetClass: before.assetClass } });
  });
}
