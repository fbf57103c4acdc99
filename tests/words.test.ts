import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import type { TrussModel } from '@shared/model/truss';
import { trussSolve } from '@shared/solver';
import { combinationsBuild } from '@shared/combinations';
import { buildCalcSheetView } from '../server/modules/calc-sheets/calc-sheet-view';
import { renderCalcSheetHtml, sheetPowersOfTen } from '../server/modules/calc-sheets/calc-sheet-html';
import { reviewMailMessage } from '../server/modules/sheet-revisions/sheet-revisions.mail';
import { postedTriangleModel, sheetInput } from '../server/modules/calc-sheets/view/view-fixtures';
import { demoTruss, withTakeoff } from './support/sheet-samples';

/**
 * Issue 17 item 2: the words people read are the trade's or plain words of our own, the same
 * everywhere. Each old word below was once shown; none may come back in the built client, the
 * sheet templates, a rendered sheet or an e-mail. Internal ids and API fields (the job file's
 * `method: "exact"`, `takeoff`, `stale`) are not read by people and stay.
 */
const OLD_WORDS: [RegExp, string][] = [
  [/\bHealed\b|\bHEALED\b|no healing needed/, 'geometry "repaired"'],
  [/[Rr]oof takeoff|[Rr]oof load takeoff|Takeoff of load case|Takeoff preview/, '"roof loading"'],
  [/continuous purlin \(exact\)|tributary against exact|mathrm\{exact\}/, '"three-moment" for the continuous-purlin reaction'],
  [/\b[QSWH]-lead\b/, '"leading imposed / snow / wind"'],
  [/rule [12]: |\(rule [12] at joint|; pass \d|found on pass/, 'plain words for zero-force members'],
  [/\bStale\b|stale: the model/, '"out of date"'],
  [/Reaction line \(°|° from \+x/, 'the roller\'s angle "from horizontal"'],
  [/Joint tags|Member tags|Tags show when|upright tags|joint tag of this truss/, '"labels"'],
  [/Teal arrows|teal solid|amber dashed/, 'line styles said in words, not kit colours'],
];

/** Computer notation: 2.01e-14, 1e-9, 3.6E+05. */
const E_NOTATION = /(?<![\w#.-])\d+(?:\.\d+)?e[-+]?\d+\b/i;

function filesUnder(dir: string, ext: RegExp): string[] {
  const out: string[] = [];
  for (const entry of fs.readdirSync(dir, { withFileTypes: true })) {
    const p = path.join(dir, entry.name);
    if (entry.isDirectory()) out.push(...filesUnder(p, ext));
    else if (ext.test(entry.name)) out.push(p);
  }
  return out;
}

function oldWordsIn(name: string, text: string): string[] {
  return OLD_WORDS.filter(([re]) => re.test(text)).map(([re, now]) => `${name}: ${re.exec(text)![0]} (now ${now})`);
}

/** The visible text of a sheet: no styles, no KaTeX's hidden MathML, no tags. */
function sheetText(html: string): string {
  return html
    .replace(/<style[\s\S]*?<\/style>/g, ' ')
    .replace(/<head>[\s\S]*?<\/head>/, ' ')
    .replace(/<annotation[\s\S]*?<\/annotation>/g, '')
    .replace(/<[^>]+>/g, ' ')
    .replace(/&[a-z]+;|&#\d+;/g, ' ');
}

const root = path.resolve(import.meta.dirname, '..');

describe('words people read (issue 17 item 2)', () => {
  it('when the client is built, then none of the old words is in it', () => {
    const dir = path.join(root, 'dist', 'client', 'assets');
    const files = filesUnder(dir, /\.js$/);
    expect(files.length).toBeGreaterThan(0);
    const found = files.flatMap((f) => oldWordsIn(path.basename(f), fs.readFileSync(f, 'utf8')));
    expect(found).toEqual([]);
  });

  it('when the sheet templates and the client sources are read, then none of the old words is in them and no number is written with toExponential', () => {
    const templates = filesUnder(path.join(root, 'templates'), /\.hbs$/);
    const sources = filesUnder(path.join(root, 'src'), /\.tsx?$/).filter((f) => !/\.test\.tsx?$/.test(f));
    expect(templates.length).toBeGreaterThan(5);
    const found = [...templates, ...sources].flatMap((f) => oldWordsIn(path.relative(root, f), fs.readFileSync(f, 'utf8')));
    expect(found).toEqual([]);
    const exponential = sources.filter((f) => /\.toExponential\(/.test(fs.readFileSync(f, 'utf8')));
    expect(exponential).toEqual([]);
  });

  it('when a sheet with a roof loading, EN 1990 combinations and a zero-force member is rendered, then its text uses the new words and no computer notation', () => {
    const demo = withTakeoff(demoTruss(), 'exact', 4.5);
    const cases = demo.model.loadCases.map((c, i) => ({ ...c, category: i === 0 ? ('dead' as const) : ('snow' as const) }));
    const wind = { id: 'W', name: 'Wind', category: 'wind' as const, loads: [{ joint: 'U1', fx: 2, fy: 0 }] };
    const allCases = [...cases, wind];
    const combinations = combinationsBuild('en1990-6.10', allCases).map((c) => ({ name: c.name, factors: c.factors, clause: c.clause }));
    const model: TrussModel = { ...demo.model, loadCases: allCases, combinations };
    const texts = [
      sheetText(renderCalcSheetHtml(buildCalcSheetView(sheetInput(model, { analysis: trussSolve(model), takeoffSteps: demo.takeoffSteps })))),
      sheetText(renderCalcSheetHtml(buildCalcSheetView(sheetInput(postedTriangleModel())))),
    ];
    const [roof, posted] = texts;
    expect(texts.flatMap((t, i) => oldWordsIn(`sheet ${i + 1}`, t))).toEqual([]);
    for (const t of texts) expect(E_NOTATION.exec(t)?.[0] ?? null).toBeNull();
    // What replaced them is there: the section title, the leading action, the three-moment reaction,
    // the zero-force member's reason in words, residuals written m × 10ⁿ (or 0).
    expect(roof).toMatch(/Roof loading/);
    expect(roof).toMatch(/leading snow/);
    expect(roof).toMatch(/three-moment/);
    expect(roof).toMatch(/in equilibrium/);
    expect(posted).toMatch(/three members meet, \S+ and \S+ in line, no load, no support/);
    expect(posted).toMatch(/at once/);
  });

  it('when the check e-mails are written, then they use the state words of the app', () => {
    const base: Omit<Parameters<typeof reviewMailMessage>[0], 'kind'> = {
      to: ['checker@demo.panelpoint.test'],
      context: { trussId: 1, projectId: 1, jobNumber: 'OL-0912', projectName: 'Fenwick depot', trussName: 'T1' },
      label: 'A',
      actorName: 'Eli Marsh',
      note: '',
      pageUrl: 'http://127.0.0.1/sheets/1',
    };
    const subjects = (['submitted', 'returned', 'checked', 'issued'] as const).map((kind) => reviewMailMessage({ ...base, kind }));
    expect(subjects.map((m) => m.subject.replace(/^.*revision A /, ''))).toEqual(['submitted for check', 'returned with comments', 'checked', 'issued']);
    expect(subjects.flatMap((m, i) => oldWordsIn(`mail ${i}`, `${m.subject}\n${m.text}`))).toEqual([]);
  });
});

describe('powers of ten on the printed sheet', () => {
  it('when the sheet says 2.0 × 10⁻¹⁴, then the exponent is raised in ordinary figures and minus (faces the sheet embeds), and other text is left alone', () => {
    expect(sheetPowersOfTen('<td>2.01 × 10⁻¹⁴</td> 1 × 10⁹; 4 m² and 10² stay')).toBe('<td>2.01 × 10<sup class="pow">\u221214</sup></td> 1 × 10<sup class="pow">9</sup>; 4 m² and 10² stay');
  });
});
