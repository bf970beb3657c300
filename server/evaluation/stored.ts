import { ENGINE_VERSION } from '../../cas/index.js';
import { worksheetReport, type WorksheetReport } from '../../shared/evaluation.js';
import { Evaluation } from '../models/index.js';

/** A stored report and whether this engine made it. */
export interface StoredReport {
  report: WorksheetReport;
  current: boolean;
}

/**
 * The stored report of a worksheet version, or null. A report stored by an engine
 * whose report no longer matches the shared schema is as good as missing.
 */
export async function storedReport(worksheetId: number, version: number): Promise<StoredReport | null> {
  const row = await Evaluation.findOne({ where: { worksheetId, version } });
  if (!row) return null;
  const checked = worksheetReport.safeParse(row.report);
  if (!checked.success) return null;
  return { report: checked.data, current: checked.data.engine === ENGINE_VERSION };
}

/** Keeps a version's report, replacing one an older engine made. */
export async function storeReport(worksheetId: number, version: number, report: WorksheetReport): Promise<void> {
  await Evaluation.upsert({ worksheetId, version, report }, { conflictFields: ['worksheet_id', 'version'] } as never);
}
