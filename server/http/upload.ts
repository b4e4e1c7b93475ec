import type { Request, Response } from 'express';
import multer from 'multer';
import { DATASET_LIMITS } from '../../shared/notebook/datasets';
import { AppError } from './errors';

/** An uploaded file, held in memory (at most DATASET_LIMITS.maxFileBytes). */
export interface UploadedFile {
  buffer: Buffer;
  originalname: string;
  size: number;
}

const megabytesOf = (bytes: number) => `${Math.round(bytes / (1024 * 1024))} MB`;

const MULTER_MESSAGES: Record<string, string> = {
  LIMIT_FILE_COUNT: 'Send one file at a time.',
  LIMIT_UNEXPECTED_FILE: 'Send the table in the form field "file", and only one file.',
  LIMIT_FIELD_COUNT: 'The form has too many fields: send "file" and "description".',
  LIMIT_PART_COUNT: 'The form has too many parts: send "file" and "description".',
  LIMIT_FIELD_VALUE: 'A form field is too long.',
  LIMIT_FIELD_KEY: 'A form field name is too long.',
};

function uploadError(error: unknown): AppError {
  if (error instanceof AppError) return error;
  if (error instanceof multer.MulterError) {
    if (error.code === 'LIMIT_FILE_SIZE') {
      return new AppError('payload_too_large', `The file is larger than ${megabytesOf(DATASET_LIMITS.maxFileBytes)}; a dataset file may be at most ${megabytesOf(DATASET_LIMITS.maxFileBytes)}.`);
    }
    return new AppError('validation_failed', MULTER_MESSAGES[error.code] ?? 'The form could not be read.', { file: MULTER_MESSAGES[error.code] ?? 'Not readable' });
  }
  // busboy's complaints about a malformed multipart body
  return new AppError('validation_failed', 'The upload could not be read (a malformed or incomplete multipart form).');
}

const parser = multer({
  storage: multer.memoryStorage(),
  limits: { fileSize: DATASET_LIMITS.maxFileBytes, files: 1, fields: 4, parts: 6, fieldSize: 64 * 1024 },
}).single('file');

/**
 * Reads a multipart form with one file (field "file") into memory; other fields land in req.body as text.
 * Called by the route helper only for routes declared with `upload: 'file'`, after the caller was authorised.
 */
export function readUpload(req: Request, res: Response): Promise<UploadedFile | null> {
  return new Promise((resolve, reject) => {
    if (!req.is('multipart/form-data')) {
      reject(new AppError('validation_failed', 'Upload the table as a multipart form with the fields "file" and "description".', { file: 'Attach a file' }));
      return;
    }
    parser(req, res, (error?: unknown) => {
      if (error) reject(uploadError(error));
      else resolve(req.file ? { buffer: req.file.buffer, originalname: req.file.originalname, size: req.file.size } : null);
    });
  });
}

/** Room a multipart form needs besides the file: boundaries, part headers and the "description" field. */
export const FORM_OVERHEAD_BYTES = 128 * 1024;

/** A form that says it is larger than a file may be is refused before it is read (413). */
export function assertDeclaredSizeFits(req: Request): void {
  const declared = Number(req.get('content-length'));
  if (Number.isFinite(declared) && declared > DATASET_LIMITS.maxFileBytes + FORM_OVERHEAD_BYTES) {
    throw new AppError('payload_too_large', `The upload is larger than ${megabytesOf(DATASET_LIMITS.maxFileBytes)}; a dataset file may be at most ${megabytesOf(DATASET_LIMITS.maxFileBytes)}.`);
  }
}

/** Uploads being read: each is buffered whole, so only one per person and `maxInFlight` server-wide at once. */
export interface UploadGate {
  /** Take a reading slot (429 queue_full when none is free); returns its release. */
  enter(person: string): () => void;
  readonly inFlight: number;
}

export function createUploadGate(maxInFlight: number): UploadGate {
  const reading = new Set<string>();
  return {
    enter(person) {
      if (reading.has(person)) throw new AppError('queue_full', 'You are already uploading a table; wait for it to finish.');
      if (reading.size >= maxInFlight) throw new AppError('queue_full', 'The server is busy reading other uploads; try again in a moment.');
      reading.add(person);
      let released = false;
      return () => {
        if (released) return;
        released = true;
        reading.delete(person);
      };
    },
    get inFlight() {
      return reading.size;
    },
  };
}
