import { createHash } from 'node:crypto';
import { schemeOf, type ServiceContext } from './context';
import { asc, eq, sql } from 'drizzle-orm';
import { createInsertSchema } from 'drizzle-zod';
import { z } from 'zod';
import type { DbOrTx } from '../../db/client';
import { schemeMembers } from '../../db/schema';
import { CsvProblems, numberCell, readCsv } from '../uploads';
import { audit } from './audit';

/** CSV headings (case-insensitive, any order) and the row fields they fill. */
export const MEMBERSHIP_COLUMNS = {
  reference: 'reference',
  age: 'age',
  salary: 'salary',
  pot: 'pot',
  contribution_rate: 'contributionRate',
  retirement_age: 'retirementAge',
} as const;
type Heading = keyof typeof MEMBERSHIP_COLUMNS;
const FIELD_TO_HEADING = Object.fromEntries(Object.entries(MEMBERSHIP_COLUMNS).map(([h, f]) => [f, h])) as Record<string, Heading>;

/** One membership record, derived from the table and tightened for uploads. */
export const MembershipRow = createInsertSchema(schemeMembers)
  .pick({ reference: true, age: true, salary: true, pot: true, contributionRate: true, retirementAge: true })
  .extend({
    reference: z
      .string()
      .min(1, 'is empty')
      .max(64, 'must be at most 64 characters')
      .regex(/^[A-Za-z0-9._\-/]+$/, 'may hold only letters, digits and . _ - / (a pseudonymous reference, not a name)')
      // A cell starting with - = + @ is read as a formula by spreadsheets (CSV injection).
      .regex(/^[A-Za-z0-9]/, 'must start with a letter or digit (a leading - = + @ would be read as a formula by spreadsheets)'),
    age: z.number().int('must be a whole number of years').min(16, 'must be at least 16').max(99, 'must be at most 99'),
    salary: z.number().min(0, 'must not be negative').max(10_000_000, 'is implausibly large (over 10,000,000)'),
    pot: z.number().min(0, 'must not be negative').max(100_000_000, 'is implausibly large (over 100,000,000)'),
    contributionRate: z.number().min(0, 'must not be negative').max(1, 'must be a fraction of salary (0.08 = 8%) or written with a % sign'),
    retirementAge: z.number().int('must be a whole number of years').min(50, 'must be at least 50').max(80, 'must be at most 80'),
  })
  .superRefine((r, ctx) => {
    if (r.retirementAge <= r.age) ctx.addIssue({ code: 'custom', path: ['retirementAge'], message: `must be above age (${r.age})` });
  });
export type MembershipRowT = z.output<typeof MembershipRow>;

/** Parses and checks every row; throws a 400 listing each bad line, or returns the rows. */
export async function parseMembershipCsv(buffer: Buffer): Promise<MembershipRowT[]> {
  const problems = new CsvProblems();
  const rows: MembershipRowT[] = [];
  const seen = new Map<string, number>();
  let index: Partial<Record<Heading, number>> = {};
  await readCsv(
    buffer,
    problems,
    (header) => {
      index = {};
      header.forEach((h, i) => {
        const key = h.trim().toLowerCase().replace(/[\s-]+/g, '_') as Heading;
        if (key in MEMBERSHIP_COLUMNS) {
          if (index[key] !== undefined) problems.add(1, h, 'appears twice');
          index[key] = i;
        } else problems.add(1, h || `column ${i + 1}`, `is not a known column (expected ${Object.keys(MEMBERSHIP_COLUMNS).join(', ')})`);
      });
      for (const h of Object.keys(MEMBERSHIP_COLUMNS) as Heading[]) if (index[h] === undefined) problems.add(1, h, 'column is missing');
    },
    (cells, line) => {
      if (Object.keys(index).length < Object.keys(MEMBERSHIP_COLUMNS).length) return; // header already reported
      const raw: Record<string, unknown> = { reference: (cells[index.reference!] ?? '').trim() };
      let ok = true;
      for (const h of ['age', 'salary', 'pot', 'contribution_rate', 'retirement_age'] as const) {
        const v = numberCell(cells[index[h]!] ?? '', { percent: h === 'contribution_rate' });
        if (typeof v === 'string') {
          problems.add(line, h, v);
          ok = false;
        } else raw[MEMBERSHIP_COLUMNS[h]] = v;
      }
      if (!ok) return;
      const parsed = MembershipRow.safeParse(raw);
      if (!parsed.success) {
        for (const issue of parsed.error.issues) problems.add(line, FIELD_TO_HEADING[String(issue.path[0])] ?? String(issue.path[0]), issue.message);
        return;
      }
      const earlier = seen.get(parsed.data.reference.toLowerCase());
      if (earlier) {
        problems.add(line, 'reference', `"${parsed.data.reference}" repeats line ${earlier}`);
        return;
      }
      seen.set(parsed.data.reference.toLowerCase(), line);
      rows.push(parsed.data);
    },
  );
  if (!problems.any && rows.length === 0) problems.add(2, '', 'the file has a heading but no members');
  if (problems.any) throw problems.toError();
  return rows;
}

/** Rows per INSERT: 6 parameters a row keeps well under PostgreSQL's 65,535 bind parameters. */
const BATCH = 2000;

/**
 * Replace-all: the upload becomes the scheme's whole membership. One transaction deletes the
 * old records and inserts the new ones in batches, with one audit event; any failure leaves
 * the old membership untouched.
 */
export async function replaceMembership(db: DbOrTx, ctx: ServiceContext, rows: MembershipRowT[], file: { name: string; buffer: Buffer }) {
  const schemeId = schemeOf(ctx);
  const sha256 = createHash('sha256').update(file.buffer).digest('hex');
  return db.transaction(async (tx) => {
    const [before] = await tx.select({ n: sql<number>`count(*)::int` }).from(schemeMembers).where(eq(schemeMembers.schemeId, schemeId));
    await tx.delete(schemeMembers).where(eq(schemeMembers.schemeId, schemeId));
    const uploadedAt = new Date();
    for (let i = 0; i < rows.length; i += BATCH) {
      await tx.insert(schemeMembers).values(rows.slice(i, i + BATCH).map((r) => ({ ...r, schemeId, uploadedAt })));
    }
    await audit(tx, ctx, { action: 'membership.replaced', entity: 'membership', entityId: schemeId, before: { count: before.n }, after: { count: rows.length, fileName: file.name, sha256 } });
    return { count: rows.length, replaced: before.n, uploadedAt };
  });
}

export type MembershipSummary = {
  count: number;
  uploadedAt: string | null;
  ages: { band: string; count: number }[];
  totals: { salary: number; pot: number };
  medians: { age: number | null; salary: number | null; pot: number | null; contributionRate: number | null };
  rows: (MembershipRowT & { id: number })[];
  offset: number;
  limit: number;
};

/** Headline figures of the uploaded membership and one page of records. */
export async function membershipSummary(db: DbOrTx, schemeId: string, page: { offset: number; limit: number }): Promise<MembershipSummary> {
  const [agg] = await db
    .select({
      count: sql<number>`count(*)::int`,
      uploadedAt: sql<string | null>`max(${schemeMembers.uploadedAt})`,
      salary: sql<number>`coalesce(sum(${schemeMembers.salary}), 0)::float8`,
      pot: sql<number>`coalesce(sum(${schemeMembers.pot}), 0)::float8`,
      age: sql<number | null>`percentile_cont(0.5) within group (order by ${schemeMembers.age})::float8`,
      medianSalary: sql<number | null>`percentile_cont(0.5) within group (order by ${schemeMembers.salary})::float8`,
      medianPot: sql<number | null>`percentile_cont(0.5) within group (order by ${schemeMembers.pot})::float8`,
      medianRate: sql<number | null>`percentile_cont(0.5) within group (order by ${schemeMembers.contributionRate})::float8`,
    })
    .from(schemeMembers)
    .where(eq(schemeMembers.schemeId, schemeId));
  const bands = await db
    .select({ lo: sql<number>`(least(${schemeMembers.age}, 69) / 10 * 10)::int`, count: sql<number>`count(*)::int` })
    .from(schemeMembers)
    .where(eq(schemeMembers.schemeId, schemeId))
    .groupBy(sql`1`)
    .orderBy(sql`1`);
  const rows = await db
    .select({ id: schemeMembers.id, reference: schemeMembers.reference, age: schemeMembers.age, salary: schemeMembers.salary, pot: schemeMembers.pot, contributionRate: schemeMembers.contributionRate, retirementAge: schemeMembers.retirementAge })
    .from(schemeMembers)
    .where(eq(schemeMembers.schemeId, schemeId))
    .orderBy(asc(schemeMembers.reference))
    .offset(page.offset)
    .limit(page.limit);
  return {
    count: agg.count,
    uploadedAt: agg.uploadedAt ? new Date(agg.uploadedAt).toISOString() : null,
    ages: bands.map((b) => ({ band: b.lo >= 60 ? '60+' : `${b.lo}–${b.lo + 9}`, count: b.count })),
    totals: { salary: agg.salary, pot: agg.pot },
    medians: { age: agg.age, salary: agg.medianSalary, pot: agg.medianPot, contributionRate: agg.medianRate },
    rows,
    offset: page.offset,
    limit: page.limit,
  };
}
