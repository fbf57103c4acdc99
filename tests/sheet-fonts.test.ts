import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { trussSolve } from '@shared/solver';
import { modelFromSketch } from '@shared/solver/test-trusses';
import { buildCalcSheetView, type CalcSheetInput } from '../server/modules/calc-sheets/calc-sheet-view';
import { renderCalcSheetHtml } from '../server/modules/calc-sheets/calc-sheet-html';
import seedrandom from 'seedrandom';
import { notoCssFor, notoFacesFor } from '../server/modules/calc-sheets/sheet-assets';
import { createSheetPrinter, type SheetPrinter } from '../server/modules/calc-sheets/sheet-printer';

/**
 * Joint tags in Arabic, Hebrew, Devanagari and Cyrillic (as a drawing from an office abroad may
 * carry) print with the shipped Noto faces, embedded, and never with a system font or as
 * missing-glyph boxes. Checked with poppler's pdffonts and pdftotext on a real Chromium print.
 */
const CHROMIUM = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium';
const TAGS = { arabic: 'عقدة', hebrew: 'צומת', devanagari: 'बिंदु', cyrillic: 'Узел' };

function input(tags: string[], words: { caseName?: string; note?: string } = {}): CalcSheetInput {
  // A simple triangle of 4 m span and 3 m rise, 10 kN down at the apex (invented example).
  const model = modelFromSketch({
    joints: [[tags[0], 0, 0], [tags[1], 4, 0], [tags[2], 2, 3]],
    members: [[tags[0], tags[1]], [tags[1], tags[2]], [tags[2], tags[0]]],
    supports: [{ at: tags[0], kind: 'pin' }, { at: tags[1], kind: 'roller' }],
    cases: [{ id: 'D', loads: [[tags[2], 0, -10]] }],
  });
  if (words.caseName) model.loadCases[0].name = words.caseName;
  if (words.note) model.loadCases[0].loads[0].note = words.note;
  return {
    firm: { name: 'Orchard Lane Engineers (demo)', address: '12 Mill Row', paperSize: 'A4' },
    project: { name: 'Kiosk canopy', jobNumber: 'OL-1040', unitSystem: 'SI' },
    trussName: 'T2',
    subject: 'Truss T2 — member forces',
    revision: 'P1',
    model,
    analysis: trussSolve(model),
    generatedAt: '2026-05-11T08:00:00Z',
  };
}

describe('non-Latin tags on the calc sheet (real Chromium)', () => {
  let printer: SheetPrinter;
  let dir: string;
  let file: string;
  beforeAll(async () => {
    printer = createSheetPrinter({ chromiumPath: CHROMIUM });
    dir = fs.mkdtempSync(path.join(os.tmpdir(), 'pp-fonts-test-'));
    file = path.join(dir, 'tags.pdf');
    await printer.printToFile(renderCalcSheetHtml(buildCalcSheetView(input([`${TAGS.arabic}1`, `${TAGS.hebrew}2`, `${TAGS.devanagari}3`]))), 'A4', file);
  }, 180_000);
  afterAll(async () => {
    await printer?.close();
    if (dir) fs.rmSync(dir, { recursive: true, force: true });
  });

  it('when tags are Arabic, Hebrew and Devanagari, then pdffonts lists the three Noto faces, every font embedded and none from the system', () => {
    const out = execFileSync('pdffonts', [file], { encoding: 'utf8' });
    const rows = out.split('\n').slice(2).filter((l) => l.trim());
    for (const line of rows) {
      const cols = line.trim().split(/\s+/);
      expect(cols[cols.length - 5], line).toBe('yes');
      expect(cols[0], line).toMatch(/^[A-Z]{6}\+(Inter|KaTeX|NotoSans)/);
    }
    expect(out).toMatch(/NotoSansArabic/);
    expect(out).toMatch(/NotoSansHebrew/);
    expect(out).toMatch(/NotoSansDevanagari/);
  });

  it('when the text is taken back out of the PDF, then the Arabic and Hebrew tags are there as characters', () => {
    const text = execFileSync('pdftotext', [file, '-'], { encoding: 'utf8' });
    // pdftotext writes right-to-left words in logical order when the PDF maps glyphs to Unicode.
    const letters = (s: string) => [...s].filter((c) => /\p{L}/u.test(c)).join('');
    const all = letters(text);
    expect(all.includes(TAGS.arabic) || all.includes([...TAGS.arabic].reverse().join(''))).toBe(true);
    expect(all.includes(TAGS.hebrew) || all.includes([...TAGS.hebrew].reverse().join(''))).toBe(true);
    // U+FFFD or an empty-box character would mean a glyph went missing.
    expect(text).not.toMatch(/[\uFFFD\u25A1]/);
  });

  it('when a sheet is in Latin script alone, then no Noto face is inlined; with a Hebrew tag only the Hebrew faces are', () => {
    expect(notoCssFor(JSON.stringify(buildCalcSheetView(input(['A', 'B', 'C']))))).toBe('');
    const hebrew = notoCssFor(JSON.stringify(buildCalcSheetView(input([`${TAGS.hebrew}1`, 'B', 'C']))));
    expect(hebrew.match(/@font-face/g)).toHaveLength(2); // 400 and 700
    expect(hebrew).toMatch(/font-family:'Noto Sans Hebrew'/);
    expect(hebrew).not.toMatch(/Arabic|Devanagari/);
    const cyrillic = notoCssFor(TAGS.cyrillic);
    expect(cyrillic).toMatch(/font-family:'Noto Sans'/);
  });
});

/**
 * Chinese, Japanese, Korean and Thai: the faces of @fontsource/noto-sans-sc, -jp, -tc, -kr and
 * -thai, inlined subset by subset. The font files' own character maps, read by fontconfig's fc-query (not
 * by our code and not from the packages' unicode.json), are the outside check that a chosen face
 * really holds each character.
 */
// Four rare kana and 丒 U+4E12 are held by the Japanese package's subsets and not the Simplified
// Chinese ones; 亷 U+4EB7 only by the Traditional Chinese package's (fc-query over the files).
const CJK = { chinese: '节点甲', kana: 'カナ', korean: '절점', caseName: 'หลังคา 固定荷重', note: 'ひらがな 하중 น้ำหนักคงที่', rare: 'ヷヸヹヺ 丒 亷' };
const FONTSOURCE = path.resolve(__dirname, '..', 'node_modules', '@fontsource');

/** Code points of each font file (by file name), from fc-query's charset (hex ranges "20-22 a0 …"). */
function fcCharsets(files: string[]): Map<string, Set<number>> {
  const out = execFileSync('fc-query', ['-f', '%{file}\t%{charset}\n', ...files], { encoding: 'utf8', maxBuffer: 64 * 1024 * 1024 });
  const sets = new Map<string, Set<number>>();
  for (const line of out.split('\n').filter(Boolean)) {
    const [file, charset] = line.split('\t');
    const codes = new Set<number>();
    for (const part of charset.trim().split(/\s+/).filter(Boolean)) {
      const [lo, hi] = part.split('-').map((h) => parseInt(h, 16));
      for (let c = lo; c <= (hi ?? lo); c++) codes.add(c);
    }
    sets.set(path.basename(file), codes);
  }
  return sets;
}

/** Scripts (UAX #24 Script property, as the JS regex engine carries it) these packages are for. */
const CJK_SCRIPT = /[\p{Script=Han}\p{Script=Hiragana}\p{Script=Katakana}\p{Script=Hangul}\p{Script=Thai}]/u;

describe('Chinese, Japanese kana, Korean and Thai on the calc sheet (real Chromium)', () => {
  let printer: SheetPrinter;
  let dir: string;
  let file: string;
  let viewText: string;
  beforeAll(async () => {
    printer = createSheetPrinter({ chromiumPath: CHROMIUM });
    dir = fs.mkdtempSync(path.join(os.tmpdir(), 'pp-fonts-cjk-test-'));
    file = path.join(dir, 'cjk.pdf');
    const view = buildCalcSheetView(input([CJK.chinese, CJK.kana, CJK.korean], { caseName: CJK.caseName, note: `${CJK.note} ${CJK.rare}` }));
    viewText = JSON.stringify(view);
    await printer.printToFile(renderCalcSheetHtml(view), 'A4', file);
  }, 180_000);
  afterAll(async () => {
    await printer?.close();
    if (dir) fs.rmSync(dir, { recursive: true, force: true });
  });

  it('when tags, a case name and a note hold Chinese, kana, Korean and Thai, then pdffonts lists Noto Sans SC, JP, TC, KR and Thai, every font embedded and none from the system', () => {
    const out = execFileSync('pdffonts', [file], { encoding: 'utf8' });
    const rows = out.split('\n').slice(2).filter((l) => l.trim());
    for (const line of rows) {
      const cols = line.trim().split(/\s+/);
      expect(cols[cols.length - 5], line).toBe('yes');
      // Without the CJK faces Chromium takes DejaVu Sans from the system and prints empty boxes.
      expect(cols[0], line).toMatch(/^[A-Z]{6}\+(Inter|KaTeX|NotoSans)/);
    }
    expect(out).toMatch(/NotoSansSC/);
    expect(out).toMatch(/NotoSansJP/);
    expect(out).toMatch(/NotoSansTC/);
    expect(out).toMatch(/NotoSansKR/);
    expect(out).toMatch(/NotoSansThai/);
  });

  it('when the text is taken back out of the PDF, then every tag, the case name and the note are there as characters', () => {
    const text = execFileSync('pdftotext', [file, '-'], { encoding: 'utf8' });
    for (const words of Object.values(CJK)) expect(text, words).toContain(words);
    expect(text).not.toMatch(/[\uFFFD\u25A1]/);
  });

  it('when the sheet is built, then each of its Chinese, kana, Korean and Thai characters is in the character map of a face it inlines', () => {
    const faces = notoFacesFor(viewText);
    const maps = fcCharsets([...new Set(faces.map((f) => f.file))]);
    const chars = [...new Set([...viewText].filter((c) => CJK_SCRIPT.test(c)))];
    expect(chars.length).toBeGreaterThan(20);
    for (const c of chars) {
      const holders = faces.filter((f) => maps.get(path.basename(f.file))?.has(c.codePointAt(0)!));
      // Both weights the sheet uses (400 and 700) hold it.
      expect(new Set(holders.map((f) => f.weight)), `${c} U+${c.codePointAt(0)!.toString(16)}`).toEqual(new Set([400, 700]));
    }
  });
});

describe('choosing the CJK and Thai faces over random strings', () => {
  // Every character the shipped subset files hold, by fc-query (the font files themselves): the
  // numbered CJK subsets and the Thai one. (The CJK packages also carry one whole-script file each,
  // "chinese-simplified", "japanese", "chinese-traditional" and "korean", with no unicode-range;
  // neither the sheet nor the app loads them, and they hold fewer Han characters than the subsets.)
  const files = ['noto-sans-sc', 'noto-sans-jp', 'noto-sans-tc', 'noto-sans-kr', 'noto-sans-thai'].flatMap((pkg) => {
    const d = path.join(FONTSOURCE, pkg, 'files');
    return fs.readdirSync(d).filter((f) => /-(\d+|thai)-400-normal\.woff2$/.test(f)).map((f) => path.join(d, f));
  });
  const maps = fcCharsets(files);
  const shipped = [...new Set([...maps.values()].flatMap((s) => [...s]))].filter((c) => CJK_SCRIPT.test(String.fromCodePoint(c))).sort((a, b) => a - b);
  const LATIN = ['A', 'b', '7', ' ', '−', '×', '°', '≤', '·', '—', 'é', 'Ω', '(', ')'];

  it('when a string mixes Latin with characters the shipped files hold, then every such character is in a chosen face, in both weights', () => {
    const rng = seedrandom('cjk-faces-1');
    let checked = 0;
    for (let i = 0; i < 600; i++) {
      let s = '';
      const n = 1 + Math.floor(rng() * 12);
      for (let k = 0; k < n; k++) s += rng() < 0.4 ? LATIN[Math.floor(rng() * LATIN.length)] : String.fromCodePoint(shipped[Math.floor(rng() * shipped.length)]);
      const faces = notoFacesFor(s);
      for (const c of [...s].filter((ch) => CJK_SCRIPT.test(ch))) {
        const weights = new Set(faces.filter((f) => (maps.get(path.basename(f.file).replace(/-700-normal/, '-400-normal')) ?? new Set()).has(c.codePointAt(0)!)).map((f) => f.weight));
        expect(weights, `${JSON.stringify(s)}: ${c}`).toEqual(new Set([400, 700]));
        checked += 1;
      }
    }
    expect(checked).toBeGreaterThan(2000);
  });

  it('when each character the shipped files hold is asked for alone, then a chosen face holds it, in both weights (all of them, not a sample)', () => {
    const lacking: string[] = [];
    for (const c of shipped) {
      const weights = new Set(notoFacesFor(String.fromCodePoint(c)).filter((f) => maps.get(path.basename(f.file).replace(/-700-normal/, '-400-normal'))?.has(c)).map((f) => f.weight));
      if (weights.size !== 2) lacking.push(`U+${c.toString(16)}`);
    }
    expect(shipped.length).toBeGreaterThan(20_000);
    expect(lacking).toEqual([]);
  }, 60_000);

  it('when the font files are read, then cjk-range-gaps.json names exactly the code points each package\'s ranges claim without a glyph, for the installed versions', () => {
    const recorded = JSON.parse(fs.readFileSync(path.resolve(__dirname, '..', 'server', 'modules', 'calc-sheets', 'cjk-range-gaps.json'), 'utf8')) as Record<string, { version: string; gaps: string }>;
    const codes = (range: string) => {
      const out: number[] = [];
      for (const part of range.split(',').filter(Boolean)) {
        const [lo, hi] = part.replace(/U\+/g, '').split('-').map((h) => parseInt(h, 16));
        for (let c = lo; c <= (hi ?? lo); c++) out.push(c);
      }
      return out;
    };
    for (const pkg of ['noto-sans-sc', 'noto-sans-jp', 'noto-sans-tc', 'noto-sans-kr']) {
      const dir = path.join(FONTSOURCE, pkg);
      expect(recorded[pkg]?.version, `${pkg}: run node scripts/cjk-range-gaps.mjs after an upgrade`).toBe(JSON.parse(fs.readFileSync(path.join(dir, 'package.json'), 'utf8')).version);
      const ranges = JSON.parse(fs.readFileSync(path.join(dir, 'unicode.json'), 'utf8')) as Record<string, string>;
      const numbered = Object.entries(ranges).filter(([k]) => /^\[\d+\]$/.test(k));
      const files = numbered.flatMap(([k]) => [400, 700].map((w) => path.join(dir, 'files', `${pkg}-${k.slice(1, -1)}-${w}-normal.woff2`)));
      const held = fcCharsets(files);
      const gaps = new Set<number>();
      for (const [k, range] of numbered) {
        for (const w of [400, 700]) {
          const has = held.get(`${pkg}-${k.slice(1, -1)}-${w}-normal.woff2`)!;
          for (const c of codes(range)) if (!has.has(c)) gaps.add(c);
        }
      }
      expect(codes(recorded[pkg].gaps), pkg).toEqual([...gaps].sort((x, y) => x - y));
    }
  }, 60_000);

  it('when a string holds only Latin and the symbols a Latin sheet uses, then no face is chosen', () => {
    const rng = seedrandom('cjk-faces-2');
    for (let i = 0; i < 300; i++) {
      let s = '';
      for (let k = 0; k < 20; k++) s += LATIN[Math.floor(rng() * LATIN.length)];
      expect(notoFacesFor(s), s).toEqual([]);
    }
  });

  it('when the files are read, then they hold every Hangul syllable, Thai letter and kana, and all but 3 914 of the 20 992 unified Han code points', () => {
    const missing = (lo: number, hi: number) => {
      const out: number[] = [];
      for (let c = lo; c <= hi; c++) if (CJK_SCRIPT.test(String.fromCodePoint(c)) && !shipped.includes(c)) out.push(c);
      return out;
    };
    const text = (cs: number[]) => cs.map((c) => String.fromCodePoint(c)).join('');
    // Block extents from The Unicode Standard (Blocks.txt): 11 172 precomposed Hangul syllables
    // U+AC00–D7A3; Thai letters, vowels and marks U+0E01–0E5B; Hiragana ぁ–ゖ U+3041–3096 and
    // Katakana ァ–ヺ U+30A1–30FA; CJK Unified Ideographs U+4E00–9FFF (20 992 code points, every one
    // assigned since Unicode 14.0).
    expect(text(missing(0xac00, 0xd7a3))).toBe('');
    expect(text(missing(0x0e01, 0x0e5b))).toBe('');
    // The seven rare kana the Chinese and Korean subsets leave out (ゔゕゖヷヸヹヺ) are in the Japanese ones.
    expect(text(missing(0x3041, 0x3096))).toBe('');
    expect(text(missing(0x30a1, 0x30fa))).toBe('');
    // Known gap: each package's numbered subsets hold the characters its language uses most, and
    // the five together still leave out 3 914 unified Han code points (with the Chinese and Korean
    // ones alone it was 8 504). Of these, Noto Sans CJK 2.004 (the full fonts, Debian's
    // fonts-noto-cjk, some 20 MB a weight; checked with fc-query, not shipped) holds all but the
    // 16 of U+9FF0–9FFF, added in Unicode 13.0 and 14.0, which no Noto CJK font of that version
    // holds. They print as empty boxes. Two of them, as a check that the gap is where we say:
    const han = missing(0x4e00, 0x9fff);
    expect(han.length).toBe(3_914);
    expect(han).toContain(0x4e33); // 丳
    expect(han).toContain(0x9fff);
    expect(shipped.filter((c) => c >= 0x4e00 && c <= 0x9fff).length).toBe(20_992 - 3_914);
  });
});
