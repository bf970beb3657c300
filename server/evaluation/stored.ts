import type { WorksheetReport } from '../../shared/evaluation.js';
import { Evaluation } from '../models/index.js';
import type { EvaluationPool } from './pool.js';

/** The stored report of a worksheet version, computing and storing it when missing. */
export async function reportForVersion(pool: EvaluationPool, worksheetId: number, version: number, source: string): Promise<WorksheetReport> {
  const stored = await Evaluation.findOne({ where: { worksheetId, version } });
  if (stored) return stored.report;
  const report = await pool.evaluate(source);
  await Evaluation.upsert({ worksheetId, version, report }, { conflictFields: ['worksheet_id', 'version'] } as never);
  return report;
}
