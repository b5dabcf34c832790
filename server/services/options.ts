import { and, asc, eq, sql } from 'drizzle-orm';
import { schemeOf, type ServiceContext } from './context';
import type { DbOrTx } from '../../db/client';
import { defaultOptions, type GlidePathPoint } from '../../db/schema';
import { conflict, notFound } from '../errors';
import { audit } from './audit';
import { assertSchemeFunds } from './funds';

export type OptionInput = { name: string; description: string; glidePath: GlidePathPoint[] };
export type OptionRow = typeof defaultOptions.$inferSelect;

const snapshot = (o: OptionInput | OptionRow) => ({ name: o.name, description: o.description, glidePath: o.glidePath });

/** Points sorted from furthest to nearest retirement, with zero weights dropped. */
function normalise(path: GlidePathPoint[]): GlidePathPoint[] {
  return [...path]
    .sort((a, b) => b.yearsToRetirement - a.yearsToRetirement)
    .map((p) => ({ yearsToRetirement: p.yearsToRetirement, weights: Object.fromEntries(Object.entries(p.weights).filter(([, w]) => w > 0)) }));
}

async function checkFunds(db: DbOrTx, schemeId: string, input: OptionInput) {
  const ids: string[] = [];
  const paths: string[] = [];
  input.glidePath.forEach((p, i) => Object.keys(p.weights).forEach((fid) => (ids.push(fid), paths.push(`glidePath.${i}.weights.${fid}`))));
  await assertSchemeFunds(db, schemeId, ids, paths);
}

async function nameTaken(db: DbOrTx, schemeId: string, name: string, exceptId?: string) {
  const rows = await db.select({ id: defaultOptions.id }).from(defaultOptions).where(and(eq(defaultOptions.schemeId, schemeId), sql`lower(${defaultOptions.name}) = lower(${name})`, eq(defaultOptions.archived, false)));
  return rows.some((r) => r.id !== exceptId);
}

export async function listOptions(db: DbOrTx, schemeId: string, includeArchived: boolean): Promise<OptionRow[]> {
  return db
    .select()
    .from(defaultOptions)
    .where(and(eq(defaultOptions.schemeId, schemeId), includeArchived ? undefined : eq(defaultOptions.archived, false)))
    .orderBy(asc(defaultOptions.archived), asc(defaultOptions.createdAt), asc(defaultOptions.name));
}

export async function getOption(db: DbOrTx, schemeId: string, id: string): Promise<OptionRow> {
  const [row] = await db.select().from(defaultOptions).where(and(eq(defaultOptions.id, id), eq(defaultOptions.schemeId, schemeId)));
  if (!row) throw notFound('No such default option in this scheme.');
  return row;
}

export async function createOption(db: DbOrTx, ctx: ServiceContext, input: OptionInput): Promise<OptionRow> {
  const schemeId = schemeOf(ctx);
  await checkFunds(db, schemeId, input);
  return db.transaction(async (tx) => {
    if (await nameTaken(tx, schemeId, input.name)) throw conflict(`There is already an option called "${input.name}".`);
    const [row] = await tx.insert(defaultOptions).values({ schemeId, name: input.name, description: input.description, glidePath: normalise(input.glidePath) }).returning();
    await audit(tx, ctx, { action: 'option.created', entity: 'default_option', entityId: row.id, after: snapshot(row) });
    return row;
  });
}

export async function updateOption(db: DbOrTx, ctx: ServiceContext, id: string, input: OptionInput): Promise<OptionRow> {
  const schemeId = schemeOf(ctx);
  return db.transaction(async (tx) => {
    const [before] = await tx.select().from(defaultOptions).where(and(eq(defaultOptions.id, id), eq(defaultOptions.schemeId, schemeId))).for('update');
    if (!before) throw notFound('No such default option in this scheme.');
    await checkFunds(tx, schemeId, input);
    if (await nameTaken(tx, schemeId, input.name, id)) throw conflict(`There is already an option called "${input.name}".`);
    const [row] = await tx
      .update(defaultOptions)
      .set({ name: input.name, description: input.description, glidePath: normalise(input.glidePath), updatedAt: new Date() })
      .where(eq(defaultOptions.id, id))
      .returning();
    await audit(tx, ctx, { action: 'option.updated', entity: 'default_option', entityId: id, before: snapshot(before), after: snapshot(row) });
    return row;
  });
}

/** Archives (or restores) an option: past runs keep their own snapshot, so nothing is deleted. */
export async function setArchived(db: DbOrTx, ctx: ServiceContext, id: string, archived: boolean): Promise<OptionRow> {
  const schemeId = schemeOf(ctx);
  return db.transaction(async (tx) => {
    const [before] = await tx.select().from(defaultOptions).where(and(eq(defaultOptions.id, id), eq(defaultOptions.schemeId, schemeId))).for('update');
    if (!before) throw notFound('No such default option in this scheme.');
    if (!archived && (await nameTaken(tx, schemeId, before.name, id))) throw conflict(`An active option is already called "${before.name}"; rename one first.`);
    const [row] = await tx.update(defaultOptions).set({ archived, updatedAt: new Date() }).where(eq(defaultOptions.id, id)).returning();
    await audit(tx, ctx, { action: archived ? 'option.archived' : 'option.restored', entity: 'default_option', entityId: id, before: { archived: before.archived }, after: { archived } });
    return row;
  });
}
