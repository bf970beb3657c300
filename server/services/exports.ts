/** Queries behind the exports: the version to export. An export writes nothing (no activity line). */
import { WorksheetVersion } from '../models/index.js';

export const findVersionToExport = (worksheetId: number, number: number) => WorksheetVersion.findOne({ where: { worksheetId, number } });
