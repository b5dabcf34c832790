import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { describeEvent, WORDING, type ActivityEvent } from '../../../server/services/activityText';

const SERVER = path.resolve(__dirname, '../../../server');

/** Every audit action the server's source can record: the quoted strings after `action:` in its files. */
function recordedActions(): string[] {
  const found = new Set<string>();
  const walk = (dir: string) => {
    for (const e of fs.readdirSync(dir, { withFileTypes: true })) {
      const p = path.join(dir, e.name);
      if (e.isDirectory()) walk(p);
      else if (p.endsWith('.ts')) {
        const text = fs.readFileSync(p, 'utf8');
        for (const m of text.matchAll(/\baction:\s*([^,\n}]+)/g)) for (const q of m[1].matchAll(/(?<!===\s*)'([a-z][a-z-]*(?:\.[a-z-]+)?)'/g)) found.add(q[1]);
      }
    }
  };
  walk(SERVER);
  return [...found].sort();
}

const event = (e: Partial<ActivityEvent> & { action: string }): ActivityEvent => ({ entity: null, entityId: null, before: null, after: null, actorName: 'Elowen Marsh', actorEmail: 'elowen@example.org', ...e });

describe('the activity log in words', () => {
  it('has wording for every action the server records', () => {
    const actions = recordedActions();
    // A sanity check that the scan finds the server's actions at all.
    expect(actions).toEqual(expect.arrayContaining(['sign-in', 'run.completed', 'assumptions.approved', 'review.signed-off', 'mail.retrying']));
    expect(actions.filter((a) => !(a in WORDING))).toEqual([]);
  });

  it.each([
    [{ action: 'assumptions.approved', entity: 'assumption_set', entityId: 'set-1', after: { version: 3, status: 'approved', approvals: 1, required: 1 } }, 'Elowen Marsh approved assumption set v3', '/assumptions/set-1'],
    [{ action: 'assumptions.approval-recorded', entity: 'assumption_set', entityId: 'set-1', after: { version: 4, approvals: 1, required: 2 } }, 'Elowen Marsh approved assumption set v4; it needs another trustee’s approval', '/assumptions/set-1'],
    [{ action: 'option.version-approved', entity: 'default_option', entityId: 'opt-1', after: { version: 2, versionId: 'ver-2', name: 'Cautious glide' } }, 'Elowen Marsh approved Cautious glide v2', '/options/opt-1?version=ver-2'],
    [{ action: 'run.completed', entity: 'projection_run', entityId: '1a2b3c4d-0000', actorName: null, actorEmail: null, after: { engineVersion: '1.2.0' } }, 'Keelson finished projection run 1a2b3c4d', '/projections/1a2b3c4d-0000'],
    [{ action: 'role.changed', entity: 'user', entityId: 'u-1', before: { role: 'board' }, after: { role: 'trustee' } }, 'Elowen Marsh changed someone’s role from board reviewer to trustee', '/people'],
    [{ action: 'review.signed-off', entity: 'review', entityId: 'rev-1', after: { title: 'Default review 2027', signatures: 2, quorum: 2, decision: 'The trustees chose X.', nextReviewDue: '2030-05-01' } }, 'Elowen Marsh signed off the review “Default review 2027”, completing the quorum', '/reviews/rev-1'],
    [{ action: 'sign-in.failed', actorName: null, actorEmail: 'who@example.org' }, 'who@example.org failed to sign in (wrong e-mail or password)', null],
  ])('words %j', (e, sentence, href) => {
    const w = describeEvent(event(e));
    expect(w.sentence).toBe(sentence);
    expect(w.href).toBe(href);
  });

  it('spells out what changed instead of printing keys and JSON', () => {
    const w = describeEvent(
      event({
        action: 'settings.updated',
        entity: 'scheme_settings',
        before: { approvalsRequired: 1, signOffQuorum: 2, reviewIntervalYears: 3, nextReviewDue: null },
        after: { approvalsRequired: 2, signOffQuorum: 2, reviewIntervalYears: 3, nextReviewDue: '2027-03-31' },
      }),
    );
    expect(w.details).toEqual(['Approvals needed: 1 → 2.', 'Next review due: not set → 31 March 2027.']);
    const d = describeEvent(event({ action: 'option.draft-updated', entity: 'default_option', entityId: 'o', before: { name: 'A', description: 'x', glidePath: [1] }, after: { name: 'A', description: 'y', glidePath: [2], approvalsWithdrawn: 1 } }));
    expect(d.details).toEqual(['Changed: description, glide path.', '1 approval withdrawn: the changed draft needs approving again.']);
    for (const text of [w.sentence, ...w.details, d.sentence, ...d.details]) expect(text).not.toMatch(/[{}[\]]|approvalsRequired|glidePath/);
  });

  it('reads an action it does not know as words, not as a code', () => {
    const w = describeEvent(event({ action: 'archive.exported', after: { bytes: 12 } }));
    expect(w.sentence).toBe('Elowen Marsh recorded “archive exported”');
    expect(w.details).toEqual([]);
  });
});
