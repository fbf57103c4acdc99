import { execFile, execFileSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import zlib from 'node:zlib';
import { promisify } from 'node:util';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { trussSolve } from '@shared/solver';
import { modelFromSketch, parallelChordSketch } from '@shared/solver/test-trusses';
import { numberFormat } from '@shared/units';
import { buildCalcSheetView, type CalcSheetInput } from '../server/modules/calc-sheets/calc-sheet-view';
import { renderCalcSheetHtml } from '../server/modules/calc-sheets/calc-sheet-html';
import { createSheetPrinter, SheetPrintError, type SheetPrinter } from '../server/modules/calc-sheets/sheet-printer';

const run = promisify(execFile);
const root = path.resolve(import.meta.dirname, '..');
const CHROMIUM = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium';
const SLOW = 180_000; // printing on a shared 2-core machine; speed is measured in bench/sheet.bench.ts

// Parallel-chord Pratt, n = 6 panels of a = 3 m, depth h = 4 m, P = 10 kN at L1…L5 (demo truss).
// Closed forms by the method of sections (Hibbeler, Structural Analysis,
// method of sections): R = (n − 1)P/2; mid-span top chord −M/h with M = P·a·n²/8.
const n = 6;
const a = 3;
const h = 4;
const P = 10;
const R = ((n - 1) * P) / 2; // 25 kN
const topChord = -(P * a * n * n) / 8 / h; // −33.75 kN
// The end diagonal carries the end-panel shear: +R·d/h with d = √(a² + h²) (same source).
const endDiagonal = (R * Math.hypot(a, h)) / h; // +31.25 kN

function demoInput(paper: 'A4' | 'Letter' = 'A4'): CalcSheetInput {
  const model = modelFromSketch(parallelChordSketch('pratt', n, a, h, P));
  return {
    firm: { name: 'Harrow & Vale Structural (demo)', address: '4 Tanner’s Yard, Northgate', paperSize: paper },
    project: { name: 'Kestrel Logistics — warehouse roof', jobNumber: 'HV-2417', unitSystem: 'SI', designBasis: 'Demo truss.' },
    trussName: 'T1',
    subject: 'Truss T1 — member forces',
    revision: 'B',
    preparedBy: { name: 'A. Marsh', date: '2026-03-02' },
    checkedBy: { name: 'J. Okafor', date: '2026-03-04' },
    model,
    analysis: trussSolve(model),
    generatedAt: '2026-03-04T09:00:00Z',
  };
}

function pdfText(file: string, first?: number): string {
  const range = first ? ['-f', String(first), '-l', String(first)] : [];
  return execFileSync('pdftotext', ['-layout', ...range, file, '-'], { encoding: 'utf8' });
}

function pdfInfo(file: string): { pages: number; size: string } {
  const out = execFileSync('pdfinfo', [file], { encoding: 'utf8' });
  return { pages: Number(/Pages:\s+(\d+)/.exec(out)?.[1]), size: /Page size:\s+(.*)/.exec(out)?.[1] ?? '' };
}

/** Decodes an 8-bit greyscale or RGB PNG (what pdftoppm writes) into its pixels. */
function pngDecode(buf: Buffer): { width: number; height: number; channels: number; pixels: Buffer } {
  expect(buf.subarray(0, 8).toString('hex')).toBe('89504e470d0a1a0a');
  let pos = 8;
  let width = 0;
  let height = 0;
  let channels = 0;
  const idat: Buffer[] = [];
  while (pos < buf.length) {
    const len = buf.readUInt32BE(pos);
    const type = buf.toString('ascii', pos + 4, pos + 8);
    const data = buf.subarray(pos + 8, pos + 8 + len);
    if (type === 'IHDR') {
      width = data.readUInt32BE(0);
      height = data.readUInt32BE(4);
      expect(data[8]).toBe(8);
      channels = { 0: 1, 2: 3 }[data[9]] as number;
    } else if (type === 'IDAT') idat.push(data);
    pos += 12 + len;
  }
  const raw = zlib.inflateSync(Buffer.concat(idat));
  const stride = width * channels;
  const pixels = Buffer.alloc(stride * height);
  for (let y = 0; y < height; y++) {
    const filter = raw[y * (stride + 1)];
    for (let x = 0; x < stride; x++) {
      const v = raw[y * (stride + 1) + 1 + x];
      const left = x >= channels ? pixels[y * stride + x - channels] : 0;
      const up = y > 0 ? pixels[(y - 1) * stride + x] : 0;
      const ul = y > 0 && x >= channels ? pixels[(y - 1) * stride + x - channels] : 0;
      let pred = 0;
      if (filter === 1) pred = left;
      else if (filter === 2) pred = up;
      else if (filter === 3) pred = (left + up) >> 1;
      else if (filter === 4) {
        const p = left + up - ul;
        const pa = Math.abs(p - left);
        const pb = Math.abs(p - up);
        const pc = Math.abs(p - ul);
        pred = pa <= pb && pa <= pc ? left : pb <= pc ? up : ul;
      }
      pixels[y * stride + x] = (v + pred) & 0xff;
    }
  }
  return { width, height, channels, pixels };
}

describe('calc sheet PDF', () => {
  let printer: SheetPrinter;
  let dir: string;
  let pdfFile: string;

  beforeAll(async () => {
    printer = createSheetPrinter({ chromiumPath: CHROMIUM });
    dir = fs.mkdtempSync(path.join(os.tmpdir(), 'panelpoint-sheet-test-'));
    pdfFile = path.join(dir, 'pratt.pdf');
    await printer.printToFile(renderCalcSheetHtml(buildCalcSheetView(demoInput())), 'A4', pdfFile);
  }, SLOW);

  afterAll(async () => {
    await printer?.close();
    if (dir) fs.rmSync(dir, { recursive: true, force: true });
  });

  it('when the demo Pratt truss is printed, then the reactions, the mid-span top chord and the end diagonal read their closed-form values', () => {
    const text = pdfText(pdfFile);
    const r = numberFormat(R, 2);
    expect(text).toMatch(new RegExp(`L0\\s+Pin\\s+0\\.00\\s+${r}\\s+${r}`));
    expect(text).toMatch(new RegExp(`L6\\s+Roller\\s+0\\.00\\s+${r}\\s+${r}`));
    expect(text).toMatch(new RegExp(`U2U3\\s+—\\s+3\\.000\\s+${numberFormat(topChord, 2)}\\s+\\(C\\)`));
    expect(text).toMatch(new RegExp(`U0L1\\s+—\\s+5\\.000\\s+${numberFormat(endDiagonal, 2, { signed: true }).replace('+', '\\+')}\\s+\\(T\\)`));
  });

  it('when the residual check is printed, then its value is at most 1e-9 of the largest load and the sheet says equilibrium holds', () => {
    const text = pdfText(pdfFile);
    // Written m × 10ⁿ, the exponent raised in Inter's figures (pdftotext reads "2.01 × 10−14"), or 0;
    // never the computer's 2.01e-14.
    const row = /^\s*D\s+10\.00\s+(0|\d\.\d\d × 10 ?\u2212?\d+)\s+\S+.*OK\s*$/m.exec(text);
    expect(row).not.toBeNull();
    expect(text).not.toMatch(/\de[+-]\d/);
    const [m, e] = row![1] === "0" ? ["0", "0"] : row![1].split(" × 10").map((x) => x.trim());
    expect(Number(m) * 10 ** Number(e.replace('\u2212', '-'))).toBeLessThanOrEqual(1e-9 * P);
    expect(text).toMatch(/every joint is in equilibrium/);
  });

  it('when the sheet is printed, then every page carries the title block with "Sheet i of N" and N is the page count', () => {
    const { pages, size } = pdfInfo(pdfFile);
    // A4 = 210 × 297 mm (ISO 216) = 595.28 × 841.89 pt; Chromium rounds to its own page units.
    const [w, hgt] = size.split(' x ').map((v) => parseFloat(v));
    expect(Math.abs(w - 595.28)).toBeLessThan(1);
    expect(Math.abs(hgt - 841.89)).toBeLessThan(1);
    // One cover, design basis, geometry, supports/loads/stability, a case of 14 joints with
    // free-body diagrams, force table, diagram, envelope and residual: well over 6 pages.
    expect(pages).toBeGreaterThan(6);
    for (let i = 1; i <= pages; i++) {
      const page = pdfText(pdfFile, i);
      expect(page).toContain(`Sheet ${i} of ${pages}`);
      expect(page).toContain('Harrow & Vale Structural (demo)');
      expect(page).toContain('HV-2417');
      expect(page).toContain('Revision B');
      expect(page).toMatch(/Prepared by A\. Marsh, 2026-03-02\s+·\s+Checked by J\. Okafor, 2026-03-04/);
    }
    expect(pdfText(pdfFile, pages)).toContain('End of calculation');
  });

  it('when the fonts are listed, then every font is embedded and each is Inter or KaTeX (no system fallback)', () => {
    const out = execFileSync('pdffonts', [pdfFile], { encoding: 'utf8' });
    const rows = out.split('\n').slice(2).filter((l) => l.trim());
    expect(rows.length).toBeGreaterThan(3);
    for (const line of rows) {
      const cols = line.trim().split(/\s+/);
      const emb = cols[cols.length - 5];
      expect(emb, line).toBe('yes');
      expect(cols[0], line).toMatch(/^[A-Z]{6}\+(Inter|KaTeX)/);
    }
    expect(out).toMatch(/Inter-Regular/);
    expect(out).toMatch(/KaTeX_Main-Regular/);
    expect(out).toMatch(/KaTeX_Math-Italic/);
  });

  it('when page 1 is rendered to PNG, then it has the A4 size in pixels and ink on it', () => {
    const base = path.join(dir, 'page');
    execFileSync('pdftoppm', ['-r', '50', '-f', '1', '-l', '1', '-gray', '-png', '-singlefile', pdfFile, base]);
    const png = pngDecode(fs.readFileSync(`${base}.png`));
    // 210 × 297 mm at 50 dpi = 413.4 × 584.6 px.
    expect(png.width).toBeGreaterThanOrEqual(413);
    expect(png.width).toBeLessThanOrEqual(414);
    expect(png.height).toBeGreaterThanOrEqual(584);
    expect(png.height).toBeLessThanOrEqual(585);
    let dark = 0;
    for (let i = 0; i < png.pixels.length; i += png.channels) if (png.pixels[i] < 128) dark++;
    const share = dark / (png.width * png.height);
    expect(share).toBeGreaterThan(0.005);
    expect(share).toBeLessThan(0.5);
  });

  it('when the firm prints on US Letter, then the PDF pages are 8.5 × 11 in', async () => {
    const pdf = await printer.print(renderCalcSheetHtml(buildCalcSheetView(demoInput('Letter'))), 'Letter');
    const file = path.join(dir, 'letter.pdf');
    fs.writeFileSync(file, pdf);
    expect(pdfInfo(file).size).toMatch(/^612 x 792 pts/);
  }, SLOW);

  it('when the browser process is killed between two prints, then the second print starts a new browser and succeeds', async () => {
    const html = renderCalcSheetHtml(buildCalcSheetView(demoInput()));
    await printer.print(html, 'A4');
    const pid = printer.browserPid();
    expect(pid).not.toBeNull();
    process.kill(pid as number, 'SIGKILL');
    const pdf = await printer.print(html, 'A4');
    expect(pdf.subarray(0, 5).toString()).toBe('%PDF-');
    expect(printer.browserPid()).not.toBe(pid);
  }, SLOW);

  it('when three prints are asked for at once, then they share one browser and all succeed', async () => {
    const html = renderCalcSheetHtml(buildCalcSheetView(demoInput()));
    const pids = new Set<number | null>();
    const jobs = [0, 1, 2].map(async () => {
      const pdf = await printer.print(html, 'A4');
      pids.add(printer.browserPid());
      return pdf;
    });
    const pdfs = await Promise.all(jobs);
    expect(pdfs.every((p) => p.subarray(0, 5).toString() === '%PDF-')).toBe(true);
    expect(pids.size).toBe(1);
  }, SLOW);

  it('when a print times out, then it fails with print-timeout and leaves no file, temporary or final', async () => {
    const quick = createSheetPrinter({ chromiumPath: CHROMIUM, timeoutMs: 1 });
    const out = path.join(dir, 'timeout', 'never.pdf');
    fs.mkdirSync(path.dirname(out));
    try {
      await expect(quick.printToFile(renderCalcSheetHtml(buildCalcSheetView(demoInput())), 'A4', out)).rejects.toMatchObject({ code: 'print-timeout' });
    } finally {
      await quick.close();
    }
    expect(fs.readdirSync(path.dirname(out))).toEqual([]);
  }, SLOW);

  it('when Chromium is missing, then printing fails once with the install command', async () => {
    const missing = createSheetPrinter({ chromiumPath: path.join(dir, 'no-such-chromium') });
    const err = await missing.print('<p>x</p>', 'A4').catch((e: unknown) => e);
    await missing.close();
    expect(err).toBeInstanceOf(SheetPrintError);
    expect(err).toMatchObject({ code: 'chromium-missing' });
    expect((err as Error).message).toContain('apt-get install -y chromium');
  });

  it('when the truss is unstable, then the short sheet states the finding, names the joints and prints no forces', async () => {
    const model = modelFromSketch({
      joints: [['A', 0, 0], ['B', 4, 0], ['C', 4, 3], ['D', 0, 3]],
      members: [['A', 'B'], ['B', 'C'], ['C', 'D'], ['D', 'A']],
      supports: [{ at: 'A', kind: 'pin' }, { at: 'B', kind: 'roller' }],
      cases: [{ id: 'W', loads: [['D', 5, 0]] }],
    });
    const file = path.join(dir, 'unstable.pdf');
    await printer.printToFile(renderCalcSheetHtml(buildCalcSheetView({ ...demoInput(), model, analysis: trussSolve(model) })), 'A4', file);
    const text = pdfText(file);
    expect(text).toMatch(/Unstable/);
    expect(text).toMatch(/No reactions or member forces are given/);
    expect(text).not.toMatch(/Member forces, case|Resultant \(kN\)|case-W\//);
    // Cover, finding with the drawing, design basis: a short sheet.
    expect(pdfInfo(file).pages).toBeLessThanOrEqual(4);
  }, SLOW);
});

describe('sheet command', () => {
  const sheet = (...args: string[]) =>
    run(process.execPath, [path.join(root, 'node_modules', 'tsx', 'dist', 'cli.mjs'), path.join(root, 'scripts', 'sheet.ts'), ...args], { cwd: root }).then(
      (r) => ({ code: 0, stderr: r.stderr }),
      (e: { code: number; stderr: string }) => ({ code: e.code, stderr: e.stderr }),
    );
  let dir: string;
  beforeAll(() => {
    dir = fs.mkdtempSync(path.join(os.tmpdir(), 'panelpoint-sheet-cmd-'));
  });
  afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

  const expectOneLineExit2 = (r: { code: number; stderr: string }, pattern: RegExp) => {
    expect(r.code).toBe(2);
    expect(r.stderr.trim().split('\n')).toHaveLength(1);
    expect(r.stderr).toMatch(pattern);
  };

  it('when the output path is missing, then it exits 2 with the usage line', async () => {
    expectOneLineExit2(await sheet(path.join(root, 'tests/fixtures/sheets/pratt-6-panel.json')), /Usage: npm run -s sheet -- JOB\.json OUT\.pdf/);
  }, SLOW);

  it('when the job file does not exist or is not JSON, then it exits 2 naming the file and writes nothing', async () => {
    const out = path.join(dir, 'x.pdf');
    expectOneLineExit2(await sheet(path.join(dir, 'missing.json'), out), /Cannot read the job file .*missing\.json/);
    const bad = path.join(dir, 'bad.json');
    fs.writeFileSync(bad, '{"joints": [');
    expectOneLineExit2(await sheet(bad, out), /not valid JSON/);
    expect(fs.existsSync(out)).toBe(false);
  }, SLOW);

  it('when a load is not at a joint, then it exits 2 naming the load and the nearest joint', async () => {
    const job = JSON.parse(fs.readFileSync(path.join(root, 'tests/fixtures/sheets/pratt-6-panel.json'), 'utf8'));
    job.loads[0].at = [1.5, 0];
    const file = path.join(dir, 'off.json');
    fs.writeFileSync(file, JSON.stringify(job));
    expectOneLineExit2(await sheet(file, path.join(dir, 'off.pdf')), /load of case D at \[1\.5, 0\].*nearest is joint/);
  }, SLOW);

  it('when the job is good, then it writes a PDF whose reactions read (n − 1)P/2', async () => {
    const out = path.join(dir, 'pratt.pdf');
    const r = await sheet(path.join(root, 'tests/fixtures/sheets/pratt-6-panel.json'), out);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    // Inline job joints are tagged A, B, … in order: bottom joints A–G, top H–N; case D is P = 10 kN.
    expect(pdfText(out)).toMatch(new RegExp(`A\\s+Pin\\s+0\\.00\\s+${numberFormat(R, 2)}`));
  }, SLOW);

  it('when the job has "design" and "deflection", then the sheet has the design pages and the deflection page the app prints; a bad section writes no PDF', async () => {
    const out = path.join(dir, 'design.pdf');
    const r = await sheet(path.join(root, 'tests/fixtures/jobs/design-king-post.json'), out);
    expect(r.stderr).toBe('');
    expect(r.code).toBe(0);
    const text = pdfText(out);
    expect(text).toMatch(/Member design: group 1/);
    expect(text).toMatch(/Deflection \(unit-load method\)/);
    // King post, span 8 m, 100 kN at the apex, A = 1000 mm², E = 200 000 MPa: unit-load method by
    // hand, Σ nNL/(AE) = 2 × 1.736111 + 2 × 0.888889 mm = 5.25 mm down at the apex.
    expect(text).toMatch(/5\.25\d* mm/);
    expect(text).not.toMatch(/member design is outside this sheet/);
    const bad = path.join(dir, 'bad-design.pdf');
    expectOneLineExit2(await sheet(path.join(root, 'tests/fixtures/jobs/design-bad-section.json'), bad), /the area A must be greater than 0/);
    expect(fs.existsSync(bad)).toBe(false);
  }, SLOW);
});
