import { Router } from 'express';
import { z } from 'zod';
import type { AppContext } from '../context';
import { defineRoute } from '../routing';
import { contextOf } from '../services/context';
import { conflict } from '../errors';
import { exportSummary, getExport, illustrativeStatement, listExports, requestExport, statementFile, statementSources } from '../services/statements';
import { moneyRoundingNote, STATEMENT_PERCENTILES, WHAT_IF } from '../../figures';
import { sendFile } from './reports';

const Uuid = z.string().uuid('is not a valid id');
const Id = z.string('is required').min(1, 'is required').max(64, 'is too long');

const StatementQuery = z.object({ runId: Uuid, optionId: Id, memberId: Id });
const FileQuery = StatementQuery.extend({ format: z.enum(['pdf', 'csv'], 'must be pdf or csv').default('pdf') });
export const ExportBody = z.strictObject({
  runId: Uuid,
  optionId: Id,
  scope: z.enum(['illustrative', 'membership'], 'must be illustrative or membership'),
  format: z.enum(['pdf', 'csv'], 'must be pdf or csv'),
});

export function statementsRouter(ctx: AppContext): Router {
  const r = Router({ mergeParams: true });
  const M = '/schemes/:schemeId';

  defineRoute(r, M, { method: 'get', path: '/statement-sources', access: 'statements:export' }, async (req, res) => {
    const currency = req.scheme!.currency;
    res.json({ ...(await statementSources(ctx.db, req.scheme!.id)), rounding: { pot: moneyRoundingNote('pot', currency), income: moneyRoundingNote('income', currency) }, percentiles: STATEMENT_PERCENTILES, whatIf: WHAT_IF });
  });

  defineRoute(r, M, { method: 'get', path: '/statements/preview', access: 'statements:export' }, async (req, res) => {
    const q = StatementQuery.parse(req.query);
    res.json(await illustrativeStatement(ctx.db, req.scheme!.id, q));
  });

  defineRoute(r, M, { method: 'get', path: '/statements/file', access: 'statements:export' }, async (req, res) => {
    const q = FileQuery.parse(req.query);
    const file = await statementFile(ctx.db, req.scheme!.id, q);
    sendFile(res, file, file.contentType);
  });

  defineRoute(r, M, { method: 'get', path: '/statement-exports', access: 'statements:export' }, async (req, res) => {
    res.json({ exports: await listExports(ctx.db, req.scheme!.id) });
  });

  defineRoute(r, M, { method: 'post', path: '/statement-exports', access: 'statements:export' }, async (req, res) => {
    const body = ExportBody.parse(req.body ?? {});
    res.status(202).json(await requestExport(ctx.db, ctx.pool, contextOf(req), body));
  });

  defineRoute(r, M, { method: 'get', path: '/statement-exports/:exportId', access: 'statements:export' }, async (req, res) => {
    res.json(exportSummary(await getExport(ctx.db, req.scheme!.id, Uuid.parse(req.params.exportId))));
  });

  defineRoute(r, M, { method: 'get', path: '/statement-exports/:exportId/file', access: 'statements:export' }, async (req, res) => {
    const e = await getExport(ctx.db, req.scheme!.id, Uuid.parse(req.params.exportId));
    if (e.status !== 'done' || !e.file) throw conflict(e.status === 'failed' ? `This export failed: ${e.error}` : 'This export is not ready yet.');
    sendFile(res, { filename: e.filename ?? `statements.${e.format}`, body: e.file }, e.format === 'csv' ? 'text/csv; charset=utf-8' : 'application/pdf');
  });

  return r;
}
