// Joint tags named like spreadsheet columns (bijective base 26): A … Z, AA … AZ, BA … ZZ, AAA …
// Check values are the column letters spreadsheets show for those column numbers (from memory:
// column 27 is AA, 702 is ZZ, 703 is AAA, 16 384 — the last column of a current Excel sheet —
// is XFD, 18 278 is ZZZ); the loop checks the definition digit by digit.
import { describe, expect, it } from 'vitest';
import { memberTagOf, tagOfIndex } from './tags';

/** Column number (1-based) of a spreadsheet column name, by the bijective base-26 definition. */
function columnNumber(name: string): number {
  let n = 0;
  for (const ch of name) n = 26 * n + (ch.charCodeAt(0) - 64);
  return n;
}

describe('tagOfIndex', () => {
  it('when given the index of a known spreadsheet column, then it returns that column name', () => {
    const known: [number, string][] = [
      [1, 'A'],
      [26, 'Z'],
      [27, 'AA'],
      [52, 'AZ'],
      [53, 'BA'],
      [702, 'ZZ'],
      [703, 'AAA'],
      [16_384, 'XFD'],
      [18_278, 'ZZZ'],
      [18_279, 'AAAA'],
    ];
    for (const [column, name] of known) expect(tagOfIndex(column - 1)).toBe(name);
  });

  it('when indices run past four and five letters, then each name reads back as its column number', () => {
    for (const i of [0, 25, 26, 701, 702, 18_277, 18_278, 475_253, 475_254, 96_001, 12_356_629, 12_356_630, 2 ** 31]) {
      const name = tagOfIndex(i);
      expect(name).toMatch(/^[A-Z]+$/);
      expect(columnNumber(name)).toBe(i + 1);
    }
    for (let i = 0; i < 20_000; i += 7) expect(columnNumber(tagOfIndex(i))).toBe(i + 1);
  });
});

describe('memberTagOf', () => {
  it('when both joint tags are one letter, then they are joined; otherwise split by a hyphen', () => {
    expect(memberTagOf('B', 'C')).toBe('BC');
    expect(memberTagOf('AA', 'B')).toBe('AA-B');
  });
});
