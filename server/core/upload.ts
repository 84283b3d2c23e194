import type { RequestHandler } from 'express';
import multer from 'multer';
import { IMAGE_LIMITS } from '../render/decode';
import { AppError } from './app-error';

const upload = multer({ storage: multer.memoryStorage(), limits: { fileSize: IMAGE_LIMITS.maxBytes, files: 1, fields: 8, fieldSize: 4096, parts: 10 } });

/** multer's single-file parser with its limits reported as 413/400 naming the limit. */
export const uploadOne: RequestHandler = (req, res, next) =>
  upload.single('file')(req, res, (err: unknown) => {
    if (!err) return next();
    if (err instanceof multer.MulterError) {
      if (err.code === 'LIMIT_FILE_SIZE') return next(new AppError(413, 'file_too_large', `The file is larger than the limit of ${IMAGE_LIMITS.maxBytes / 1024 / 1024} MiB.`));
      return next(new AppError(400, 'bad_upload', `The upload was refused: ${err.message}${err.field ? ` (${err.field})` : ''}.`));
    }
    next(err);
  });

