import { HttpError, type FieldIssue } from '../errors';
import type { MembershipCsvReply } from './membershipCsv';
import { runOnThread } from './spawn';

/** parseMembershipCsv on a worker thread: the same rows, or the same 400 listing the bad lines. */
export async function parseMembershipCsvOffThread(buffer: Buffer) {
  const copy = new Uint8Array(buffer.byteLength);
  copy.set(buffer);
  const reply = await runOnThread<MembershipCsvReply>('membershipCsv', copy, [copy.buffer]);
  if (reply.ok) return reply.rows;
  throw new HttpError(reply.error.status, reply.error.message, reply.error.issues as FieldIssue[] | undefined, reply.error.code);
}
