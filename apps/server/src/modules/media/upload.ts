import { randomUUID } from 'node:crypto';
import type { RequestHandler } from 'express';
import multer from 'multer';
import { badRequest, HttpError } from '../../http/errors.ts';

/** Sizes in words for messages: "25 MB", "4 GB". */
export function sizeInWords(bytes: number): string {
  if (bytes >= 1024 ** 3) return `${Math.round((bytes / 1024 ** 3) * 10) / 10} GB`;
  if (bytes >= 1024 ** 2) return `${Math.round((bytes / 1024 ** 2) * 10) / 10} MB`;
  return `${Math.round(bytes / 1024)} KB`;
}

/**
 * A name a phone or browser gives a file is shown to people, never used as a path. One
 * that carries a folder ("../../etc/passwd", "C:\\x") or control characters is refused:
 * something is trying to write where it should not.
 */
export function fileNameProblem(name: string): string | null {
  // eslint-disable-next-line no-control-regex -- control characters are what is refused
  if (/[/\\]/.test(name) || /[\u0000-\u001f\u007f]/.test(name) || name === '.' || name === '..') {
    return 'The file name contains a folder path or control characters. Rename the file and try again.';
  }
  if (name.length > 255) return 'The file name is longer than 255 characters. Rename the file and try again.';
  return null;
}

/** Map multer's and busboy's errors onto clear problems; multer has already removed any partial file. */
function uploadProblem(err: unknown, what: string, maxBytes: number): unknown {
  if (err instanceof HttpError) return err;
  if (err instanceof multer.MulterError) {
    switch (err.code) {
      case 'LIMIT_FILE_SIZE':
        return new HttpError(413, 'file_too_large', `This ${what} is larger than the ${sizeInWords(maxBytes)} we accept.`);
      case 'LIMIT_UNEXPECTED_FILE':
      case 'LIMIT_FILE_COUNT':
        return badRequest(`Send one ${what} at a time, in the form field named "${err.field ?? ''}".`.replace(' named ""', ''));
      default:
        return badRequest(`The upload form is not what this endpoint expects (${err.code.toLowerCase().replace(/_/g, ' ')}).`);
    }
  }
  const message = (err as Error)?.message ?? '';
  if (/unexpected end of form|request aborted|request closed|premature close/i.test(message)) {
    return new HttpError(400, 'upload_incomplete', `The ${what} upload was cut off before it finished. Nothing was kept; try again.`);
  }
  if (/boundary|multipart|malformed/i.test(message)) {
    return badRequest(`Send the ${what} as multipart/form-data.`);
  }
  return err;
}

/**
 * One file in one named field, streamed to a temporary file on the storage's disk
 * (multer's DiskStorage: never held in memory), with a size limit. The handler
 * after it takes the temporary file over or removes it.
 */
export function singleFileUpload(options: { incomingDir: string; field: string; maxBytes: number; what: string }): RequestHandler {
  // multer 2 passes these buffer sizes to busboy; its type definitions do not list them yet.
  const settings: multer.Options & { highWaterMark?: number; fileHwm?: number } = {
    storage: multer.diskStorage({
      destination: options.incomingDir,
      filename: (_req, _file, callback) => callback(null, `${randomUUID()}.upload`),
    }),
    // Keep any folder part of the client's file name, so it can be refused rather than silently cut off.
    preservePath: true,
    limits: { fileSize: options.maxBytes, files: 1, fields: 12, fieldSize: 2000, parts: 14, headerPairs: 40 },
    // Larger buffers than busboy's 16 KB default: far fewer chunks to pass along for a video of hundreds of MB,
    // still a bounded amount of memory per upload.
    highWaterMark: 1024 * 1024,
    fileHwm: 1024 * 1024,
    fileFilter: (_req, file, callback) => {
      const problem = fileNameProblem(file.originalname);
      if (problem) callback(new HttpError(400, 'unsafe_file_name', problem));
      else callback(null, true);
    },
  };
  const upload = multer(settings).single(options.field);

  return (req, res, next) => {
    upload(req, res, (err?: unknown) => next(err ? uploadProblem(err, options.what, options.maxBytes) : undefined));
  };
}
