import { ZxcvbnFactory } from '@zxcvbn-ts/core';
import * as zxcvbnCommon from '@zxcvbn-ts/language-common';
import * as zxcvbnEn from '@zxcvbn-ts/language-en';

/**
 * The password rule, applied wherever a password is set (invitation and first-admin link,
 * change, reset). Length (12 to 200 characters) is checked by the shared schema first; this
 * adds the refusal of common and guessable passwords.
 *
 * Guessability is zxcvbn's estimate (the maintained TypeScript port @zxcvbn-ts, with its
 * common-password and English dictionaries). Its score runs 0–4; 3 means "safely unguessable:
 * moderate protection from an offline slow-hash attack" (~10^8 guesses) in zxcvbn's own
 * scale, and anything below is refused.
 */
export const MIN_SCORE = 3;
/**
 * zxcvbn's run time grows with length and the score no longer changes by then; only the first
 * 100 characters are scored (common practice, no source).
 */
const SCORED_LENGTH = 100;

/** Per process and harmless: the dictionaries, the same in every process, no one's state. */
let factory: ZxcvbnFactory | null = null;
function estimator(): ZxcvbnFactory {
  factory ??= new ZxcvbnFactory({
    dictionary: { ...zxcvbnCommon.dictionary, ...zxcvbnEn.dictionary },
    graphs: zxcvbnCommon.adjacencyGraphs,
    translations: zxcvbnEn.translations,
  });
  return factory;
}

export interface PasswordVerdict {
  score: number;
  /** One sentence: why the password is refused and what to do; null when it is accepted. */
  refusal: string | null;
}

/**
 * Scores a new password. `personal` holds words an attacker would try first for this person:
 * their e-mail address and its parts, their name, the firm's name, the product's name.
 */
export function judgePassword(password: string, personal: string[]): PasswordVerdict {
  const words = new Set<string>(['panelpoint', 'truss', 'trusses']);
  for (const p of personal) {
    const v = p.trim().toLowerCase();
    if (!v) continue;
    words.add(v);
    for (const part of v.split(/[^a-z0-9]+/)) if (part.length >= 3) words.add(part);
  }
  const result = estimator().check(password.slice(0, SCORED_LENGTH), [...words]);
  if (result.score >= MIN_SCORE) return { score: result.score, refusal: null };
  const why = result.feedback.warning ? lowerFirst(stripStop(result.feedback.warning)) : 'it follows a pattern that is quick to guess';
  const hint = result.feedback.suggestions[0];
  const todo = hint
    ? `${lowerFirst(stripStop(hint))}, for example a phrase of four or more unrelated words`
    : 'use a phrase of four or more unrelated words instead';
  return { score: result.score, refusal: `That password is too easy to guess (${why}): ${todo}.` };
}

const stripStop = (s: string) => s.trim().replace(/[.!]+$/, '');
const lowerFirst = (s: string) => (s ? s[0].toLowerCase() + s.slice(1) : s);
