import type { RequestHandler } from 'express';
import multer from 'multer';
import { AppError } from './app-error';
import { assertNoNul } from './refuse-nul';

/** The largest file an upload takes (an image, a photo, a ROM); the image decoder holds to it too. */
export const UPLOAD_MAX_BYTES = 20 * 1024 * 1024;

const upload = multer({
  storage: multer.memoryStorage(),
  limits: { fileSize: UPLOAD_MAX_BYTES, files: 1, fields: 8, fieldSize: 4096, parts: 10 },
  // File names arrive as UTF-8 from every current browser; busboy's default (latin1) garbles "ü".
  defParamCharset: 'utf8',
});

/** multer's single-file parser with its limits reported as 413/400 naming the limit. */
export const uploadOne: RequestHandler = (req, res, next) =>
  upload.single('file')(req, res, (err: unknown) => {
    if (!err) {
      try {
        assertNoNul(req.body ?? {}, 'upload');
        if (req.file) assertNoNul({ fileName: req.file.originalname }, 'upload');
      } catch (nul) {
        return next(nul);
      }
      return next();
    }
    if (err instanceof multer.MulterError) {
      if (err.code === 'LIMIT_FILE_SIZE')
        return next(new AppError(413, 'file_too_large', `The file is larger than the limit of ${UPLOAD_MAX_BYTES / 1024 / 1024} MiB.`));
      return next(new AppError(400, 'bad_upload', `The upload was refused: ${err.message}${err.field ? ` (${err.field})` : ''}.`));
    }
    // busboy's parse errors (an unterminated or malformed multipart body) are the client's.
    next(
      new AppError(
        400,
        'bad_upload',
        `The upload could not be read: ${(err as Error).message ?? 'malformed multipart body'}. Send the file again as multipart/form-data.`,
      ),
    );
  });
