import { describe, expect, it } from 'vitest';
import type { TrussModel } from '@shared/model/truss';
import { loadLetterFor, loadLetterOf, trussSolve } from '@shared/solver';
import { modelFromSketch } from '@shared/solver/test-trusses';
import { buildCalcSheetView, type CalcSheetInput, type CalcSheetView, type StepView } from '../server/modules/calc-sheets/calc-sheet-view';
import { renderCalcSheetHtml } from '../server/modules/calc-sheets/calc-sheet-html';
import type { DesignInput } from '@shared/model/design-input';
import { runDesign } from '@shared/design/basis';
import { demoTruss, kTruss, withTakeoff, withWindAndPatterns } from './support/sheet-samples';
import { texSymbols } from './support/tex-symbols';

/**
 * Plain references and symbols, read from the rendered sheet as a checker reads it (the HTML
 * Chromium prints, with styles, KaTeX's hidden MathML copy and tags dropped): steps numbered
 * section.step, no internal id printed, no raw markup, every symbol defined in the design basis
 * (section 1, before any step), load symbols that cannot be read as a joint tag, and a design
 * basis that names the methods the sheet's steps use. Trusses are our own (invented).
 */

function input(model: TrussModel, extra: Partial<CalcSheetInput> = {}): CalcSheetInput {
  return {
    firm: { name: 'Hollin Bank Structures (test)', address: '4 Quarry Lane', paperSize: 'A4' },
    project: { name: 'Plain references', jobNumber: 'HB-0013', unitSystem: 'SI' },
    trussName: 'T1',
    subject: 'Truss T1',
    revision: 'A',
    model,
    analysis: trussSolve(model),
    generatedAt: '2026-12-03T10:00:00Z',
    ...extra,
  };
}

/** A braced square (one redundant member) on a pin and a roller: solved by direct stiffness. */
function bracedSquare(): TrussModel {
  return modelFromSketch({
    joints: [['A', 0, 0], ['B', 3, 0], ['C', 3, 3], ['D', 0, 3]],
    members: [['A', 'B'], ['B', 'C'], ['C', 'D'], ['D', 'A'], ['A', 'C'], ['B', 'D']],
    supports: [{ at: 'A', kind: 'pin' }, { at: 'B', kind: 'roller' }],
    cases: [{ id: 'H', loads: [['D', 10, 0], ['C', 0, -6]] }],
    EA: 100_000,
  });
}

/**
 * A triangle whose apex is tagged P: the tag a plain load "P" would clash with. The apex carries
 * 9 kN down and the pin joint A 2 kN across and 3 kN down, so a joint step (A) draws its loads.
 */
function apexP(): TrussModel {
  return modelFromSketch({
    joints: [['A', 0, 0], ['B', 6, 0], ['P', 3, 2]],
    members: [['A', 'B'], ['B', 'P'], ['P', 'A']],
    supports: [{ at: 'A', kind: 'pin' }, { at: 'B', kind: 'roller' }],
    cases: [{ id: 'D', loads: [['P', 0, -9], ['A', 2, -3]] }],
  });
}

interface Sheet {
  name: string;
  model: TrussModel;
  view: CalcSheetView;
  html: string;
  text: string;
}

function sheetOf(name: string, inp: CalcSheetInput): Sheet {
  const view = buildCalcSheetView(inp);
  const html = renderCalcSheetHtml(view);
  const text = html
    .replace(/<style[\s\S]*?<\/style>/g, ' ')
    .replace(/<head>[\s\S]*?<\/head>/, ' ')
    .replace(/<annotation[\s\S]*?<\/annotation>/g, '')
    .replace(/<span class="katex-mathml">[\s\S]*?<\/math><\/span>/g, '')
    .replace(/<[^>]+>/g, ' ')
    .replace(/&[a-z]+;|&#\d+;/g, ' ');
  return { name, model: inp.model, view, html, text };
}

const demo = withTakeoff(demoTruss(), 'exact', 4.5);
const trib = withTakeoff(demoTruss(), 'tributary', [4.5, 3.7, 4.1, 4.5, 3.9]);
const windExact = withWindAndPatterns(demoTruss(), 'exact', [4.5, 3.7, 4.1, 4.5, 3.9], 2);
const windTrib = withWindAndPatterns(demoTruss(), 'tributary', 4.5, 0);

/** The demo truss with a takeoff and its member design (steel, AISC 360-16 LRFD) and a deflection check: the design pages. */
function designed(): CalcSheetInput {
  const base = withTakeoff(demoTruss(), 'exact', 4.5);
  const design: DesignInput = {
    standard: 'aisc360-16-lrfd',
    groups: [{ name: 'Chords and webs', members: 'all', material: { kind: 'grade', grade: 'A992' }, section: { shape: 'rect-hollow', B: 80, H: 80, t: 4 } }],
    deflection: { joints: ['L3'], combinations: ['S'], limit: 240 },
  };
  const model = { ...base.model, design };
  const analysis = trussSolve(model);
  return input(model, { analysis, design: runDesign(model, analysis), takeoffSteps: base.takeoffSteps });
}

const SHEETS: Sheet[] = [
  sheetOf('demo truss with a takeoff (exact)', input(demo.model, { takeoffSteps: demo.takeoffSteps })),
  sheetOf('demo truss with a takeoff (tributary)', input(trib.model, { takeoffSteps: trib.takeoffSteps })),
  sheetOf('demo truss with wind and snow span patterns (exact)', input(windExact.model, { takeoffSteps: windExact.takeoffSteps })),
  sheetOf('demo truss with wind and snow span patterns (tributary, US units)', input(windTrib.model, { takeoffSteps: windTrib.takeoffSteps, project: { name: 'Plain references', jobNumber: 'HB-0013', unitSystem: 'US' } })),
  sheetOf('demo truss with member design pages', designed()),
  sheetOf('K-truss', input(modelFromSketch(kTruss()))),
  sheetOf('braced square (stiffness)', input(bracedSquare())),
  sheetOf('apex tagged P', input(apexP())),
];

function stepsOf(view: CalcSheetView): StepView[] {
  return [
    view.stability,
    ...view.takeoff,
    ...view.cases.flatMap((c) => [...c.zeroForce.steps, ...c.reactionSteps, ...c.jointSteps, ...c.simultaneousSteps, ...c.stiffnessSteps, c.check]),
  ].filter((s): s is StepView => !!s);
}

describe.each(SHEETS)('calc sheet of the $name', (sheet) => {
  it('when printed, then every step is numbered section.step under its own section, and the contents number the sections', () => {
    const sections = [...sheet.html.matchAll(/<section class="sheet-section[^"]*" id="([^"]+)">\s*<h2><span class="sec-no">([^<]*)<\/span>/g)];
    expect(sections.length).toBeGreaterThan(4);
    const seen = new Set<string>();
    for (let i = 0; i < sections.length; i++) {
      const body = sheet.html.slice(sections[i].index, sections[i + 1]?.index ?? sheet.html.length);
      for (const m of body.matchAll(/<span class="step-no">([^<]*)<\/span>/g)) {
        expect(m[1], `${sections[i][1]}`).toMatch(new RegExp(`^${sections[i][2].replace('.', '\\.')}\\.\\d+$`));
        expect(seen.has(m[1]), `${m[1]} printed twice`).toBe(false);
        seen.add(m[1]);
      }
    }
    expect(seen.size).toBe(stepsOf(sheet.view).length);
    const toc = [...sheet.html.matchAll(/<span class="toc-no">([^<]*)<\/span>/g)].map((m) => m[1]);
    expect(toc).toEqual(sections.map((s) => s[2]).filter((n) => toc.includes(n)));
    expect(toc.every((n) => /^\d+$/.test(n))).toBe(true);
  });

  it('when read, then no internal id is printed (case-, joint-, takeoff/, purlin-, nor any step id)', () => {
    expect(sheet.text).not.toMatch(/\bcase-\w/);
    // "joint-by-joint" is a plain word of the US units note.
    expect(sheet.text).not.toMatch(/\bjoint-(?!equilibrium|by-joint)\w/);
    expect(sheet.text).not.toMatch(/takeoff\//);
    expect(sheet.text).not.toMatch(/purlin-/);
    for (const s of stepsOf(sheet.view)) expect(sheet.text.includes(s.id), s.id).toBe(false);
  });

  it('when read, then no symbol is raw markup, in the equations, tables or diagrams (no "R_D,y", "u_A", "t_M", no backslash)', () => {
    expect(sheet.text).not.toMatch(/[A-Za-z]_[A-Za-z0-9{]/);
    expect(sheet.text).not.toMatch(/\\[a-zA-Z]/);
    // The diagrams' own text (SVG) too: a subscript is a lowered tspan.
    for (const svg of sheet.html.match(/<svg[\s\S]*?<\/svg>/g) ?? []) expect(svg.replace(/<[^>]+>/g, '')).not.toMatch(/_/);
  });

  it('when a step writes a symbol, then the design basis (section 1, before every step) defines it', () => {
    const symbols = sheet.view.designBasis.symbols.map((s) => s.tex).join(' ');
    const tex = stepsOf(sheet.view).flatMap((s) => s.tex).join(' ');
    const letter = loadLetterOf(sheet.model);
    const used: [RegExp, RegExp, string][] = [
      [/F_\{\\text/, /F_\{/, 'member force F'],
      [/R_\{\\text/, /R_\{/, 'reaction R'],
      [new RegExp(`${letter}_\\{\\\\text`), new RegExp(`${letter}_\\{`), `load ${letter}`],
      [/\\Sigma F_/, /\\Sigma F_x/, 'ΣF'],
      [/\\Sigma M/, /\\Sigma M/, 'ΣM'],
      [/\(\\cos/, /\\cos/, 'direction cosines'],
      [/u_\{\\text/, /u_\{/, 'movement u'],
      [/v_\{\\text/, /v_\{/, 'movement v'],
      [/t_\{\\text/, /t_\{/, 'roller movement t'],
      [/\\mathbf\{K\}/, /\\mathbf\{K\}/, 'stiffness matrix K'],
      [/EA\s*\/\s*L|\\frac\{EA\}\{L\}|k\s*=/, /k = EA\/L/, 'member stiffness k'],
    ];
    for (const [inSteps, inSymbols, what] of used) if (inSteps.test(tex)) expect(symbols, what).toMatch(inSymbols);
    // The symbols list is printed in section 1, before the first step.
    const list = sheet.html.indexOf('id="design-basis-symbols"');
    expect(list).toBeGreaterThan(0);
    expect(list).toBeLessThan(sheet.html.indexOf('<article class="step'));
    expect(sheet.html.slice(list, list + 20_000)).toMatch(/<dl class="symbols"><dt>.*?<span class="katex">/s);
  });
});

/**
 * A line that defines the symbols it writes, in a step ("where" line, or a glossary line such as
 * "t_B: movement of the roller joint …"): it starts with the word "where", or a symbol is followed
 * by a colon and words.
 */
const definesHere = (tex: string) => /^\s*\\text\{\s*where\b/.test(tex) || /:\\?\s*\\text\{|\\text\{:/.test(tex);

describe('every symbol on the sheet defined before or where it is first used', () => {
  it('when the symbol reader is given known sources, then it reads the families a checker reads (it can fail)', () => {
    // The reader's own check, on sources written here.
    expect([...texSymbols('P_{\\text{L0},y} = c_{\\mathrm{exact}}\\,w_{x} = 5.092\\,\\mathrm{m} \\times L_{i+1} 1.78e-14 \\text{per 1 unit of w}')].sort()).toEqual(['L_{i}', 'P_{T,y}', 'c_{exact}', 'w_{x}']);
    expect([...texSymbols('\\theta_{1} = \\arctan(\\Delta y_{1} / \\Delta x_{1}) = 26.57^{\\circ}')].sort()).toEqual(['\\Delta', '\\theta_{i}', 'x_{i}', 'y_{i}']);
    expect([...texSymbols('\\max_{\\text{joints}} \\left|\\Sigma \\mathbf{F}\\right| = 0\\ \\mathrm{kN}')].sort()).toEqual(['\\Sigma', '\\mathbf{F}']);
  });

  it.each(SHEETS.map((s) => [s.name, s] as const))('when the %s sheet is read in printed order, then each symbol of its equations (KaTeX sources) is in the symbols list of section 1 or defined in a line at or before its first use', (_name, sheet) => {
    const listed = new Set(sheet.view.designBasis.symbols.flatMap((s) => [...texSymbols(s.tex)]));
    // Section 1 comes before every step; the steps in the order the sheet prints them.
    const steps = stepsOf(sheet.view).sort((a, b) => sheet.html.indexOf(`id="${a.id}"`) - sheet.html.indexOf(`id="${b.id}"`));
    const definedInSteps = new Set<string>();
    const undefinedAt: string[] = [];
    let read = 0;
    for (const s of steps) {
      for (const line of s.tex) {
        const here = texSymbols(line);
        if (definesHere(line)) for (const y of here) definedInSteps.add(y);
        for (const y of here) {
          read++;
          if (!listed.has(y) && !definedInSteps.has(y)) undefinedAt.push(`${s.number} ${s.title}: ${y}`);
        }
      }
    }
    expect(read).toBeGreaterThan(20);
    expect([...new Set(undefinedAt)]).toEqual([]);
  });

  it('when a sheet has a roof loading, then its symbols are listed under the takeoff\'s own heading with its section number, each with what it stands for', () => {
    const sheet = SHEETS.find((s) => s.name === 'demo truss with wind and snow span patterns (exact)')!;
    const number = sheet.view.numbers.takeoff;
    expect(number).toMatch(/^\d+$/);
    expect(sheet.html).toContain(`<dt class="symbols-group">In the roof loading, section ${number}</dt>`);
    const takeoff = sheet.view.designBasis.symbols.filter((s) => s.group === 'takeoff');
    const families = new Set(takeoff.flatMap((s) => [...texSymbols(s.tex)]));
    // The roof loading's own symbols (tributary widths, spans and moments, c, q, q_p, wind, span patterns).
    for (const f of ['b_{s}', 'b_{p}', 'L_{i}', 'M_{i}', 'c_{cont}', 'c_{trib}', 'q', 'q_{p}', 'w', 'R_{cont}', 'R_{trib}', '\\Delta', 'r_{j}', 'c_{all}', '\\theta_{i}', 'p_{i}', 'c_{i}', 'w_{n,i}', 'w_{x}', 'w_{y}', 's_{i}']) {
      expect(families.has(f.replace('r_{j}', 'r_{j}')) || families.has(f.replace(/_\{j\}/, '_{i}')), f).toBe(true);
    }
    expect(takeoff.every((s) => s.meaning.length > 20)).toBe(true);
    // A sheet without a takeoff lists none of them.
    expect(SHEETS.find((s) => s.name === 'K-truss')!.view.designBasis.symbols.some((s) => s.group)).toBe(false);
  });
});

describe('load symbols never read as a joint tag', () => {
  it('when no tag starts with P, then loads are P; when a joint is tagged P, then the sheet writes its loads with another letter and says so', () => {
    // Common practice, no source: a symbol is not reused for two things on one sheet.
    expect(loadLetterFor(['L0', 'U1', 'L1'])).toBe('P');
    expect(loadLetterFor(['A', 'B', 'P'])).toBe('Q');
    expect(loadLetterFor(['P1', 'Q1', 'B'])).toBe('W');
    const sheet = SHEETS.find((s) => s.name === 'apex tagged P')!;
    // No step writes a load as P (the joint steps substitute known loads as numbers; none may read P_{…}).
    const tex = stepsOf(sheet.view).flatMap((s) => s.tex).join(' ');
    expect(tex).not.toMatch(/(^|[^a-zA-Z\\])P_\{/);
    const load = sheet.view.designBasis.symbols.find((s) => s.tex.startsWith('Q_'))!;
    expect(load.meaning).toMatch(/load applied at joint P .*written Q here/);
    // The diagram of joint A labels its loads Q with the subscripts A,x and A,y.
    const fbd = sheet.view.cases[0].jointSteps.find((s) => s.title === 'Joint A')!.svg!;
    expect(fbd).toMatch(/>Q<tspan dy="[\d.]+" font-size="[\d.]+">A,y<\/tspan><tspan dy="-[\d.]+"> = 3\.00/);
    expect(fbd).toMatch(/>Q<tspan dy="[\d.]+" font-size="[\d.]+">A,x<\/tspan><tspan dy="-[\d.]+"> = 2\.00/);
    expect(fbd.replace(/<[^>]+>/g, '')).not.toMatch(/PA,[xy] =/);
  });
});

describe('the design basis names the methods the steps use', () => {
  const method = (name: string) => SHEETS.find((s) => s.name === name)!.view.designBasis.method.join(' ');
  const kinds = (name: string) => new Set(SHEETS.find((s) => s.name === name)!.view.cases.flatMap((c) => [c.jointSteps.length ? 'joint' : '', c.simultaneousSteps.length ? 'together' : '', c.stiffnessSteps.length ? 'stiffness' : '']).filter(Boolean));

  it('when every case is solved joint by joint, then it says method of joints and claims no simultaneous or stiffness solve', () => {
    expect([...kinds('demo truss with a takeoff (exact)')]).toEqual(['joint']);
    expect(method('demo truss with a takeoff (exact)')).toMatch(/method of joints, joint by joint, each joint with at most two unknowns/);
    expect(method('demo truss with a takeoff (exact)')).not.toMatch(/solved together|direct stiffness/);
  });

  it('when the K-truss needs unknowns solved together, then it says so with their count, and not "at most two unknowns" alone', () => {
    const k = SHEETS.find((s) => s.name === 'K-truss')!;
    expect(kinds('K-truss').has('together')).toBe(true);
    // The count it prints is the largest number of unknowns a simultaneous step solves.
    const most = Math.max(...k.model && trussSolve(k.model).cases.flatMap((c) => c.simultaneousSteps.map((s) => s.unknowns.length)));
    expect(method('K-truss')).toMatch(new RegExp(`up to ${most} here|\\(${most} unknowns\\)`));
    expect(method('K-truss')).toMatch(/solved together/);
    expect(method('K-truss')).not.toMatch(/each joint with at most two unknowns\./);
  });

  it('when the truss is indeterminate, then it says direct stiffness and not the method of joints', () => {
    expect([...kinds('braced square (stiffness)')]).toEqual(['stiffness']);
    expect(method('braced square (stiffness)')).toMatch(/direct stiffness method/);
    expect(method('braced square (stiffness)')).not.toMatch(/method of joints/);
  });
});
