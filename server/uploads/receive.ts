/**
 * Receiving one file from a multipart form. Worksheet imports (at most 1 MB, evaluated
 * as a whole) are held in memory; attachments are streamed to a temporary file, which the
 * caller stores chunk by chunk and removes, so a server process never holds a whole file.
 */
import type { Request, Response } from 'express';
import { mkdirSync } from 'node:fs';
import { rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import multer from 'multer';
import { HttpError } from '../middleware/http-error.js';

const MB = 1024 * 1024;

/** Form fields beside the file are short (a title). */
const FIELD_LIMITS = { files: 1, fields: 10, fieldSize: 16 * 1024 };

function run(upload: ReturnType<ReturnType<typeof multer>['single']>, req: Request, res: Response, o: { what: string; tooLarge: () => HttpError }) {
  return new Promise<Express.Multer.File>((resolve, reject) =>
    upload(req, res, (err: unknown) => {
      if (!err) return req.file ? resolve(req.file) : reject(new HttpError(400, 'no_file', `Send the ${o.what} as a form field named "file".`));
      if (err instanceof multer.MulterError && err.code === 'LIMIT_FILE_SIZE') return reject(o.tooLarge());
      reject(new HttpError(400, 'bad_upload', `The upload could not be read (${err instanceof Error ? err.message : err}). Send it again as multipart form data.`));
    }),
  );
}

const tooLargeFor = (maxBytes: number, what: string) => () =>
  new HttpError(413, 'file_too_large', `The ${what} is larger than ${maxBytes / MB} MB. Send a smaller file.`);

/** One file in memory (`file.buffer`), for small files that are used whole. */
export function receiveInMemory(req: Request, res: Response, o: { maxBytes: number; what: string }): Promise<Express.Multer.File> {
  const upload = multer({ storage: multer.memoryStorage(), limits: { ...FIELD_LIMITS, fileSize: o.maxBytes } }).single('file');
  return run(upload, req, res, { what: o.what, tooLarge: tooLargeFor(o.maxBytes, o.what) });
}

let uploadDir: string | undefined;
function temporaryFolder(): string {
  if (!uploadDir) {
    uploadDir = join(tmpdir(), `sheetwise-uploads-${process.getuid?.() ?? 'user'}`);
    mkdirSync(uploadDir, { recursive: true, mode: 0o700 });
  }
  return uploadDir;
}

/**
 * One file streamed to a temporary file (`file.path`; remove it with `discard`). A file
 * over `maxBytes` is cut off while it streams, removed, and answered with `tooLarge()`.
 */
export function receiveToDisk(req: Request, res: Response, o: { maxBytes: number; what: string; tooLarge?: () => HttpError }): Promise<Express.Multer.File> {
  const upload = multer({ dest: temporaryFolder(), limits: { ...FIELD_LIMITS, fileSize: o.maxBytes } }).single('file');
  return run(upload, req, res, { what: o.what, tooLarge: o.tooLarge ?? tooLargeFor(o.maxBytes, o.what) });
}

/** Removes a received temporary file. */
export const discard = async (file: Express.Multer.File | undefined) => {
  if (file?.path) await rm(file.path, { force: true });
};
