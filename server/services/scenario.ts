import { and, desc, eq, inArray } from 'drizzle-orm';
import type { DbOrTx } from '../../db/client';
import { assumptionSets, defaultOptions, fundAssumptions, funds, illustrativeMembers, optionVersions } from '../../db/schema';
import { FORMAT_TWO_DEFAULTS, validateScenario, type ScenarioInput, type Stress } from '../../simulation';
import { badRequest } from '../errors';

/** What a trustee chooses for a run; the rest comes from the scheme's stored data. */
export type ScenarioChoice = {
  assumptionSetId: string;
  optionIds: string[];
  memberIds: string[];
  paths: number;
  seed: number;
  riskAversion: number;
  targetReplacementRatio: number;
  stress?: Stress;
  /** A version to use instead of an option's newest approved one (a draft, or an older version), by option id. */
  optionVersions?: Record<string, string>;
};

/** Labels and provenance kept next to the engine input, so a run reads the same after the data changes. */
export type ScenarioSnapshot = {
  assumptionSet: { id: string; version: number; status: 'draft' | 'approved'; setAt: string; approvedAt: string | null };
  funds: { id: string; name: string }[];
  /**
   * The engine's option ids are the options' ids; the version each ran as is named beside it.
   * Runs made before options were versioned have no versionId, version or status.
   */
  options: { id: string; name: string; description: string; versionId?: string; version?: number; status?: 'draft' | 'approved' }[];
  members: { id: string; label: string; age: number; retirementAge: number; salary: number; pot: number; contributionRate: number }[];
  /** The engine input exactly as run (stress removed: the worker runs it with and without). */
  scenario: ScenarioInput;
  stress: Stress | null;
};

/**
 * Builds the engine scenario from the database, reading only rows of `schemeId`: an id of
 * another scheme is reported as unknown (400 naming the field), never used.
 *
 * - funds: every fund of the assumption set, in the set's fund_order (the correlation
 *   matrix's order), with its expected return, volatility and charge;
 * - options: their glide paths, weights keyed by fund id;
 * - members: salary growth from the member where set, else the set's;
 * - inflation and annuity terms from the set; target replacement ratio from the request.
 */
export async function buildScenario(db: DbOrTx, schemeId: string, choice: ScenarioChoice): Promise<ScenarioSnapshot> {
  const [set] = await db
    .select()
    .from(assumptionSets)
    .where(and(eq(assumptionSets.id, choice.assumptionSetId), eq(assumptionSets.schemeId, schemeId)));
  if (!set) throw badRequest('Some fields are not valid.', [{ path: 'assumptionSetId', message: 'is not an assumption set of this scheme' }]);

  const fundRows = await db
    .select({ id: funds.id, name: funds.name, expectedReturn: fundAssumptions.expectedReturn, volatility: fundAssumptions.volatility, annualCharge: fundAssumptions.annualCharge })
    .from(fundAssumptions)
    .innerJoin(funds, eq(funds.id, fundAssumptions.fundId))
    .where(and(eq(fundAssumptions.assumptionSetId, set.id), eq(funds.schemeId, schemeId)));
  const byId = new Map(fundRows.map((f) => [f.id, f]));
  const missing = set.fundOrder.filter((id) => !byId.has(id));
  if (missing.length) {
    throw badRequest('The assumption set is incomplete.', [{ path: 'assumptionSetId', message: `has no assumptions for ${missing.length} of its funds; complete it before running` }]);
  }
  const orderedFunds = set.fundOrder.map((id) => byId.get(id)!);

  const { found: optionRows, wrongVersions } = await optionVersionsFor(db, schemeId, choice);
  const memberRows = await db
    .select()
    .from(illustrativeMembers)
    .where(and(eq(illustrativeMembers.schemeId, schemeId), inArray(illustrativeMembers.id, choice.memberIds)));
  const issues: { path: string; message: string }[] = [];
  choice.optionIds.forEach((id, i) => {
    if (wrongVersions.includes(id)) issues.push({ path: `optionVersions.${id}`, message: 'is not a version of this option' });
    else if (!optionRows.some((o) => o.id === id)) issues.push({ path: `optionIds.${i}`, message: 'is not a default option of this scheme' });
  });
  for (const optionId of Object.keys(choice.optionVersions ?? {})) {
    if (!choice.optionIds.includes(optionId)) issues.push({ path: `optionVersions.${optionId}`, message: 'names an option that is not among optionIds' });
  }
  choice.memberIds.forEach((id, i) => {
    if (!memberRows.some((m) => m.id === id)) issues.push({ path: `memberIds.${i}`, message: 'is not an illustrative member of this scheme' });
  });
  if (choice.stress && !byId.has(choice.stress.fundId)) issues.push({ path: 'stress.fundId', message: 'is not a fund of this assumption set' });
  if (issues.length) throw badRequest('Some fields are not valid.', issues);

  // Keep the order the trustee chose.
  const options = choice.optionIds.map((id) => optionRows.find((o) => o.id === id)!);
  const members = choice.memberIds.map((id) => memberRows.find((m) => m.id === id)!);

  // New runs use scenario format 2 with its default conventions, recorded in the snapshot.
  const scenario: ScenarioInput = {
    version: 2,
    ...structuredClone(FORMAT_TWO_DEFAULTS),
    seed: choice.seed,
    paths: choice.paths,
    antithetic: false,
    inflation: set.inflation,
    funds: orderedFunds.map((f) => ({ id: f.id, name: f.name, expectedReturn: f.expectedReturn, volatility: f.volatility, annualCharge: f.annualCharge })),
    correlations: set.correlations,
    options: options.map((o) => ({ id: o.id, name: o.name, glidePath: o.glidePath.map((p) => ({ yearsToRetirement: p.yearsToRetirement, weights: { ...p.weights } })) })),
    members: members.map((m) => ({
      id: m.id,
      age: m.age,
      retirementAge: m.retirementAge,
      salary: m.salary,
      salaryGrowth: m.salaryGrowth ?? set.salaryGrowth,
      contributionRate: m.contributionRate,
      pot: m.pot,
    })),
    riskAversion: choice.riskAversion,
    targetReplacementRatio: choice.targetReplacementRatio,
    annuity: { realRate: set.annuityRealRate, years: set.annuityYears },
  };

  // The engine's own validator has the last word (glide paths naming funds outside the set, a
  // matrix that is not a correlation matrix, …); its field paths are prefixed so the answer says where.
  const checked = validateScenario(choice.stress ? { ...scenario, stress: choice.stress } : scenario);
  if (!checked.ok) {
    throw badRequest(
      'The stored scheme data does not make a valid projection.',
      checked.issues.map((i) => ({ path: describeEnginePath(i.path), message: i.message })),
    );
  }

  return {
    assumptionSet: { id: set.id, version: set.version, status: set.status, setAt: set.setAt, approvedAt: set.approvedAt?.toISOString() ?? null },
    funds: orderedFunds.map((f) => ({ id: f.id, name: f.name })),
    options: options.map((o) => ({ id: o.id, name: o.name, description: o.description, versionId: o.versionId, version: o.version, status: o.status })),
    members: members.map((m) => ({ id: m.id, label: m.label, age: m.age, retirementAge: m.retirementAge, salary: m.salary, pot: m.pot, contributionRate: m.contributionRate })),
    scenario,
    stress: choice.stress ?? null,
  };
}

/**
 * The version each chosen option runs as: the one named in `optionVersions`, else its newest
 * approved version, else (an option never approved yet) its newest draft. Options of other
 * schemes are left out; a named version that is not the option's is listed in `wrongVersions`.
 */
async function optionVersionsFor(db: DbOrTx, schemeId: string, choice: ScenarioChoice) {
  const rows = await db
    .select({ option: defaultOptions.id, v: optionVersions })
    .from(defaultOptions)
    .innerJoin(optionVersions, eq(optionVersions.optionId, defaultOptions.id))
    .where(and(eq(defaultOptions.schemeId, schemeId), inArray(defaultOptions.id, choice.optionIds)))
    .orderBy(desc(optionVersions.version));
  const wrongVersions: string[] = [];
  const found = choice.optionIds.flatMap((id) => {
    const vs = rows.filter((r) => r.option === id).map((r) => r.v);
    const named = choice.optionVersions?.[id];
    const v = named ? vs.find((x) => x.id === named) : (vs.find((x) => x.status === 'approved') ?? vs[0]);
    if (vs.length && !v) wrongVersions.push(id);
    return v ? [{ id, versionId: v.id, version: v.version, status: v.status, name: v.name, description: v.description, glidePath: v.glidePath }] : [];
  });
  return { found, wrongVersions };
}

/** Maps an engine path (options.2.glidePath…) to the request field it came from (optionIds.2: …). */
function describeEnginePath(path: string): string {
  const m = /^(options|members)\.(\d+)(.*)$/.exec(path);
  if (m) return `${m[1] === 'options' ? 'optionIds' : 'memberIds'}.${m[2]}${m[3] ? ` (${m[3].slice(1)})` : ''}`;
  if (path.startsWith('funds') || path.startsWith('correlations') || path === 'inflation' || path.startsWith('annuity')) return `assumptionSetId (${path})`;
  return path || '(body)';
}
