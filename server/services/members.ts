import { and, asc, eq } from 'drizzle-orm';
import { schemeOf, type ServiceContext } from './context';
import type { DbOrTx } from '../../db/client';
import { illustrativeMembers } from '../../db/schema';
import { notFound } from '../errors';
import { audit } from './audit';

export type IllustrativeInput = { label: string; age: number; retirementAge: number; salary: number; salaryGrowth: number | null; contributionRate: number; pot: number };
export type IllustrativeRow = typeof illustrativeMembers.$inferSelect;

const snapshot = ({ label, age, retirementAge, salary, salaryGrowth, contributionRate, pot }: IllustrativeInput) => ({ label, age, retirementAge, salary, salaryGrowth, contributionRate, pot });

export async function listIllustrative(db: DbOrTx, schemeId: string): Promise<IllustrativeRow[]> {
  return db.select().from(illustrativeMembers).where(eq(illustrativeMembers.schemeId, schemeId)).orderBy(asc(illustrativeMembers.age), asc(illustrativeMembers.label));
}

export async function createIllustrative(db: DbOrTx, ctx: ServiceContext, input: IllustrativeInput): Promise<IllustrativeRow> {
  return db.transaction(async (tx) => {
    const [row] = await tx.insert(illustrativeMembers).values({ ...input, schemeId: schemeOf(ctx) }).returning();
    await audit(tx, ctx, { action: 'illustrative-member.created', entity: 'illustrative_member', entityId: row.id, after: snapshot(row) });
    return row;
  });
}

export async function updateIllustrative(db: DbOrTx, ctx: ServiceContext, id: string, input: IllustrativeInput): Promise<IllustrativeRow> {
  return db.transaction(async (tx) => {
    const where = and(eq(illustrativeMembers.id, id), eq(illustrativeMembers.schemeId, schemeOf(ctx)));
    const [before] = await tx.select().from(illustrativeMembers).where(where).for('update');
    if (!before) throw notFound('No such illustrative member in this scheme.');
    const [row] = await tx.update(illustrativeMembers).set(input).where(where).returning();
    await audit(tx, ctx, { action: 'illustrative-member.updated', entity: 'illustrative_member', entityId: id, before: snapshot(before), after: snapshot(row) });
    return row;
  });
}

export async function deleteIllustrative(db: DbOrTx, ctx: ServiceContext, id: string): Promise<void> {
  await db.transaction(async (tx) => {
    const [before] = await tx.delete(illustrativeMembers).where(and(eq(illustrativeMembers.id, id), eq(illustrativeMembers.schemeId, schemeOf(ctx)))).returning();
    if (!before) throw notFound('No such illustrative member in this scheme.');
    await audit(tx, ctx, { action: 'illustrative-member.removed', entity: 'illustrative_member', entityId: id, before: snapshot(before) });
  });
}
