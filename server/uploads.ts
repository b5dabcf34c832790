import { Readable } from 'node:stream';
import type { RequestHandler } from 'express';
import multer from 'multer';
import { parse } from 'csv-parse';
import { HttpError, type FieldIssue } from './errors';
import { parsePercentInput } from '../figures';

/** Largest accepted upload. 5 MB holds roughly 80,000 membership rows. */
export const MAX_UPLOAD_BYTES = 5 * 1024 * 1024;
/** Most row problems listed in one answer; the total is always given. */
export const MAX_LISTED_PROBLEMS = 100;

// Browsers label .csv files differently (Windows often says vms-excel; a bare Blob says octet-stream),
// so the name must end in .csv and the declared type must be one of these text-ish types.
const CSV_TYPES = new Set(['text/csv', 'application/csv', 'text/plain', 'application/vnd.ms-excel', 'application/octet-stream', 'text/comma-separated-values']);

const upload = multer({
  storage: multer.memoryStorage(),
  limits: { fileSize: MAX_UPLOAD_BYTES, files: 1, fields: 10 },
  fileFilter: (_req, file, cb) => {
    const typeOk = CSV_TYPES.has(file.mimetype.toLowerCase());
    if (!/\.csv$/i.test(file.originalname) || !typeOk) {
      cb(new HttpError(400, `Only .csv files are accepted (got "${file.originalname}", ${file.mimetype}).`, [{ path: 'file', message: 'must be a .csv file (text/csv)' }], 'invalid_file'));
      return;
    }
    cb(null, true);
  },
});

/**
 * Accepts one CSV file in the multipart field `file` (memory storage, size-limited,
 * type-checked). Multer's own errors become 400/413 answers naming the field.
 */
export function csvUpload(field = 'file'): RequestHandler {
  const single = upload.single(field);
  return (req, res, next) => {
    if (!req.is('multipart/form-data')) {
      next(new HttpError(400, 'Send the file as multipart/form-data.', [{ path: field, message: 'no file was sent' }], 'invalid_file'));
      return;
    }
    single(req, res, (err?: unknown) => {
      if (!err) {
        if (!req.file) return next(new HttpError(400, 'No file was sent.', [{ path: field, message: 'no file was sent' }], 'invalid_file'));
        return next();
      }
      if (err instanceof multer.MulterError) {
        if (err.code === 'LIMIT_FILE_SIZE') return next(new HttpError(413, `The file is larger than ${MAX_UPLOAD_BYTES / 1024 / 1024} MB.`, [{ path: field, message: 'is too large' }], 'file_too_large'));
        return next(new HttpError(400, `The upload was not understood: ${err.message}.`, [{ path: err.field ?? field, message: err.message }], 'invalid_file'));
      }
      next(err);
    });
  };
}

/** One problem in an uploaded CSV: 1-based line number in the file (the header is line 1). */
export type CsvProblem = { line: number; column: string; message: string };

/** Collects row problems, keeping the first MAX_LISTED_PROBLEMS and counting all. */
export class CsvProblems {
  readonly listed: CsvProblem[] = [];
  total = 0;
  add(line: number, column: string, message: string) {
    this.total++;
    if (this.listed.length < MAX_LISTED_PROBLEMS) this.listed.push({ line, column, message });
  }
  get any() {
    return this.total > 0;
  }
  /** The 400 answer: every listed problem as an issue with its line and column, and the total. */
  toError(): HttpError {
    const lines = new Set(this.listed.map((p) => p.line)).size;
    const more = this.total > this.listed.length ? ` The first ${this.listed.length} are listed.` : '';
    const issues: (FieldIssue & CsvProblem)[] = this.listed.map((p) => ({ ...p, path: `line ${p.line}${p.column ? `, ${p.column}` : ''}` }));
    return new HttpError(
      400,
      `The file has ${this.total} problem${this.total === 1 ? '' : 's'}${this.total === this.listed.length ? ` on ${lines} line${lines === 1 ? '' : 's'}` : ''}; nothing was stored.${more}`,
      issues,
      'invalid_csv',
    );
  }
}

/**
 * Streams a CSV buffer through csv-parse, calling `onHeader` with the first record and
 * `onRow` with every later one and its line number. Blank lines are skipped; cells are trimmed.
 * A malformed file (unclosed quote, binary content) is reported as a problem at its line.
 */
export async function readCsv(
  buffer: Buffer,
  problems: CsvProblems,
  onHeader: (cells: string[]) => void,
  onRow: (cells: string[], line: number) => void,
): Promise<void> {
  if (buffer.includes(0)) {
    problems.add(1, '', 'the file is not text (it contains binary data)');
    return;
  }
  const parser = Readable.from([buffer]).pipe(
    parse({ bom: true, trim: true, skip_empty_lines: true, relax_column_count: true, info: true }),
  );
  let first = true;
  try {
    for await (const item of parser as AsyncIterable<{ record: string[]; info: { lines: number } }>) {
      if (first) {
        first = false;
        onHeader(item.record);
      } else onRow(item.record, item.info.lines);
    }
  } catch (e) {
    const err = e as { lines?: number; message?: string };
    problems.add(err.lines ?? 0, '', `the file cannot be read as CSV: ${err.message ?? String(e)}`);
  }
  if (first && !problems.any) problems.add(1, '', 'the file is empty');
}

/** A number cell: plain decimals, optional thousands separators; `percent` allows "8%" (= 0.08). */
export function numberCell(raw: string, opts: { percent?: boolean } = {}): number | string {
  let s = raw.trim();
  if (s === '') return 'is empty';
  const percent = !!opts.percent && s.endsWith('%');
  if (percent) s = s.slice(0, -1).trim();
  const cleaned = s.replace(/,(?=\d{3}(\D|$))/g, '');
  if (!/^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/.test(cleaned)) return `"${raw}" is not a number`;
  // "8.3%" becomes the fraction at the edge without floating-point noise (figures/numbers.ts).
  if (percent) return parsePercentInput(cleaned) ?? `"${raw}" is not a percentage written as a plain decimal`;
  return Number(cleaned);
}
