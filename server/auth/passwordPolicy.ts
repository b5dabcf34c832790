import { ZxcvbnFactory } from '@zxcvbn-ts/core';
import * as common from '@zxcvbn-ts/language-common';
import { MIN_PASSWORD_LENGTH, MAX_PASSWORD_LENGTH } from '../../constants/passwords';
import { badRequest, type FieldIssue } from '../errors';

/**
 * The password rule (OWASP ASVS 2.1.1 and 2.1.7): at least MIN_PASSWORD_LENGTH characters, not
 * the person's own e-mail address, and not a common or easily guessed password — judged by
 * zxcvbn-ts with its shipped list of common passwords and English words (score 3 or more of 4,
 * "safely unguessable" by its scale), with the person's e-mail as extra words to avoid.
 */
let checker: ZxcvbnFactory | null = null;
function zxcvbn(): ZxcvbnFactory {
  checker ??= new ZxcvbnFactory({ dictionary: { ...common.dictionary }, graphs: common.adjacencyGraphs });
  return checker;
}

export const MIN_SCORE = 3;

/** Why a password is refused, or null when it is acceptable. */
export function passwordProblem(password: string, email: string): string | null {
  if (password.length < MIN_PASSWORD_LENGTH) return `must be at least ${MIN_PASSWORD_LENGTH} characters`;
  if (password.length > MAX_PASSWORD_LENGTH) return `must be at most ${MAX_PASSWORD_LENGTH} characters`;
  const e = email.trim().toLowerCase();
  const p = password.trim().toLowerCase();
  if (e && (p === e || p.includes(e))) return 'must not be your e-mail address';
  const local = e.split('@')[0];
  const result = zxcvbn().check(password, [e, local, ...local.split(/[._+-]/).filter((w) => w.length >= 3), 'keelson']);
  if (result.score < MIN_SCORE) return 'is too common or too easy to guess: use a longer phrase of unrelated words';
  return null;
}

/** Throws a 400 naming `field` when the password breaks the rule. */
export function checkPassword(password: string, email: string, field: string): void {
  const problem = passwordProblem(password, email);
  if (problem) {
    const issues: FieldIssue[] = [{ path: field, message: problem }];
    throw badRequest('The new password does not meet the rule.', issues);
  }
}
