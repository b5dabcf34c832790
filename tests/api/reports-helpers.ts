import { PDFParse } from 'pdf-parse';
import { expect } from 'vitest';
import { and, eq } from 'drizzle-orm';
import type { Db } from '../../db/client';
import { assumptionSets, illustrativeMembers } from '../../db/schema';
import type { Client } from '../helpers/app';
import { insertOption, schemeOptions } from '../helpers/options';

/** The text of a PDF, as pdf-parse extracts it, with runs of white space made single spaces. */
export async function pdfText(buf: Buffer): Promise<{ text: string; pages: number }> {
  const p = new PDFParse({ data: new Uint8Array(buf) });
  try {
    const r = await p.getText();
    return { text: r.text.replace(/\s+/g, ' '), pages: r.total };
  } finally {
    await p.destroy();
  }
}

/** Downloads a file from the API as bytes. */
export async function download(c: Client, path: string): Promise<{ status: number; type: string | null; disposition: string | null; body: Buffer }> {
  const res = await fetch(`${c.baseUrl}/api${path}`, { headers: { Cookie: c.cookie } });
  return { status: res.status, type: res.headers.get('content-type'), disposition: res.headers.get('content-disposition'), body: Buffer.from(await res.arrayBuffer()) };
}

/** Waits for a run started through the runs API to finish. */
export async function waitForRun(c: Client, schemeId: string, runId: string, timeoutMs = 90_000) {
  const until = Date.now() + timeoutMs;
  for (;;) {
    const r = await c.get(`/schemes/${schemeId}/runs/${runId}`);
    expect(r.status).toBe(200);
    if (r.body.status === 'done' || r.body.status === 'failed') return r.body;
    if (Date.now() > until) throw new Error(`run ${runId} still ${r.body.status} after ${timeoutMs} ms`);
    await new Promise((res) => setTimeout(res, 100));
  }
}

/** Polls `check` until it returns a value, or fails with the last state seen. */
export async function eventually<T>(what: string, check: () => Promise<T | null | undefined | false>, timeoutMs = 30_000): Promise<T> {
  const until = Date.now() + timeoutMs;
  for (;;) {
    const v = await check();
    if (v) return v;
    if (Date.now() > until) throw new Error(`timed out waiting for ${what}`);
    await new Promise((res) => setTimeout(res, 100));
  }
}

/**
 * A run of the scheme's approved assumptions, its first `options` options by name (all by
 * default) and every illustrative member, requested through the API as `c` and finished by
 * the queue's worker.
 */
export async function finishedSchemeRun(c: Client, db: Db, schemeId: string, run: { paths: number; seed: number; options?: number }) {
  const [set] = await db.select().from(assumptionSets).where(and(eq(assumptionSets.schemeId, schemeId), eq(assumptionSets.status, 'approved')));
  const options = await schemeOptions(db, schemeId);
  const members = await db.select().from(illustrativeMembers).where(eq(illustrativeMembers.schemeId, schemeId)).orderBy(illustrativeMembers.age);
  const created = await c.post(`/schemes/${schemeId}/runs`, { assumptionSetId: set.id, optionIds: options.slice(0, run.options ?? options.length).map((o) => o.id), memberIds: members.map((m) => m.id), paths: run.paths, seed: run.seed });
  expect(created.status, JSON.stringify(created.body)).toBe(201);
  return waitForRun(c, schemeId, created.body.id);
}

/**
 * The approved assumption set and three options to compare: the scheme's current default, an
 * exact copy of it named "Copy of the current default" (equal on every path, so never separated
 * from it) and one other option.
 */
export async function currentDefaultWithCopy(c: Client, db: Db, schemeId: string) {
  const [set] = await db.select().from(assumptionSets).where(and(eq(assumptionSets.schemeId, schemeId), eq(assumptionSets.status, 'approved')));
  const choices = await c.get(`/schemes/${schemeId}/run-choices`);
  const current = choices.body.options.find((o: { isCurrentDefault: boolean }) => o.isCurrentDefault);
  expect(current, 'the demo scheme has a current default').toBeTruthy();
  const options = await schemeOptions(db, schemeId);
  const original = options.find((o) => o.id === current.id)!;
  const copy = await insertOption(db, schemeId, { name: 'Copy of the current default', glidePath: original.glidePath });
  const other = options.find((o) => o.id !== current.id)!;
  return { set, optionIds: [original.id, copy.id, other.id] };
}
