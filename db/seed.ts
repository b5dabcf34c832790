/**
 * The invented demo scheme. Every name, person and figure here is made up for
 * demonstration; the assumptions are plausible, not advice.
 */
import seedrandom from 'seedrandom';
import { sql } from 'drizzle-orm';
import { createDb, type Db } from './client';
import {
  approvals,
  assumptionSets,
  defaultOptions,
  optionVersions,
  schemeSettings,
  fundAssumptions,
  funds,
  illustrativeMembers,
  schemeMembers,
  schemeRoles,
  schemes,
  users,
  type GlidePathPoint,
  type Role,
} from './schema';

/** Demo only: these sign-ins exist in the demo database and nowhere else. */
export const DEMO_PASSWORD = 'keelson-demo-2026';
/**
 * The demo password's hash, in the server's `scrypt$N$r$p$salt$hash` form (server/auth/password.ts),
 * made once: the seed stays free of server code and needs no scrypt work per test database.
 * tests/unit/seed.test.ts checks that the server accepts it.
 */
export const DEMO_PASSWORD_HASH = 'scrypt$32768$8$1$yvjvDu+x8lt8fJnUYXogTA==$7UgPGywgTWVkakXOAQW3+46XkPpjXboAHQSnQOyrsjI=';
export const DEMO_USERS: { email: string; displayName: string; role: Role }[] = [
  { email: 'admin@fernleigh.example', displayName: 'Morag Tennant', role: 'administrator' },
  { email: 'trustee@fernleigh.example', displayName: 'Idris Pellow', role: 'trustee' },
  { email: 'actuary@fernleigh.example', displayName: 'Sunniva Achterberg', role: 'actuary' },
  { email: 'comms@fernleigh.example', displayName: 'Taran Whitlock', role: 'communications' },
  { email: 'board@fernleigh.example', displayName: 'Orla Brennock', role: 'board' },
];
/**
 * A second trustee, so that four-eyes approval can be shown: one trustee edits, the other approves.
 * Kept apart from DEMO_USERS, which holds one sign-in per role.
 */
export const DEMO_SECOND_TRUSTEE = { email: 'trustee2@fernleigh.example', displayName: 'Ninian Castellow', role: 'trustee' as Role };
/** The demo option marked as the scheme's current default. */
export const DEMO_CURRENT_DEFAULT = 'Balanced lifecycle';
export const DEMO_SCHEME_NAME = 'Fernleigh Mills Staff Pension Plan';
export const SECOND_SCHEME_NAME = 'Brackenfold Cooperative Savings Plan';

type FundSeed = { key: string; name: string; assetClass: string; m: number; s: number; c: number };
const FUNDS: FundSeed[] = [
  { key: 'EQ', name: 'Fernleigh Global Equity', assetClass: 'Listed equities, developed and emerging markets', m: 0.07, s: 0.16, c: 0.002 },
  { key: 'DG', name: 'Fernleigh Diversified Growth', assetClass: 'Multi-asset: equities, property, infrastructure, credit', m: 0.055, s: 0.1, c: 0.0045 },
  { key: 'CB', name: 'Fernleigh Corporate Bond', assetClass: 'Investment-grade corporate bonds', m: 0.04, s: 0.07, c: 0.0015 },
  { key: 'IL', name: 'Fernleigh Index-Linked Bond', assetClass: 'Inflation-linked government bonds', m: 0.035, s: 0.08, c: 0.0012 },
  { key: 'CA', name: 'Fernleigh Cash Reserve', assetClass: 'Money-market deposits', m: 0.03, s: 0.01, c: 0.001 },
];
// Correlations in the order of FUNDS (positive definite; checked by the engine's validator in tests).
const CORRELATIONS = [
  [1, 0.8, 0.3, 0.1, 0],
  [0.8, 1, 0.5, 0.3, 0.05],
  [0.3, 0.5, 1, 0.6, 0.1],
  [0.1, 0.3, 0.6, 1, 0.05],
  [0, 0.05, 0.1, 0.05, 1],
];

type OptionSeed = { name: string; description: string; path: { ytr: number; w: Record<string, number> }[] };
const OPTIONS: OptionSeed[] = [
  {
    name: 'Long-horizon growth',
    description: 'All in global equity until 15 years from retirement, then a steady move to a growth-and-bond mix.',
    path: [
      { ytr: 15, w: { EQ: 1 } },
      { ytr: 0, w: { EQ: 0.5, DG: 0.25, CB: 0.25 } },
    ],
  },
  {
    name: 'Balanced lifecycle',
    description: 'Equity and diversified growth while young, moving over twenty years into bonds, index-linked and cash.',
    path: [
      { ytr: 20, w: { EQ: 0.7, DG: 0.3 } },
      { ytr: 10, w: { EQ: 0.4, DG: 0.4, CB: 0.2 } },
      { ytr: 0, w: { DG: 0.25, CB: 0.35, IL: 0.25, CA: 0.15 } },
    ],
  },
  {
    name: 'Cautious glide',
    description: 'A moderate mix throughout, de-risking early into bonds and cash.',
    path: [
      { ytr: 25, w: { EQ: 0.5, DG: 0.3, CB: 0.2 } },
      { ytr: 5, w: { DG: 0.3, CB: 0.4, IL: 0.3 } },
      { ytr: 0, w: { CB: 0.4, IL: 0.35, CA: 0.25 } },
    ],
  },
  {
    name: 'Single multi-asset fund',
    description: 'The diversified growth fund alone, with no change as retirement nears.',
    path: [{ ytr: 0, w: { DG: 1 } }],
  },
];

const MEMBERS = [
  { label: 'Early career', age: 25, retirementAge: 67, salary: 27000, contributionRate: 0.08, pot: 3000 },
  { label: 'Mid career', age: 42, retirementAge: 67, salary: 41000, contributionRate: 0.1, pot: 48000 },
  { label: 'Late career', age: 57, retirementAge: 66, salary: 52000, contributionRate: 0.12, pot: 165000 },
];

export async function isEmpty(db: Db): Promise<boolean> {
  const r = await db.execute(sql`select count(*)::int as n from users`);
  return Number((r.rows[0] as { n: number }).n) === 0;
}

/** Seeds the demo scheme in one transaction. Returns the scheme id. */
export async function seedDemo(db: Db, opts: { memberCount?: number } = {}): Promise<{ schemeId: string; secondSchemeId: string }> {
  const passwordHash = DEMO_PASSWORD_HASH;
  return db.transaction(async (tx) => {
    const [scheme] = await tx.insert(schemes).values({ name: DEMO_SCHEME_NAME, currency: 'GBP' }).returning();
    const [second] = await tx.insert(schemes).values({ name: SECOND_SCHEME_NAME, currency: 'GBP' }).returning();
    const everyone = [...DEMO_USERS, DEMO_SECOND_TRUSTEE];
    const created = await tx
      .insert(users)
      .values(everyone.map((u) => ({ email: u.email, displayName: u.displayName, passwordHash })))
      .returning();
    await tx.insert(schemeRoles).values(created.map((u, i) => ({ userId: u.id, schemeId: scheme.id, role: everyone[i].role })));
    // The advisory actuary serves a second scheme too; the administrator there is the same person as here.
    const actuary = created.find((u) => u.email === 'actuary@fernleigh.example')!;
    await tx.insert(schemeRoles).values({ userId: actuary.id, schemeId: second.id, role: 'actuary' });

    const fundRows = await tx
      .insert(funds)
      .values(FUNDS.map((f) => ({ schemeId: scheme.id, name: f.name, assetClass: f.assetClass })))
      .returning();
    const idOf = Object.fromEntries(FUNDS.map((f, i) => [f.key, fundRows[i].id]));
    const trustee = created.find((u) => u.email === 'trustee@fernleigh.example')!;
    const secondTrustee = created.find((u) => u.email === DEMO_SECOND_TRUSTEE.email)!;
    const [set] = await tx
      .insert(assumptionSets)
      .values({
        schemeId: scheme.id,
        version: 1,
        status: 'approved',
        setAt: '2026-09-30',
        rationale: 'Demo assumptions for an invented scheme: long-run returns net of nothing, before charges.',
        inflation: 0.025,
        salaryGrowth: 0.03,
        annuityRealRate: 0.01,
        annuityYears: 25,
        fundOrder: fundRows.map((f) => f.id),
        correlations: CORRELATIONS,
        createdBy: actuary.id,
        updatedBy: actuary.id,
        approvedBy: trustee.id,
        approvedAt: new Date('2026-10-14T10:00:00Z'),
      })
      .returning();
    await tx.insert(approvals).values({ schemeId: scheme.id, assumptionSetId: set.id, userId: trustee.id, approverName: trustee.displayName, at: set.approvedAt! });
    await tx.insert(fundAssumptions).values(
      FUNDS.map((f, i) => ({ assumptionSetId: set.id, fundId: fundRows[i].id, expectedReturn: f.m, volatility: f.s, annualCharge: f.c })),
    );
    // Each option as its approved version 1: drafted by one trustee, approved by the other (four eyes).
    const optionRows = await tx
      .insert(defaultOptions)
      .values(OPTIONS.map(() => ({ schemeId: scheme.id })))
      .returning();
    const approvedAt = new Date('2026-10-21T09:30:00Z');
    const versionRows = await tx
      .insert(optionVersions)
      .values(
        OPTIONS.map((o, i) => ({
          optionId: optionRows[i].id,
          schemeId: scheme.id,
          version: 1,
          status: 'approved' as const,
          name: o.name,
          description: o.description,
          glidePath: o.path.map<GlidePathPoint>((p) => ({
            yearsToRetirement: p.ytr,
            weights: Object.fromEntries(Object.entries(p.w).map(([k, v]) => [idOf[k], v])),
          })),
          createdBy: trustee.id,
          updatedBy: trustee.id,
          approvedBy: secondTrustee.id,
          approvedAt,
        })),
      )
      .returning();
    await tx.insert(approvals).values(versionRows.map((v) => ({ schemeId: scheme.id, optionVersionId: v.id, userId: secondTrustee.id, approverName: secondTrustee.displayName, at: approvedAt })));
    await tx.insert(schemeSettings).values({
      schemeId: scheme.id,
      currentDefaultOptionId: optionRows[OPTIONS.findIndex((o) => o.name === DEMO_CURRENT_DEFAULT)].id,
      nextReviewDue: '2027-03-31',
    });
    await tx.insert(illustrativeMembers).values(MEMBERS.map((m) => ({ ...m, schemeId: scheme.id })));

    const rng = seedrandom('fernleigh-demo-membership');
    const count = opts.memberCount ?? 320;
    const rows = Array.from({ length: count }, (_, i) => {
      const age = 20 + Math.floor(rng() * 45);
      const salary = Math.round(19000 + rng() * 48000 + (age - 20) * 350);
      return {
        schemeId: scheme.id,
        reference: `FM-${String(10001 + i)}`,
        age,
        salary,
        pot: Math.round(Math.max(0, (age - 21) * salary * 0.09 * (0.6 + rng() * 0.8))),
        contributionRate: [0.08, 0.1, 0.12, 0.15][Math.floor(rng() * 4)],
        retirementAge: age >= 60 ? 68 : [65, 66, 67, 68][Math.floor(rng() * 4)],
      };
    });
    await tx.insert(schemeMembers).values(rows);
    return { schemeId: scheme.id, secondSchemeId: second.id };
  });
}

if (require.main === module) {
  (async () => {
    const { db, pool } = createDb();
    try {
      if (await isEmpty(db)) {
        await seedDemo(db);
        console.log('keelson: demo scheme seeded');
      } else {
        console.log('keelson: database already has data; demo seed skipped');
      }
    } finally {
      await pool.end();
    }
  })().catch((err) => {
    console.error('keelson: seeding failed:', err);
    process.exit(1);
  });
}
