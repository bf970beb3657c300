/**
 * The stored report of a worksheet's latest version: GET and POST
 * /api/worksheets/:id/report. Imports nothing outside shared/.
 *
 * Example: { version: 3, engine: '2026.12.02-1', current: true, report: { … } }.
 */
import { z } from 'zod';
import { worksheetReport } from './evaluation.js';

export const storedReportResponse = z.object({
  /** The worksheet's latest version, the one the report belongs to. */
  version: z.number().int().positive(),
  /** The server's engine version; `report.engine` says which engine made the report. */
  engine: z.string(),
  /** True when the stored report was made by this engine; false when it is older or missing. */
  current: z.boolean(),
  /** Null when this version has no stored report (GET never evaluates). */
  report: worksheetReport.nullable(),
});
export type StoredReportResponse = z.infer<typeof storedReportResponse>;
