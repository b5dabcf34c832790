import { Router, type Response } from 'express';
import { z } from 'zod';
import type { AppContext } from '../context';
import { defineRoute } from '../routing';
import { contextOf } from '../services/context';
import { ReportBody } from '../../schemas/runs';
import { createReport, emailReport, getReport, listReports, reportComparisonCsv, reportPdf } from '../services/reports';

const Uuid = z.string().uuid('is not a valid id');

/** Sends a file for download (attachment) or for viewing in the browser (inline). */
export function sendFile(res: Response, file: { filename: string; body: Buffer | string }, contentType: string, inline = false) {
  res.setHeader('Content-Type', contentType);
  res.setHeader('Content-Disposition', `${inline ? 'inline' : 'attachment'}; filename="${file.filename.replace(/[^A-Za-z0-9._-]/g, '_')}"`);
  res.setHeader('Cache-Control', 'private, no-store');
  res.send(file.body);
}

export function reportsRouter(ctx: AppContext): Router {
  const r = Router({ mergeParams: true });
  const M = '/schemes/:schemeId';

  defineRoute(r, M, { method: 'get', path: '/reports', access: 'reports:read' }, async (req, res) => {
    res.json({ reports: await listReports(ctx, req.scheme!.id) });
  });

  defineRoute(r, M, { method: 'post', path: '/reports', access: 'reports:create' }, async (req, res) => {
    const body = ReportBody.parse(req.body ?? {});
    res.status(201).json(await createReport(ctx, contextOf(req), body));
  });

  defineRoute(r, M, { method: 'get', path: '/reports/:reportId', access: 'reports:read' }, async (req, res) => {
    res.json(await getReport(ctx, req.scheme!.id, Uuid.parse(req.params.reportId)));
  });

  defineRoute(r, M, { method: 'get', path: '/reports/:reportId/pdf', access: 'reports:read' }, async (req, res) => {
    const file = await reportPdf(ctx, req.scheme!.id, Uuid.parse(req.params.reportId));
    sendFile(res, file, 'application/pdf', req.query.inline === '1');
  });

  defineRoute(r, M, { method: 'get', path: '/reports/:reportId/comparison.csv', access: 'reports:read' }, async (req, res) => {
    const file = await reportComparisonCsv(ctx, req.scheme!.id, Uuid.parse(req.params.reportId));
    sendFile(res, file, 'text/csv; charset=utf-8');
  });

  defineRoute(r, M, { method: 'post', path: '/reports/:reportId/email', access: 'reports:create' }, async (req, res) => {
    res.status(202).json(await emailReport(ctx, contextOf(req), Uuid.parse(req.params.reportId)));
  });

  return r;
}
