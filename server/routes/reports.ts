import { Router } from 'express';
import { ENGINE_VERSION } from '../../cas/index.js';
import type { StoredReportResponse } from '../../shared/report-api.js';
import type { EvaluationPool } from '../evaluation/pool.js';
import { checkEvaluationLimits } from '../evaluation/limits.js';
import { storedReport, storeReport } from '../evaluation/stored.js';
import { currentUser } from '../middleware/auth.js';
import { requireWorksheetRole } from '../middleware/group-access.js';
import { idParam, routeParam } from '../middleware/validate.js';
import { evaluateForRequest } from './evaluate.js';

/**
 * GET and POST /api/worksheets/:id/report: the stored report of the latest version.
 * GET never evaluates, so opening a worksheet costs no computation; POST evaluates
 * that version (streamed like POST /api/evaluate when asked) and stores the report.
 */
export function reportRoutes(pool: EvaluationPool): Router {
  const router = Router();

  router.get('/worksheets/:id/report', async (req, res) => {
    const id = idParam(routeParam(req, 'id'), 'This worksheet');
    const { worksheet } = await requireWorksheetRole(currentUser(req).id, id, 'read');
    const stored = await storedReport(id, worksheet.version);
    const body: StoredReportResponse = { version: worksheet.version, engine: ENGINE_VERSION, current: stored?.current ?? false, report: stored?.report ?? null };
    res.json(body);
  });

  router.post('/worksheets/:id/report', async (req, res) => {
    const id = idParam(routeParam(req, 'id'), 'This worksheet');
    const { worksheet } = await requireWorksheetRole(currentUser(req).id, id, 'read');
    const checked = checkEvaluationLimits(worksheet.source);
    // stored before the report is sent, so a GET right after the stream sees it
    const report = await evaluateForRequest(pool, worksheet.source, checked, req, res, (r) => storeReport(id, worksheet.version, r));
    if (!report) return;
    const body: StoredReportResponse = { version: worksheet.version, engine: ENGINE_VERSION, current: report.engine === ENGINE_VERSION, report };
    if (!res.headersSent) res.json(body);
  });

  return router;
}
