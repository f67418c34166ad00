import type { RequestHandler } from 'express';
import multer from 'multer';
import { HttpError } from './http-error.js';

/**
 * multer (memory storage) for one file in the form field `file` of at most `maxBytes`, with a
 * few small text fields; its refusals become 400s that name the upload (`what`, e.g.
 * "Calibration file") and say what to fix.
 */
export function receiveSingleFile(what: string, maxBytes: number): RequestHandler {
  const upload = multer({ storage: multer.memoryStorage(), limits: { fileSize: maxBytes, files: 1, fields: 4, fieldSize: 1000, parts: 6 } });
  return (req, res, next) => {
    upload.single('file')(req, res, (error: unknown) => {
      if (!error) return next();
      if (error instanceof multer.MulterError) {
        const message =
          error.code === 'LIMIT_FILE_SIZE'
            ? `${what}: larger than ${maxBytes / 1024 / 1024} MB`
            : error.code === 'LIMIT_UNEXPECTED_FILE'
              ? `${what}: send one file in the form field "file" (got "${error.field ?? ''}")`
              : `${what} refused: ${error.message}`;
        return next(new HttpError(400, message));
      }
      return next(new HttpError(400, `${what}: the upload is not a readable multipart form: ${(error as Error).message}`));
    });
  };
}

/** An uploaded file's name as stored: printable, at most 120 characters. */
export function safeFileName(name: string): string {
  const clean = name.replace(/[\u0000-\u001f\u007f]|[\ud800-\udfff]/g, '').trim();
  return (clean || 'upload.csv').slice(0, 120);
}
