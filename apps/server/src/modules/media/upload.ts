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
 * Folder separators: "/" and "\\", their percent-encoded forms, and the look-alikes that a
 * "best fit" conversion to a Windows code page turns back into them (full-width solidus and
 * reverse solidus U+FF0F, U+FF3C; division slash U+2215).
 */
const FOLDER_SEPARATOR = /[/\\\u2215\uff0f\uff3c]|%(2f|5c)/i;
/**
 * Control characters (C0, DEL, C1, and an encoded NUL) and the invisible marks that reorder or
 * break a line of text: the bidirectional controls of Unicode UAX #9 (U+061C, U+200E, U+200F,
 * U+202A–U+202E, U+2066–U+2069) and the line and paragraph separators U+2028, U+2029. A
 * right-to-left override makes "photo\u202egnp.exe" read as "photoexe.png".
 */
// eslint-disable-next-line no-control-regex -- control characters are what is refused
const HIDDEN_CHARACTER = /[\u0000-\u001f\u007f-\u009f\u061c\u200e\u200f\u2028-\u202e\u2066-\u2069]|%00/i;
// eslint-disable-next-line no-control-regex -- the same set, to show each one as an escape
const HIDDEN_CHARACTERS = /[\u0000-\u001f\u007f-\u009f\u061c\u200e\u200f\u2028-\u202e\u2066-\u2069]/g;

/** A refused name as it can safely be shown back: hidden characters as escapes, at most 80 characters. */
function shownName(name: string): string {
  const visible = name.replace(HIDDEN_CHARACTERS, (c) => `\\u${c.charCodeAt(0).toString(16).toUpperCase().padStart(4, '0')}`);
  return visible.length > 80 ? `${visible.slice(0, 80)}…` : visible;
}

/**
 * A name a phone or browser gives a file is shown to people, never used as a path. One
 * that carries a folder ("../../etc/passwd", "C:\\x") or control characters is refused:
 * something is trying to write where it should not, or to pass one file type off as another.
 */
export function fileNameProblem(name: string): string | null {
  if (FOLDER_SEPARATOR.test(name) || name === '.' || name === '..') {
    return `The file name “${shownName(name)}” contains a folder path. Rename the file to a plain name (like photo.jpg) and try again.`;
  }
  if (HIDDEN_CHARACTER.test(name)) {
    return `The file name “${shownName(name)}” contains control or invisible characters. Rename the file and try again.`;
  }
  if (name.length > 255) return `The file name is ${name.length} characters long; up to 255 are accepted. Rename the file and try again.`;
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
  // busboy cannot read a part header holding raw control characters; in an upload the part header a person controls is the file name.
  if (/malformed part header/i.test(message)) {
    return new HttpError(
      400,
      'unsafe_file_name',
      `The file name could not be read: it contains control characters, or the form around the ${what} is broken. Rename the file and try again.`,
    );
  }
  // A body that stops early (busboy) or a connection that goes away (Node's "aborted", ECONNRESET), whichever is noticed first.
  if (
    /unexpected end of (form|file)|aborted|request closed|premature close/i.test(message) ||
    (err as NodeJS.ErrnoException)?.code === 'ECONNRESET'
  ) {
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
 * after it takes the temporary file over or removes it. Without `incomingDir` the
 * file is held in memory (for small files only: the company logo), so every upload
 * is received here, with the same name checks and the same problems.
 */
export function singleFileUpload(options: {
  incomingDir?: string;
  field: string;
  maxBytes: number;
  what: string;
  /** Text fields allowed beside the file. */
  fields?: number;
}): RequestHandler {
  const fields = options.fields ?? 12;
  // multer 2 passes these buffer sizes to busboy; its type definitions do not list them yet.
  const settings: multer.Options & { highWaterMark?: number; fileHwm?: number } = {
    storage: options.incomingDir
      ? multer.diskStorage({
          destination: options.incomingDir,
          filename: (_req, _file, callback) => callback(null, `${randomUUID()}.upload`),
        })
      : multer.memoryStorage(),
    // Keep any folder part of the client's file name, so it can be refused rather than silently cut off.
    preservePath: true,
    // Browsers send the file name as raw UTF-8 (WHATWG multipart/form-data); busboy would read it as Latin-1.
    defParamCharset: 'utf8',
    limits: { fileSize: options.maxBytes, files: 1, fields, fieldSize: 2000, parts: fields + 2, headerPairs: 40 },
    // Larger buffers than busboy's 16 KB default: far fewer chunks to pass along for a video of hundreds of MB,
    // still a bounded amount of memory per upload.
    highWaterMark: 1024 * 1024,
    fileHwm: 1024 * 1024,
    fileFilter: (_req, file, callback) => {
      const problem = fileNameProblem(file.originalname);
      if (problem) callback(new HttpError(400, 'unsafe_file_name', problem, [{ path: options.field, message: problem }]));
      else callback(null, true);
    },
  };
  const upload = multer(settings).single(options.field);

  return (req, res, next) => {
    upload(req, res, (err?: unknown) => next(err ? uploadProblem(err, options.what, options.maxBytes) : undefined));
  };
}
