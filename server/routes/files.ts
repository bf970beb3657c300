import { Router, type NextFunction, type Request, type Response } from 'express';
import multer from 'multer';
import { LIMITS } from '../../shared/api.js';
import type { EvaluationPool } from '../evaluation/pool.js';
import { checkEvaluationLimits } from '../evaluation/limits.js';
import { storeReport } from '../evaluation/stored.js';
import { currentUser } from '../middleware/auth.js';
import { requireGroupRole, requireWorksheetRole } from '../middleware/group-access.js';
import { HttpError, notFound } from '../middleware/http-error.js';
import { idParam, routeParam } from '../middleware/validate.js';
import { addAttachment, deleteAttachment, findAttachment, listAttachments } from '../services/files.js';
import { createWorksheet } from '../services/worksheets.js';
import { decodeUtf8, sniffType } from '../uploads/sniff.js';

const MB = 1024 * 1024;

/** multer in memory with a size limit; its errors become our 413/400 answers. */
function singleFile(maxBytes: number, what: string) {
  const upload = multer({ storage: multer.memoryStorage(), limits: { fileSize: maxBytes, files: 1 } }).single('file');
  return (req: Request, res: Response, next: NextFunction) =>
    upload(req, res, (err: unknown) => {
      if (!err) return req.file ? next() : next(new HttpError(400, 'no_file', `Send the ${what} as a form field named "file".`));
      if (err instanceof multer.MulterError && err.code === 'LIMIT_FILE_SIZE') {
        return next(new HttpError(413, 'file_too_large', `The ${what} is larger than ${maxBytes / MB} MB. Send a smaller file.`));
      }
      next(new HttpError(400, 'bad_upload', `The upload could not be read (${err instanceof Error ? err.message : err}). Send it again as multipart form data.`));
    });
}

export function fileRoutes(pool: EvaluationPool): Router {
  const router = Router();

  // Import a .swk file: without ?save=1 it only parses and evaluates, so the person
  // sees the result before anything is stored.
  router.post('/groups/:groupId/imports', async (req, res, next) => {
    const user = currentUser(req);
    const groupId = idParam(routeParam(req, 'groupId'), 'This group');
    await requireGroupRole(user.id, groupId, 'editWorksheets');
    singleFile(1 * MB, 'worksheet file')(req, res, async (err?: unknown) => {
      try {
        if (err) throw err;
        const file = req.file!;
        const swk = file.originalname.toLowerCase().endsWith('.swk');
        if (!swk) throw new HttpError(415, 'wrong_type', 'A worksheet file ends in .swk. Choose a Sheetwise worksheet file.');
        const source = decodeUtf8(file.buffer);
        if (source === null) throw new HttpError(415, 'not_text', 'The file is not UTF-8 text. Save it as UTF-8 and import it again.');
        checkEvaluationLimits(source);
        const title = (typeof req.body?.title === 'string' && req.body.title.trim()) || file.originalname.slice(0, -'.swk'.length);
        if (title.length > LIMITS.worksheetTitleLength) throw new HttpError(400, 'invalid_input', `title: Use at most ${LIMITS.worksheetTitleLength} characters.`);
        const report = await pool.evaluate(source);
        if (req.query['save'] !== '1') {
          res.json({ preview: { title, source, report } });
          return;
        }
        const worksheet = await createWorksheet({ groupId, user, title, source, action: 'imported worksheet' });
        // The preview's report is version 1's: opening the worksheet shows it at once.
        await storeReport(worksheet.id, 1, report);
        res.status(201).json({ worksheet: { id: worksheet.id, title, version: 1 }, report });
      } catch (e) {
        next(e);
      }
    });
  });

  router.get('/worksheets/:id/attachments', async (req, res) => {
    const id = idParam(routeParam(req, 'id'), 'This worksheet');
    await requireWorksheetRole(currentUser(req).id, id, 'read');
    const rows = await listAttachments(id);
    res.json({
      attachments: rows.map((r) => ({ id: r.id, fileName: r.file_name, mediaType: r.media_type, size: r.size, uploadedBy: r.uploader ?? 'a former member', createdAt: new Date(r.created_at).toISOString() })),
    });
  });

  router.post('/worksheets/:id/attachments', async (req, res, next) => {
    const user = currentUser(req);
    const id = idParam(routeParam(req, 'id'), 'This worksheet');
    const { worksheet } = await requireWorksheetRole(user.id, id, 'editWorksheets');
    singleFile(10 * MB, 'file')(req, res, async (err?: unknown) => {
      try {
        if (err) throw err;
        const file = req.file!;
        const type = sniffType(file.buffer, file.originalname);
        if (!type) {
          throw new HttpError(415, 'wrong_type', 'Attach a PDF, PNG, SVG, CSV or TeX file. The type is read from the content, and this content is none of these.');
        }
        const name = file.originalname.replace(/[\\/\u0000-\u001f]/g, '_').slice(0, 255);
        const attachmentId = await addAttachment({ worksheet, user, name, type, content: file.buffer });
        res.status(201).json({ attachment: { id: attachmentId, fileName: name, mediaType: type, size: file.size, uploadedBy: user.displayName } });
      } catch (e) {
        next(e);
      }
    });
  });

  router.get('/worksheets/:id/attachments/:attachmentId', async (req, res) => {
    const id = idParam(routeParam(req, 'id'), 'This worksheet');
    await requireWorksheetRole(currentUser(req).id, id, 'read');
    const row = await findAttachment(id, idParam(routeParam(req, 'attachmentId'), 'This file'));
    if (!row) throw notFound('This file');
    // Downloaded, never rendered inline: an SVG could otherwise run script on our origin.
    res.set({ 'content-type': row.media_type, 'content-disposition': `attachment; filename="${encodeURIComponent(row.file_name)}"`, 'x-content-type-options': 'nosniff' });
    res.send(row.content);
  });

  router.delete('/worksheets/:id/attachments/:attachmentId', async (req, res) => {
    const id = idParam(routeParam(req, 'id'), 'This worksheet');
    await requireWorksheetRole(currentUser(req).id, id, 'editWorksheets');
    await deleteAttachment(id, idParam(routeParam(req, 'attachmentId'), 'This file'));
    res.status(204).end();
  });

  return router;
}
