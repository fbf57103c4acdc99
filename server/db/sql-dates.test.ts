import seedrandom from 'seedrandom';
import { describe, expect, it } from 'vitest';
import { sqlDate, sqlDateIso } from './sql-dates';

/**
 * The fast reading of Sequelize's SQLite date text against the JS engine's own Date parser
 * (ECMA-262 Date.parse, and its implementation-defined fallback V8 uses for this text) on the
 * same values: the two must agree on every one.
 */
const pad = (n: number, w = 2) => String(n).padStart(w, '0');
/** The text Sequelize's SQLite dialect writes for a DATE: "YYYY-MM-DD HH:MM:SS.SSS +00:00". */
const sqliteText = (d: Date, ms = true) =>
  `${d.getUTCFullYear()}-${pad(d.getUTCMonth() + 1)}-${pad(d.getUTCDate())} ${pad(d.getUTCHours())}:${pad(d.getUTCMinutes())}:${pad(d.getUTCSeconds())}` +
  `${ms ? `.${pad(d.getUTCMilliseconds(), 3)}` : ''} +00:00`;

describe('sqlDateIso and sqlDate', () => {
  it('when 5 000 random instants from 1970 to 2100 are written as SQLite text, then both read them as the engine’s Date parser does', () => {
    const rng = seedrandom('sql-dates-1');
    for (let i = 0; i < 5000; i++) {
      const d = new Date(Math.floor(rng() * 4_102_444_800_000));
      for (const text of [sqliteText(d), sqliteText(d, false), d.toISOString()]) {
        expect(sqlDateIso(text), text).toBe(new Date(text).toISOString());
        expect(sqlDate(text).getTime(), text).toBe(new Date(text).getTime());
      }
    }
  });

  it('when the text has no UTC offset, a Date or a number is given, then the engine reads it (local-time text stays local)', () => {
    for (const v of ['2026-12-03 18:50:27', '2026-12-03', new Date(0), 1_796_323_827_123] as const) {
      expect(sqlDateIso(v)).toBe(new Date(v).toISOString());
    }
    const d = new Date(5);
    expect(sqlDate(d)).toBe(d);
  });
});
