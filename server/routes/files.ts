import { Router } from 'express';
import { pipeline } from 'node:stream/promises';
import { Readable } from 'node:stream';
import { LIMITS } from '../../shared/api.js';
import { attachmentQuotaBytes, type ServerConfig } from '../config.js';
import type { EvaluationPool } from '../evaluation/pool.js';
import { checkEvaluationLimits } from '../evaluation/limits.js';
import { storeReport } from '../evaluation/stored.js';
import { currentUser } from '../middleware/auth.js';
import { requireGroupRole, requireWorksheetRole } from '../middleware/group-access.js';
import { HttpError, notFound } from '../middleware/http-error.js';
import { idParam, nulCharacterError, routeParam } from '../middleware/validate.js';
import { addAttachment, attachmentContent, deleteAttachment, findAttachment, groupAttachmentBytes, listAttachments, quotaExceeded } from '../services/files.js';
import { createWorksheet, unlessDeleted, worksheetGone } from '../services/worksheets.js';
import { discard, receiveInMemory, receiveToDisk } from '../uploads/receive.js';
import { decodeUtf8, sniffFile } from '../uploads/sniff.js';

const MB = 1024 * 1024;
const MAX_ATTACHMENT_BYTES = 10 * MB;

/**
 * Imports and attachments. `config.attachmentQuotaBytes` is the room for one group's
 * attached files (read from the environment when no config is passed).
 */
export function fileRoutes(pool: EvaluationPool, config: Pick<ServerConfig, 'attachmentQuotaBytes'> = { attachmentQuotaBytes: attachmentQuotaBytes() }): Router {
  const router = Router();

  // Import a .swk file: without ?save=1 it only parses and evaluates, so the person
  // sees the result before anything is stored.
  router.post('/groups/:groupId/imports', async (req, res) => {
    const user = currentUser(req);
    const groupId = idParam(routeParam(req, 'groupId'), 'This group');
    await requireGroupRole(user.id, groupId, 'editWorksheets');
    const file = await receiveInMemory(req, res, { maxBytes: 1 * MB, what: 'worksheet file' });
    const swk = file.originalname.toLowerCase().endsWith('.swk');
    if (!swk) throw new HttpError(415, 'wrong_type', 'A worksheet file ends in .swk. Choose a Sheetwise worksheet file.');
    const source = decodeUtf8(file.buffer);
    if (source === null) {
      // Text but for NUL characters: say so, and where, rather than "not text".
      const nul = file.buffer.indexOf(0);
      if (nul >= 0 && decodeUtf8(file.buffer.filter((b) => b !== 0)) !== null) throw nulCharacterError('file', file.buffer.subarray(0, nul + 1).toString('utf8'));
      throw new HttpError(415, 'not_text', 'The file is not UTF-8 text. Save it as UTF-8 and import it again.');
    }
    checkEvaluationLimits(source);
    const typedTitle = typeof req.body?.title === 'string' ? req.body.title : '';
    if (typedTitle.includes('\u0000')) throw nulCharacterError('title', typedTitle);
    const title = typedTitle.trim() || file.originalname.slice(0, -'.swk'.length);
    if (title.length > LIMITS.worksheetTitleLength) throw new HttpError(400, 'invalid_input', `title: Use at most ${LIMITS.worksheetTitleLength} characters.`);
    const report = await pool.evaluate(source);
    if (req.query['save'] !== '1') {
      res.json({ preview: { title, source, report } });
      return;
    }
    const worksheet = await unlessDeleted(() => createWorksheet({ groupId, user, title, source, action: 'imported worksheet' }), () => notFound('This group'));
    // The preview's report is version 1's: opening the worksheet shows it at once.
    await unlessDeleted(() => storeReport(worksheet.id, 1, report), () => worksheetGone('while it was being imported'));
    res.status(201).json({ worksheet: { id: worksheet.id, title, version: 1 }, report });
  });

  router.get('/worksheets/:id/attachments', async (req, res) => {
    const id = idParam(routeParam(req, 'id'), 'This worksheet');
    await requireWorksheetRole(currentUser(req).id, id, 'read');
    const rows = await listAttachments(id);
    res.json({
      attachments: rows.map((r) => ({ id: r.id, fileName: r.file_name, mediaType: r.media_type, size: r.size, uploadedBy: r.uploader ?? 'a former member', createdAt: new Date(r.created_at).toISOString() })),
    });
  });

  // Streamed to a temporary file, checked, then stored in chunks: memory per upload stays small.
  router.post('/worksheets/:id/attachments', async (req, res) => {
    const user = currentUser(req);
    const id = idParam(routeParam(req, 'id'), 'This worksheet');
    const { worksheet } = await requireWorksheetRole(user.id, id, 'editWorksheets');
    const quota = config.attachmentQuotaBytes;
    // What is left decides where the stream is cut; the lock in addAttachment decides for good.
    const used = await groupAttachmentBytes(worksheet.groupId);
    const left = Math.max(0, quota - used);
    const quotaBound = left < MAX_ATTACHMENT_BYTES;
    let file: Express.Multer.File | undefined;
    try {
      file = await receiveToDisk(req, res, {
        maxBytes: quotaBound ? Math.max(1, left) : MAX_ATTACHMENT_BYTES,
        what: 'file',
        ...(quotaBound ? { tooLarge: () => quotaExceeded({ quota, used }) } : {}),
      });
      if (used + file.size > quota) throw quotaExceeded({ quota, used, size: file.size });
      const type = await sniffFile(file.path, file.originalname);
      if (!type) {
        throw new HttpError(415, 'wrong_type', 'Attach a PDF, PNG, SVG, CSV or TeX file. The type is read from the content, and this content is none of these.');
      }
      const name = file.originalname.replace(/[\\/\u0000-\u001f]/g, '_').slice(0, 255);
      const attachmentId = await addAttachment({ worksheetId: id, user, name, type, path: file.path, size: file.size, quotaBytes: quota });
      res.status(201).json({ attachment: { id: attachmentId, fileName: name, mediaType: type, size: file.size, uploadedBy: user.displayName } });
    } finally {
      await discard(file);
    }
  });

  router.get('/worksheets/:id/attachments/:attachmentId', async (req, res) => {
    const id = idParam(routeParam(req, 'id'), 'This worksheet');
    await requireWorksheetRole(currentUser(req).id, id, 'read');
    const row = await findAttachment(id, idParam(routeParam(req, 'attachmentId'), 'This file'));
    if (!row) throw notFound('This file');
    // Downloaded, never rendered inline: an SVG could otherwise run script on our origin.
    res.set({
      'content-type': row.media_type,
      'content-length': String(row.size),
      'content-disposition': `attachment; filename="${encodeURIComponent(row.file_name)}"`,
      'x-content-type-options': 'nosniff',
    });
    // One chunk at a time, as fast as the caller reads; a caller that goes away ends it.
    await pipeline(Readable.from(attachmentContent(row.id)), res).catch((err: unknown) => {
      if (!res.destroyed) res.destroy(err instanceof Error ? err : undefined);
    });
  });

  router.delete('/worksheets/:id/attachments/:attachmentId', async (req, res) => {
    const id = idParam(routeParam(req, 'id'), 'This worksheet');
    await requireWorksheetRole(currentUser(req).id, id, 'editWorksheets');
    await deleteAttachment(id, idParam(routeParam(req, 'attachmentId'), 'This file'));
    res.status(204).end();
  });

  return router;
}
