/** Queries behind the exports: the version to export, and the activity line it leaves. */
import { recordActivity } from '../activity/record.js';
import { WorksheetVersion, type Worksheet } from '../models/index.js';

export const findVersionToExport = (worksheetId: number, number: number) => WorksheetVersion.findOne({ where: { worksheetId, number } });

export const recordExport = (worksheet: Worksheet, userId: number, version: WorksheetVersion, format: string) =>
  recordActivity(WorksheetVersion.sequelize!, { groupId: worksheet.groupId, userId, action: 'exported', subject: `${version.title} v${version.number} as ${format}`, worksheetId: worksheet.id });
