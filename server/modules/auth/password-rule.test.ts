import { describe, expect, it } from 'vitest';
import { ZxcvbnFactory } from '@zxcvbn-ts/core';
import * as zxcvbnCommon from '@zxcvbn-ts/language-common';
import * as zxcvbnEn from '@zxcvbn-ts/language-en';
import { judgePassword, MIN_SCORE } from './password-rule';

/** zxcvbn itself, built here from the published dictionaries: the reference for each verdict. */
const reference = new ZxcvbnFactory({
  dictionary: { ...zxcvbnCommon.dictionary, ...zxcvbnEn.dictionary },
  graphs: zxcvbnCommon.adjacencyGraphs,
  translations: zxcvbnEn.translations,
});

describe('the password rule', () => {
  it('when no personal words are given, then a password is refused exactly when zxcvbn scores it below 3', () => {
    // Samples: well-known common passwords and keyboard walks, then invented phrases.
    const samples = ['password1234', 'qwertyuiop123', 'iloveyou1234', '123456789012', 'aaaaaaaaaaaa', 'letmein12345', 'kiln mortise ladder fern 71', 'gusset heron quarry velvet 38', 'Summer2024!!'];
    let refused = 0;
    for (const p of samples) {
      const expectedRefused = reference.check(p, ['panelpoint', 'truss', 'trusses']).score < MIN_SCORE;
      expect(judgePassword(p, []).refusal !== null, p).toBe(expectedRefused);
      if (expectedRefused) refused += 1;
    }
    // Both outcomes occur in the sample, so the check above cannot pass by always answering the same.
    expect(refused).toBeGreaterThan(0);
    expect(refused).toBeLessThan(samples.length);
  });

  it('when the password is the parts of the person’s e-mail address run together, then it is refused though zxcvbn alone scores it 4', () => {
    // zxcvbn scores this 4 without user inputs and 4 with the whole address as one input;
    // only the address's parts as separate words expose it.
    expect(reference.check('zephyrinekowalczyk').score).toBe(4);
    expect(reference.check('zephyrinekowalczyk', ['zephyrine.kowalczyk@example.com']).score).toBe(4);
    expect(reference.check('zephyrinekowalczyk', ['zephyrine', 'kowalczyk']).score).toBeLessThan(MIN_SCORE);
    expect(judgePassword('zephyrinekowalczyk', ['zephyrine.kowalczyk@example.com']).refusal).not.toBeNull();
    expect(judgePassword('zephyrinekowalczyk', ['someone.else@example.com']).refusal).toBeNull();
  });

  it('when a password is refused, then the one sentence carries zxcvbn’s warning and says what to do', () => {
    const warning = reference.check('password1234').feedback.warning!;
    const { refusal } = judgePassword('password1234', []);
    expect(refusal).toContain(`(${warning.replace(/\.$/, '').replace(/^./, (c) => c.toLowerCase())})`);
    expect(refusal).toMatch(/^That password is too easy to guess \(.+\): .+ unrelated words\.$/);
    expect(refusal!.split(/\.\s/)).toHaveLength(1);
  });

  it('when zxcvbn gives no warning for a weak password, then the sentence still gives a reason and zxcvbn’s suggestion', () => {
    // Two common words run together: zxcvbn scores it below 3 and has no warning for it.
    const r = reference.check('correcthorse');
    expect(r.score).toBeLessThan(MIN_SCORE);
    expect(r.feedback.warning).toBeNull();
    expect(judgePassword('correcthorse', []).refusal).toBe(
      'That password is too easy to guess (it follows a pattern that is quick to guess): add more words that are less common, for example a phrase of four or more unrelated words.',
    );
  });
});
