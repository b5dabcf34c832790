import { z } from 'zod';

/**
 * One line of text (names, titles): trimmed, no control characters — a CR or LF in a title
 * would end up in a mail header or a CSV row.
 */
export const singleLine = (max: number) =>
  z
    .string('must be text')
    .trim()
    .min(1, 'must not be empty')
    .max(max, `must be at most ${max} characters`)
    .refine((s) => !/[\u0000-\u001f\u007f]/.test(s), 'must be one line (no line breaks or control characters)');
