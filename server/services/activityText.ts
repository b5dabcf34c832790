import { ROLE_LABELS, type Role } from '../../constants/permissions';
import { date, lambda as lambdaText, plural } from '../../figures';

/**
 * The activity log in words: one sentence per audit event ("Idris Pellow approved assumption
 * set v3"), a link to the object, and the changes that matter spelled out — never raw keys or
 * JSON. WORDING has one entry for every action Keelson records (a unit test keeps it so).
 */
export type ActivityEvent = {
  action: string;
  entity: string | null;
  entityId: string | null;
  before: unknown;
  after: unknown;
  /** The actor's display name now, when the event has a user. */
  actorName: string | null;
  actorEmail: string | null;
};
export type ActivityWords = { actor: string; sentence: string; href: string | null; details: string[] };

type Values = Record<string, unknown>;
type Words = { what: string; href?: string | null; details?: string[] };
type Wording = (after: Values, before: Values, e: ActivityEvent) => Words;

const str = (v: unknown) => (typeof v === 'string' ? v : v === null || v === undefined ? '' : String(v));
const num = (v: unknown) => (typeof v === 'number' ? v : Number(v));
const quoted = (v: unknown) => (str(v) ? `“${str(v)}”` : '');
const role = (v: unknown) => (ROLE_LABELS[v as Role] ?? str(v)).toLowerCase();
const list = (v: unknown) => (Array.isArray(v) ? v.map(str) : []);
const short = (id: string | null) => (id ? id.slice(0, 8) : '');
const set = (a: Values) => (a.version ? `assumption set v${a.version}` : 'an assumption set');
const option = (a: Values) => `${str(a.name) || 'a default option'}${a.version ? ` v${a.version}` : ''}`;

/** Changed fields named in words, e.g. "Changed: name, glide path". */
function changed(before: Values, after: Values, labels: Record<string, string>): string[] {
  const names = Object.entries(labels)
    .filter(([k]) => k in after && JSON.stringify(before[k]) !== JSON.stringify(after[k]))
    .map(([, label]) => label);
  return names.length ? [`Changed: ${names.join(', ')}.`] : [];
}

const withdrawn = (a: Values): string[] => (num(a.approvalsWithdrawn) > 0 ? [`${plural(num(a.approvalsWithdrawn), 'approval')} withdrawn: the changed draft needs approving again.`] : []);
const approvalsOf = (a: Values): string[] => (a.required ? [`${a.approvals} of ${a.required} approvals.`] : []);

const ASSUMPTION_FIELDS = { setAt: 'date set', rationale: 'rationale', inflation: 'inflation', salaryGrowth: 'salary growth', annuityRealRate: 'income conversion rate', annuityYears: 'years of income', funds: 'fund figures', correlations: 'correlations' };
const OPTION_FIELDS = { name: 'name', description: 'description', glidePath: 'glide path' };
const MEMBER_FIELDS = { label: 'label', age: 'age', retirementAge: 'retirement age', salary: 'salary', salaryGrowth: 'salary growth', contributionRate: 'contribution rate', pot: 'pot' };
const REVIEW_FIELDS = {
  title: 'title',
  assumptionSetId: 'assumption set',
  optionVersionIds: 'options considered',
  runIds: 'runs',
  reportIds: 'board reports',
  decision: 'decision',
  chosenVersionId: 'option chosen',
  riskAversion: 'λ',
  lambdaCalibration: 'how λ was set',
  reasons: 'reasons',
  dissent: 'dissent',
  nextReviewDue: 'next review date',
};
const SETTINGS_LABELS: Record<string, [string, (v: unknown) => string]> = {
  approvalsRequired: ['Approvals needed', str],
  signOffQuorum: ['Trustees to sign a review', str],
  reviewIntervalYears: ['Years between reviews', str],
  nextReviewDue: ['Next review due', (v) => (v ? date(str(v)) : 'not set')],
};

export const WORDING: Record<string, Wording> = {
  // Accounts and people.
  'sign-in': () => ({ what: 'signed in' }),
  'sign-in.failed': () => ({ what: 'failed to sign in (wrong e-mail or password)' }),
  'sign-out': () => ({ what: 'signed out' }),
  'password.changed': () => ({ what: 'changed their password' }),
  'password.reset': () => ({ what: 'set a new password from a reset link' }),
  'password-reset.requested': () => ({ what: 'asked for a password-reset link' }),
  'password-reset.issued': (_a, _b, e) => ({ what: 'made a password-reset link for a member of the scheme', href: e.entityId ? '/people' : null }),
  'invitation.created': (a) => ({ what: `invited ${str(a.email)} as ${role(a.role)}`, href: '/people' }),
  'invitation.resent': (a) => ({ what: `sent the invitation to ${str(a.email)} again (the earlier link no longer works)`, href: '/people' }),
  'invitation.cancelled': (_a, b) => ({ what: `cancelled the invitation to ${str(b.email)}`, href: '/people' }),
  'sign-in.needs-confirmation': () => ({ what: 'signed in from a new place while the account was guarded; the sign-in waits for e-mail confirmation' }),
  'sign-in.confirmation-sent': () => ({ what: 'was e-mailed a link to confirm a sign-in from a new place' }),
  'sign-in.confirmed': () => ({ what: 'confirmed a sign-in from a new place by e-mail' }),
  'invitation.accepted': (a) => ({ what: `accepted an invitation${a.role ? ` as ${role(a.role)}` : ''}`, href: '/people' }),
  'role.changed': (a, b) => ({ what: `changed someone’s role from ${role(b.role)} to ${role(a.role)}`, href: '/people' }),
  'role.removed': (_a, b) => ({ what: `removed a ${role(b.role)} from the scheme`, href: '/people' }),

  // Funds, members, membership.
  'fund.created': (a) => ({ what: `added the fund ${quoted(a.name)}`, href: '/funds' }),
  'fund.updated': (a, b) => ({ what: `changed the fund ${quoted(a.name)}`, href: '/funds', details: changed(b, a, { name: 'name', assetClass: 'asset class' }) }),
  'fund.removed': (_a, b) => ({ what: `removed the fund ${quoted(b.name)}`, href: '/funds' }),
  'illustrative-member.created': (a) => ({ what: `added the illustrative member ${quoted(a.label)}`, href: '/members' }),
  'illustrative-member.updated': (a, b) => ({ what: `changed the illustrative member ${quoted(a.label)}`, href: '/members', details: changed(b, a, MEMBER_FIELDS) }),
  'illustrative-member.removed': (_a, b) => ({ what: `removed the illustrative member ${quoted(b.label)}`, href: '/members' }),
  'membership.replaced': (a, b) => ({
    what: `uploaded the membership (${plural(num(a.count), 'record')}${a.fileName ? ` from ${str(a.fileName)}` : ''})`,
    href: '/members',
    details: b.count !== undefined ? [`It replaced ${plural(num(b.count), 'record')}.`] : [],
  }),

  // Assumptions.
  'assumptions.draft-created': (a) => ({ what: `started a draft of ${set(a)}`, details: a.basedOnId ? ['Copied from an earlier version.'] : [] }),
  'assumptions.draft-updated': (a, b) => ({ what: `changed draft ${set(a)}`, details: [...changed(b, a, ASSUMPTION_FIELDS), ...withdrawn(a)] }),
  'assumptions.draft-discarded': (_a, b) => ({ what: `discarded draft ${set(b)}`, href: null }),
  'assumptions.approval-recorded': (a) => ({ what: `approved ${set(a)}; it needs another trustee’s approval`, details: approvalsOf(a) }),
  'assumptions.approved': (a) => ({ what: `approved ${set(a)}`, details: approvalsOf(a) }),

  // Default options.
  'option.created': (a) => ({ what: `created the default option ${option(a)} as a draft` }),
  'option.updated': (a, b) => ({ what: `changed the default option ${option(a)}`, details: changed(b, a, OPTION_FIELDS) }),
  'option.draft-updated': (a, b) => ({ what: `changed draft ${option(a)}`, details: [...changed(b, a, OPTION_FIELDS), ...withdrawn(a)] }),
  'option.version-drafted': (a, b) => ({ what: `started ${option(a)}, a new draft of ${option(b)}`, details: changed(b, a, OPTION_FIELDS) }),
  'option.draft-discarded': (_a, b) => ({ what: `discarded draft ${option(b)}` }),
  'option.approval-recorded': (a) => ({ what: `approved ${option(a)}; it needs another trustee’s approval`, details: approvalsOf(a) }),
  'option.version-approved': (a) => ({ what: `approved ${option(a)}`, details: approvalsOf(a) }),
  'option.archived': (a) => ({ what: `archived the default option ${quoted(a.name)}` }),
  'option.restored': (a) => ({ what: `restored the default option ${quoted(a.name)}` }),
  'option.current-default-set': (a) => ({
    what: a.optionId ? `marked ${quoted(a.name)} as the scheme’s current default option` : 'cleared the scheme’s current default option',
    details: a.byReview ? ['As decided by a signed-off review.'] : [],
  }),

  // Runs, reports, statements.
  'run.requested': (a) => ({
    what: `started a projection run of ${plural(list(a.options).length, 'option')} for ${plural(list(a.members).length, 'member')}`,
    details: [
      `Options: ${list(a.options).join(', ')}.`,
      `${plural(num(a.paths), 'path')}, seed ${str(a.seed)}, λ ${lambdaText(num(a.riskAversion))}, assumptions v${str(a.assumptionSet)}${a.draft ? ' (draft)' : ''}${a.stress ? ', with a stress' : ''}.`,
    ],
  }),
  'run.repeated': (_a, _b, e) => ({ what: `ran projection ${short(e.entityId)} again from its stored inputs to check it reproduces` }),
  'run.completed': (a, _b, e) => ({
    what: `finished projection run ${short(e.entityId)}`,
    details: [a.engineVersion ? `Engine version ${str(a.engineVersion)}.` : '', a.reproduced === true ? 'It reproduced the original run exactly.' : a.reproduced === false ? 'It did NOT reproduce the original run.' : ''].filter(Boolean),
  }),
  'run.failed': (a, _b, e) => ({ what: `could not finish projection run ${short(e.entityId)}`, details: a.reason ? [`Reason: ${str(a.reason)}`] : [] }),
  'report.created': (a) => ({ what: `made the board report ${quoted(a.title)}`, details: [`At λ ${lambdaText(num(a.riskAversion))}${a.draft ? ', on draft assumptions' : ''}.`] }),
  'report.emailed': (a) => ({ what: `e-mailed a board report to ${plural(list(a.recipients).length, 'board reviewer')}`, details: [list(a.recipients).join(', ')] }),
  'statements.export-requested': (a) => ({ what: `asked for ${str(a.scope) === 'membership' ? 'membership' : 'illustrative'} member statements as ${str(a.format).toUpperCase()}`, href: '/statements' }),
  'statements.exported': (a) => ({ what: `finished a statement export of ${plural(num(a.members), 'member')}`, href: '/statements' }),
  'statements.export-failed': (a) => ({ what: 'could not finish a statement export', href: '/statements', details: a.reason ? [`Reason: ${str(a.reason)}`] : [] }),

  // Mail.
  'mail.queued': (a) => ({ what: `queued the e-mail ${quoted(a.subject)} to ${list(a.recipients).join(', ')}`, href: '/outbox' }),
  'mail.sent': (a) => ({ what: `delivered an e-mail to ${list(a.recipients).join(', ')}`, href: '/outbox' }),
  'mail.retrying': (a) => ({ what: `could not deliver an e-mail (attempt ${str(a.attempts)}) and will try again`, href: '/outbox', details: a.reason ? [`Reason: ${str(a.reason)}`] : [] }),
  'mail.failed': (a) => ({ what: 'gave up delivering an e-mail', href: '/outbox', details: a.reason ? [`Reason: ${str(a.reason)}`] : [] }),
  'mail.retry-requested': () => ({ what: 'asked for a failed e-mail to be sent again', href: '/outbox' }),

  // Governance.
  'settings.updated': (a, b) => ({
    what: 'changed the scheme’s governance settings',
    href: '/settings',
    details: Object.entries(SETTINGS_LABELS)
      .filter(([k]) => JSON.stringify(a[k]) !== JSON.stringify(b[k]))
      .map(([k, [label, fmt]]) => `${label}: ${fmt(b[k])} → ${fmt(a[k])}.`),
  }),
  'review.opened': (a) => ({ what: `opened the review ${quoted(a.title)}` }),
  'review.updated': (a, b) => ({
    what: `changed the review ${quoted(a.title)}`,
    details: [...changed(b, a, REVIEW_FIELDS), ...(list(a.signaturesWithdrawn).length ? [`Signatures withdrawn (they signed the earlier wording): ${list(a.signaturesWithdrawn).join(', ')}.`] : [])],
  }),
  'review.discarded': (_a, b) => ({ what: `discarded the open review ${quoted(b.title)}`, href: null }),
  'review.signed': (a) => ({ what: `signed the review ${quoted(a.title)}`, details: [`${a.signatures} of ${a.quorum} signatures.`] }),
  'review.signature-withdrawn': (_a, b) => ({ what: `withdrew their signature from the review ${quoted(b.title)}` }),
  'review.signed-off': (a) => ({
    what: `signed off the review ${quoted(a.title)}, completing the quorum`,
    details: [str(a.decision), a.nextReviewDue ? `Next review due ${date(str(a.nextReviewDue))}.` : ''].filter(Boolean),
  }),
};

/** Where an event's object lives in the app, by the kind of object. */
function defaultHref(e: ActivityEvent, a: Values): string | null {
  if (!e.entityId) return null;
  switch (e.entity) {
    case 'assumption_set':
      return `/assumptions/${e.entityId}`;
    case 'default_option':
      return a.versionId ? `/options/${e.entityId}?version=${str(a.versionId)}` : `/options/${e.entityId}`;
    case 'projection_run':
      return `/projections/${e.entityId}`;
    case 'report':
      return `/reports/${e.entityId}`;
    case 'review':
      return `/reviews/${e.entityId}`;
    default:
      return null;
  }
}

const asValues = (v: unknown): Values => (v && typeof v === 'object' && !Array.isArray(v) ? (v as Values) : {});

/** An event in words. An action without wording (from a newer version) still reads as words, not as a code. */
export function describeEvent(e: ActivityEvent): ActivityWords {
  const actor = e.actorName ?? e.actorEmail ?? 'Keelson';
  const a = asValues(e.after);
  const b = asValues(e.before);
  const wording = WORDING[e.action];
  const words: Words = wording ? wording(a, b, e) : { what: `recorded “${e.action.replace(/[.-]/g, ' ')}”` };
  return {
    actor,
    sentence: `${actor} ${words.what}`.replace(/\s+/g, ' ').trim(),
    href: words.href !== undefined ? words.href : defaultHref(e, a),
    details: (words.details ?? []).filter(Boolean),
  };
}
