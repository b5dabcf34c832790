import { parentPort } from 'node:worker_threads';
import { HttpError } from '../errors';
import { parseMembershipCsv } from '../services/membership';

/**
 * Worker thread: parses and checks an uploaded membership CSV (145,000 rows take seconds), so
 * the API's event loop keeps answering meanwhile. Replies with the rows, or with the 400 that
 * lists the bad lines.
 */
export type MembershipCsvReply =
  | { ok: true; rows: Awaited<ReturnType<typeof parseMembershipCsv>> }
  | { ok: false; error: { status: number; message: string; issues?: unknown; code?: string } };

parentPort?.once('message', (data: Uint8Array) => {
  parseMembershipCsv(Buffer.from(data.buffer, data.byteOffset, data.byteLength)).then(
    (rows) => parentPort!.postMessage({ ok: true, rows } satisfies MembershipCsvReply),
    (err: unknown) => {
      const e = err instanceof HttpError ? err : new HttpError(500, err instanceof Error ? err.message : String(err));
      parentPort!.postMessage({ ok: false, error: { status: e.status, message: e.message, issues: e.issues, code: e.code } } satisfies MembershipCsvReply);
    },
  );
});
