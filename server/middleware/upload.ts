/**
 * One file from a multipart/form-data body, held in memory (plans ≤ 20 MB, CSVs ≤ 1 MB), with multer's
 * failures mapped onto the one error shape: too large → 413 PAYLOAD_TOO_LARGE, a missing or unexpected
 * field → 400. Nothing touches the disk, so a refused upload leaves nothing behind.
 */
import type { RequestHandler } from 'express';
import multer from 'multer';
import { AppError } from '../lib/errors';

function megabytes(bytes: number): string {
  return `${Math.round((bytes / (1024 * 1024)) * 10) / 10} MB`;
}

export function singleFileUpload(field: string, maxBytes: number): RequestHandler {
  const parse = multer({ storage: multer.memoryStorage(), limits: { fileSize: maxBytes, files: 1, fields: 10, parts: 12 } }).single(field);
  return (req, res, next) => {
    if (!req.is('multipart/form-data')) {
      next(new AppError('UNSUPPORTED_MEDIA_TYPE', `Send the file as multipart/form-data in a field named "${field}".`));
      return;
    }
    parse(req, res, (error: unknown) => {
      if (error instanceof multer.MulterError) {
        if (error.code === 'LIMIT_FILE_SIZE') {
          next(new AppError('PAYLOAD_TOO_LARGE', `The file is larger than ${megabytes(maxBytes)}.`, { limitBytes: maxBytes }));
          return;
        }
        if (error.code === 'LIMIT_UNEXPECTED_FILE') {
          next(new AppError('BAD_REQUEST', `Send exactly one file, in a field named "${field}".`));
          return;
        }
        next(new AppError('BAD_REQUEST', `The upload could not be read: ${error.message}.`));
        return;
      }
      if (error) {
        next(new AppError('BAD_REQUEST', 'The upload could not be read (the multipart body is malformed or was cut off).'));
        return;
      }
      if (!req.file) {
        next(new AppError('VALIDATION_FAILED', `Choose a file to upload (field "${field}").`, { issues: [{ in: 'body', path: field, message: 'Required.' }] }));
        return;
      }
      next();
    });
  };
}
