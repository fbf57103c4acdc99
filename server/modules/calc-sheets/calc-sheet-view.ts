import katex from 'katex';
import { LOAD_CATEGORY_NAMES, type JointLoad, type TrussModel } from '@shared/model/truss';
import type { FirmSettings, UnitSystem } from '@shared/schemas/project.schema';
import { caseSteps, stepToKatex, type CaseResult, type SolverStep, type TrussAnalysis } from '@shared/solver';
import { takeoffStepKatex, type TakeoffStep } from '@shared/takeoff';
import { UNIT_DECIMALS, UNIT_SYSTEMS, numberFormat, unitFromBase, type Quantity, type UnitSystemId } from '@shared/units';
import { forceDiagramSvg, forceSenseOf, jointFbdSvg, trussBands, trussGeometrySvg, type TrussBand } from './truss-svg';

/**
 * The calc sheet's view model: everything the Handlebars templates print, already formatted
 * (numbers with units and fixed decimals per unit, tension + with (T), compression − with (C))
 * and with every equation typeset to HTML by KaTeX. Pure: no I/O, no clock (the caller passes
 * `generatedAt`).
 */

/** A person who prepared or checked the sheet, with the date they did it (as it should print). */
export interface SheetSigner {
  name: string;
  date?: string;
}

/** What a calc sheet is made from. */
export interface CalcSheetInput {
  firm: FirmSettings;
  project: {
    name: string;
    jobNumber: string;
    client?: string;
    site?: string;
    /** Free text: codes, materials, assumptions. */
    designBasis?: string;
    unitSystem: UnitSystem;
  };
  trussName: string;
  /** The sheet's subject line, e.g. "Truss T1: member forces". */
  subject: string;
  /** Revision label, e.g. "A", "P1". */
  revision: string;
  preparedBy?: SheetSigner;
  checkedBy?: SheetSigner;
  /** Set on the issued print only: the engineer who issued it. */
  issuedBy?: SheetSigner;
  model: TrussModel;
  analysis: TrussAnalysis;
  /** Roof takeoff steps (shared/takeoff), when the loads came from a takeoff. */
  takeoffSteps?: TakeoffStep[];
  /** Which analysis run the sheet was made from (printed on the cover and every page). */
  runLabel?: string;
  /** When the sheet was generated. */
  generatedAt: Date | string;
}

/** A step of the sheet: a stable anchor id (the solver's step id), a title and typeset lines. */
export interface StepView {
  id: string;
  title: string;
  /** KaTeX HTML, one display equation per entry. */
  lines: string[];
  /** Free-body diagram SVG (joint steps). */
  svg?: string;
  /** Plain-language note under the equations. */
  note?: string;
}

export interface TableRow {
  cells: string[];
  /** Extra CSS class for the row (e.g. 'zero'). */
  cls?: string;
}

export interface CaseView {
  id: string;
  anchor: string;
  caseId: string;
  title: string;
  method: string;
  loadingSvg: string;
  loadRows: TableRow[];
  zeroForce: { rows: TableRow[]; steps: StepView[] };
  reactionSteps: StepView[];
  reactionNote?: string;
  reactionRows: TableRow[];
  jointSteps: StepView[];
  simultaneousSteps: StepView[];
  stiffnessSteps: StepView[];
  forceRows: TableRow[];
  forceSvg: string;
  check: StepView & { verdict: string; ok: boolean };
  symmetryNote?: string;
}

export interface CalcSheetView {
  paper: 'A4' | 'Letter';
  documentTitle: string;
  unstable: boolean;
  units: { system: string; force: string; length: string; note?: string };
  titleBlock: {
    firm: string;
    firmAddress: string;
    project: string;
    jobNumber: string;
    subject: string;
    revision: string;
    preparedBy: string;
    preparedDate: string;
    checkedBy: string;
    checkedDate: string;
    run: string;
  };
  cover: {
    rows: { label: string; value: string }[];
    summary: { label: string; value: string }[];
    contents: { anchor: string; title: string }[];
  };
  /** Section number by anchor ("1", "2", …), in the order of the contents. */
  numbers: Record<string, string>;
  caution: string;
  designBasis: { paragraphs: string[]; clauses: string[]; method: string[] };
  geometry: { svg: string; jointRows: TableRow[]; memberRows: TableRow[] };
  supports: { rows: TableRow[]; materialRows: TableRow[]; materialNote: string };
  takeoff: StepView[];
  loadCases: { rows: TableRow[] };
  combinations: { rows: TableRow[] };
  stability: StepView & { verdict: string; message: string; mechanism: string; symmetry: string };
  cases: CaseView[];
  comboTables: { title: string; head: string[]; rows: TableRow[] }[];
  comboResidualRows: TableRow[];
  envelope: { source: string; rows: TableRow[] };
  residual: { rows: TableRow[]; verdict: string; ok: boolean };
  generatedAt: string;
}

/** Largest residual, relative to the largest load, that the sheet calls "in equilibrium" (issue 4 item 7). */
export const RESIDUAL_RELATIVE_LIMIT = 1e-9;

const CAUTION =
  'These results are an aid to design and must be reviewed by a licensed professional engineer before they are used. ' +
  'Local building codes and the authority having jurisdiction govern; where they differ from the design basis stated here, they take precedence. ' +
  'The analysis assumes a plane, pin-jointed truss with loads applied at the joints, linear elastic behaviour and small displacements.';

const CATEGORY_NAMES: Record<string, string> = LOAD_CATEGORY_NAMES;

const METHOD_NAMES: Record<CaseResult['method'], string> = {
  joints: 'method of joints',
  'joints-and-simultaneous': 'method of joints, with a simultaneous solve where no joint had two or fewer unknowns',
  stiffness: 'direct stiffness method',
};

/** Typesets KaTeX source to HTML (display mode). Throws on bad source so a sheet never prints raw TeX. */
export function katexHtml(source: string, display = true): string {
  return katex.renderToString(source, { displayMode: display, output: 'html', throwOnError: true, strict: 'ignore' });
}

/**
 * Typesets one equation of a step in display style but as inline math, so that a long equation
 * (a moment sum over many joints) breaks after a relation or an operator instead of running off
 * the page. KaTeX breaks inline math only there.
 */
function equationHtml(source: string): string {
  return katex.renderToString(`\\displaystyle ${source}`, { displayMode: false, output: 'html', throwOnError: true, strict: 'ignore' });
}

interface Formatters {
  system: UnitSystemId;
  unit(q: Quantity): string;
  /** Number in display units, fixed decimals, no unit. */
  num(valueInBase: number, q: Quantity, signed?: boolean): string;
  /** Number with its unit. */
  qty(valueInBase: number, q: Quantity): string;
  /** Member force: "+18.75 kN (T)", "−33.75 kN (C)", "0.00 kN". */
  member(kN: number): string;
  /** Member force without unit, for tables with the unit in the heading: "+18.75", "−33.75", "0.00". */
  memberNum(kN: number): string;
  sense(kN: number): string;
  zeroTol: number;
}

function formatters(system: UnitSystemId, zeroTol: number): Formatters {
  const unit = (q: Quantity) => UNIT_SYSTEMS[system][q];
  const num = (v: number, q: Quantity, signed = false) => {
    const u = unit(q);
    return numberFormat(unitFromBase(v, u), UNIT_DECIMALS[u], { signed });
  };
  const qty = (v: number, q: Quantity) => `${num(v, q)}\u202f${unit(q)}`;
  const sense = (kN: number) => {
    const s = forceSenseOf(kN, zeroTol);
    return s === '0' ? '0' : `(${s})`;
  };
  const memberNum = (kN: number) => (forceSenseOf(kN, zeroTol) === '0' ? num(0, 'force') : num(kN, 'force', true));
  const member = (kN: number) => {
    const s = forceSenseOf(kN, zeroTol);
    return s === '0' ? `${num(0, 'force')}\u202f${unit('force')}` : `${memberNum(kN)}\u202f${unit('force')} (${s})`;
  };
  return { system, unit, num, qty, member, memberNum, sense, zeroTol };
}

function isoMinute(at: Date | string): string {
  const d = typeof at === 'string' ? new Date(at) : at;
  if (Number.isNaN(d.getTime())) return String(at);
  return `${d.toISOString().slice(0, 16).replace('T', ' ')} UTC`;
}

function stepView(step: SolverStep, fmt: Formatters): StepView {
  const lines = stepToKatex(step, { decimals: 3 }).map((src) => equationHtml(src));
  const view: StepView = { id: step.id, title: step.title, lines };
  if (step.kind === 'joint') {
    view.svg = jointFbdSvg(step, { formatForce: (kN) => fmt.qty(kN, 'force'), zeroTolerance: fmt.zeroTol });
  }
  return view;
}

/** Draws each band of a long truss as its own row, captioned with its x range when there are several. */
function banded(bands: TrussBand[], draw: (band: TrussBand) => string, lengthText: (m: number) => string): string {
  if (bands.length === 1) return draw(bands[0]);
  return bands
    .map((b, i) => `<div class="band"><div class="band-caption">Part ${i + 1} of ${bands.length}: x = ${lengthText(b.x0)} to ${lengthText(b.x1)}</div>${draw(b)}</div>`)
    .join('');
}

function loadsOf(model: TrussModel, caseId: string): JointLoad[] {
  return model.loadCases.find((c) => c.id === caseId)?.loads ?? [];
}

function tagOf(model: TrussModel) {
  const joints = new Map(model.joints.map((j) => [j.id, j.tag]));
  const members = new Map(model.members.map((m) => [m.id, m.tag]));
  return { joint: (id: string) => joints.get(id) ?? id, member: (id: string) => members.get(id) ?? id };
}

function factorsText(factors: Record<string, number>): string {
  return Object.entries(factors)
    .map(([id, f], i) => `${i === 0 ? '' : ' + '}${numberFormat(f, 2).replace(/\.?0+$/, '') || '0'}\u2009${id}`)
    .join('');
}

/**
 * Builds the calc sheet's view from a model and its analysis. Every number is written here with
 * its unit in the project's unit system (tables) — the joint-by-joint equations are the solver's
 * own KaTeX, in kN and m.
 */
export function buildCalcSheetView(input: CalcSheetInput): CalcSheetView {
  const { model, analysis, project } = input;
  const system: UnitSystemId = project.unitSystem === 'US' ? 'us' : 'si';
  const largestLoad = Math.max(
    0,
    ...model.loadCases.flatMap((c) => c.loads.map((l) => Math.hypot(l.fx, l.fy))),
  );
  // Forces below this are printed as zero: far below the last printed digit (0.005 kN).
  const zeroTol = Math.max(1e-9, largestLoad * 1e-9);
  const fmt = formatters(system, zeroTol);
  const tags = tagOf(model);
  const cls = analysis.classification;
  const unstable = cls.kind === 'unstable';
  const jointById = new Map(model.joints.map((j) => [j.id, j]));

  const titleBlock = {
    firm: input.firm.name,
    firmAddress: input.firm.address.replace(/\s*\n\s*/g, ', '),
    project: project.name,
    jobNumber: project.jobNumber,
    subject: input.subject,
    revision: input.revision,
    preparedBy: input.preparedBy?.name ?? '—',
    preparedDate: input.preparedBy?.date ?? '',
    checkedBy: input.checkedBy?.name ?? '— (not yet checked)',
    checkedDate: input.checkedBy?.date ?? '',
    issuedBy: input.issuedBy?.name ?? '',
    issuedDate: input.issuedBy?.date ?? '',
    run: input.runLabel ?? '',
  };

  const units = {
    system: system === 'us' ? 'US customary' : 'SI',
    force: fmt.unit('force'),
    length: fmt.unit('length'),
    ...(system === 'us'
      ? { note: 'Tables and drawings are in US customary units; the joint-by-joint equations are written in kN and m, the units the analysis computes in (1 kip = 4.448 kN, 1 ft = 0.3048 m).' }
      : {}),
  };

  // ---- geometry, supports, materials
  const memberLength = (id: string) => {
    const m = model.members.find((x) => x.id === id);
    const a = m && jointById.get(m.from);
    const b = m && jointById.get(m.to);
    return a && b ? Math.hypot(b.x - a.x, b.y - a.y) : 0;
  };
  const bands = trussBands(model);
  const lengthText = (m: number) => fmt.qty(m, 'length');
  const geometry = {
    svg: banded(
      bands,
      (b) =>
        trussGeometrySvg(b.model, {
          formatLength: (m) => fmt.num(m, 'length'),
          formatForce: (kN) => fmt.qty(kN, 'force'),
          label: `Geometry of ${input.trussName}`,
        }),
      lengthText,
    ),
    jointRows: model.joints.map((j) => ({ cells: [j.tag, fmt.num(j.x, 'length'), fmt.num(j.y, 'length')] })),
    memberRows: model.members.map((m) => ({
      cells: [m.tag, tags.joint(m.from), tags.joint(m.to), fmt.num(memberLength(m.id), 'length'), m.group ? m.group.replace('-', ' ') : '—'],
    })),
  };
  const supports = {
    rows: model.supports.map((s) => ({
      cells: [
        tags.joint(s.joint),
        s.kind === 'pin' ? 'Pin' : 'Roller',
        s.kind === 'pin' ? 'x and y' : `along ${numberFormat(s.angleDeg, 1)}° from +x`,
        s.kind === 'pin' ? '2' : '1',
      ],
    })),
    materialRows: model.members
      .filter((m) => m.material || m.section || m.E || m.A || m.EA)
      .map((m) => ({
        cells: [
          m.tag,
          m.material ?? '—',
          m.section ?? '—',
          m.E ? numberFormat(m.E / 1e6, 1) : '—',
          m.A ? numberFormat(m.A * 1e6, 0) : '—',
          m.EA ? numberFormat(m.EA, 0) : m.E && m.A ? numberFormat(m.E * m.A, 0) : '—',
        ],
      })),
    materialNote:
      cls.kind === 'indeterminate'
        ? 'The truss is statically indeterminate: member forces depend on each member’s axial stiffness EA.'
        : 'The truss is statically determinate: member forces follow from equilibrium alone and do not depend on the members’ stiffness.',
  };

  // ---- loads and combinations
  const loadCases = {
    rows: model.loadCases.map((c) => ({
      cells: [
        c.id,
        c.name,
        CATEGORY_NAMES[c.category] ?? c.category,
        String(c.loads.length),
        fmt.qty(c.loads.reduce((s, l) => s - l.fy, 0), 'force'),
      ],
    })),
  };
  const combinations = {
    rows: model.combinations.map((c) => ({ cells: [c.name, factorsText(c.factors), c.clause ?? '—'] })),
  };

  // ---- stability
  const mechanism = cls.mechanismJoints.map((id) => tags.joint(id)).join(', ');
  const stability = {
    ...stepView(cls.step, fmt),
    verdict: cls.kind === 'determinate' ? 'Stable and statically determinate' : cls.kind === 'indeterminate' ? `Stable, statically indeterminate to degree ${cls.degree}` : 'Unstable',
    message: cls.message,
    mechanism,
    symmetry: analysis.symmetry.note,
  };

  // ---- takeoff
  const takeoff: StepView[] = (input.takeoffSteps ?? []).map((s) => ({
    id: s.id,
    title: s.title,
    lines: [katexHtml(takeoffStepKatex(s, { system }))],
  }));

  // ---- cases
  const cases: CaseView[] = analysis.cases.map((cr) => {
    const lc = model.loadCases.find((c) => c.id === cr.caseId);
    const loads = loadsOf(model, cr.caseId);
    const byKind = (k: SolverStep['kind']) => caseSteps(cr).filter((s) => s.kind === k);
    const ratio = cr.check.largestLoad > 0 ? cr.residual / cr.check.largestLoad : cr.residual;
    const ok = ratio <= RESIDUAL_RELATIVE_LIMIT;
    const symmetryNote =
      analysis.symmetry.detected && cr.symmetry.loadsSymmetric && cr.symmetry.maxPairDifference !== null
        ? `Geometry, supports and loads of this case are mirror-symmetric; mirrored members differ by at most ${cr.symmetry.maxPairDifference.toExponential(1)} kN.`
        : undefined;
    return {
      id: cr.caseId,
      anchor: `case-${cr.caseId.replace(/[^A-Za-z0-9_-]/g, '_')}`,
      caseId: cr.caseId,
      title: `Load case ${cr.caseId}${lc && lc.name !== cr.caseId ? ` — ${lc.name}` : ''}`,
      method: METHOD_NAMES[cr.method],
      loadingSvg: banded(
        bands,
        (b) =>
          trussGeometrySvg(b.model, {
            formatLength: (m) => fmt.num(m, 'length'),
            formatForce: (kN) => fmt.qty(kN, 'force'),
            loads: loads.filter((l) => b.ownJoints.has(l.joint)),
            dimensions: false,
            memberTags: false,
            label: `Loads of case ${cr.caseId}`,
          }),
        lengthText,
      ),
      loadRows: loads.map((l) => ({ cells: [tags.joint(l.joint), fmt.num(l.fx, 'force'), fmt.num(l.fy, 'force'), l.note ?? ''] })),
      zeroForce: {
        rows: cr.zeroForce.map((z) => ({
          cells: [z.memberTag, z.jointTag, z.rule === 1 ? '1 — two non-collinear members, unloaded' : `2 — three members, ${z.collinear ? z.collinear.map(tags.member).join(' and ') : 'two'} collinear, unloaded`, String(z.pass)],
        })),
        steps: cr.zeroForce.map((z) => stepView(z, fmt)),
      },
      reactionSteps: byKind('reaction').map((s) => stepView(s, fmt)),
      ...(cr.reactionNote ? { reactionNote: cr.reactionNote } : {}),
      reactionRows: cr.reactions.map((r) => ({
        cells: [r.tag, r.kind === 'pin' ? 'Pin' : 'Roller', fmt.num(r.rx, 'force'), fmt.num(r.ry, 'force'), fmt.num(Math.hypot(r.rx, r.ry), 'force')],
      })),
      jointSteps: cr.jointSteps.map((s) => stepView(s, fmt)),
      simultaneousSteps: cr.simultaneousSteps.map((s) => stepView(s, fmt)),
      stiffnessSteps: cr.stiffnessSteps.map((s) => stepView(s, fmt)),
      forceRows: model.members.map((m) => {
        const v = cr.forces[m.id] ?? 0;
        const zero = forceSenseOf(v, zeroTol) === '0';
        return { cells: [m.tag, m.group ? m.group.replace('-', ' ') : '—', fmt.num(memberLength(m.id), 'length'), fmt.memberNum(v), fmt.sense(v)], ...(zero ? { cls: 'zero' } : {}) };
      }),
      forceSvg: banded(
        bands,
        (b) =>
          forceDiagramSvg(b.model, cr.forces, {
            formatMagnitude: (kN) => fmt.num(kN, 'force'),
            zeroTolerance: zeroTol,
            label: `Member forces, case ${cr.caseId}`,
          }),
        lengthText,
      ),
      check: {
        ...stepView(cr.check, fmt),
        ok,
        verdict: ok
          ? `Largest out-of-balance force ${cr.residual.toExponential(2)} kN, ${ratio.toExponential(1)} of the largest load: every joint is in equilibrium (limit ${RESIDUAL_RELATIVE_LIMIT.toExponential(0)}).`
          : `Largest out-of-balance force ${cr.residual.toExponential(2)} kN at joint ${cr.check.residualJointTag ?? '?'} exceeds ${RESIDUAL_RELATIVE_LIMIT.toExponential(0)} of the largest load: do not use these results; report the model.`,
      },
      ...(symmetryNote ? { symmetryNote } : {}),
    };
  });

  // ---- combinations: member forces in chunks of six columns, and the envelope
  const comboTables: CalcSheetView['comboTables'] = [];
  const CHUNK = 6;
  for (let i = 0; i < analysis.combinations.length; i += CHUNK) {
    const chunk = analysis.combinations.slice(i, i + CHUNK);
    comboTables.push({
      title: analysis.combinations.length > CHUNK ? `Combinations ${i + 1}–${i + chunk.length} of ${analysis.combinations.length}` : 'Combinations',
      head: chunk.map((c) => c.name),
      rows: model.members.map((m) => ({ cells: [m.tag, ...chunk.map((c) => fmt.memberNum(c.forces[m.id] ?? 0))] })),
    });
  }
  const comboResidualRows = analysis.combinations.map((c) => ({ cells: [c.name, c.clause ?? '—', c.residual.toExponential(2)] }));
  const envelope = {
    source: analysis.envelopeSource === 'combinations' ? 'over the combinations' : 'over the load cases (no combinations were given)',
    rows: analysis.envelope.map((r) => ({
      cells: [
        r.tag,
        r.maxTension > zeroTol ? fmt.num(r.maxTension, 'force', true) : '—',
        r.maxTensionCombo && r.maxTension > zeroTol ? r.maxTensionCombo : '',
        r.maxCompression < -zeroTol ? fmt.num(r.maxCompression, 'force') : '—',
        r.maxCompressionCombo && r.maxCompression < -zeroTol ? r.maxCompressionCombo : '',
        forceSenseOf(r.governingForce, zeroTol) === '0' ? fmt.memberNum(0) : `${fmt.memberNum(r.governingForce)} ${fmt.sense(r.governingForce)}`,
        r.governing ?? '—',
      ],
    })),
  };

  const residualRows = analysis.cases.map((c) => {
    const ratio = c.check.largestLoad > 0 ? c.residual / c.check.largestLoad : c.residual;
    return { cells: [c.caseId, fmt.num(c.check.largestLoad, 'force'), `${c.residual.toExponential(2)}`, c.check.residualJointTag ?? '—', ratio.toExponential(1), ratio <= RESIDUAL_RELATIVE_LIMIT ? 'OK' : 'NOT OK'] };
  });
  const residualOk = analysis.cases.every((c) => (c.check.largestLoad > 0 ? c.residual / c.check.largestLoad : c.residual) <= RESIDUAL_RELATIVE_LIMIT);
  const worst = Math.max(0, ...analysis.cases.map((c) => c.residual));

  // ---- cover
  const clauses = [...new Set(model.combinations.map((c) => c.clause).filter((c): c is string => !!c))];
  const contents: { anchor: string; title: string }[] = unstable
    ? [
        { anchor: 'stability', title: 'Stability and determinacy — finding' },
        { anchor: 'geometry', title: 'Geometry' },
        { anchor: 'design-basis', title: 'Design basis and caution' },
      ]
    : [
        { anchor: 'design-basis', title: 'Design basis and caution' },
        { anchor: 'geometry', title: 'Geometry' },
        { anchor: 'supports', title: 'Supports and materials' },
        ...(takeoff.length ? [{ anchor: 'takeoff', title: 'Roof load takeoff' }] : []),
        { anchor: 'loads', title: 'Load cases and combinations' },
        { anchor: 'stability', title: 'Stability and determinacy' },
        ...cases.map((c) => ({ anchor: c.anchor, title: `${c.title}: zero-force members, reactions, joints, forces` })),
        ...(comboTables.length ? [{ anchor: 'combinations', title: 'Combinations and envelope' }] : [{ anchor: 'combinations', title: 'Envelope' }]),
        { anchor: 'residual', title: 'Equilibrium residual check' },
      ];
  const summary = unstable
    ? [
        { label: 'Finding', value: 'Unstable — no member forces are given' },
        { label: 'Joints of the mechanism', value: mechanism || '—' },
      ]
    : [
        { label: 'Stability', value: stability.verdict },
        { label: 'Load cases', value: String(analysis.cases.length) },
        { label: 'Combinations', value: String(analysis.combinations.length) },
        ...(() => {
          const env = analysis.envelope;
          if (!env.length) return [];
          const t = env.reduce((a, b) => (b.maxTension > a.maxTension ? b : a));
          const c = env.reduce((a, b) => (b.maxCompression < a.maxCompression ? b : a));
          return [
            ...(t.maxTension > zeroTol ? [{ label: 'Largest tension', value: `${t.tag}: ${fmt.member(t.maxTension)}, ${t.maxTensionCombo}` }] : []),
            ...(c.maxCompression < -zeroTol ? [{ label: 'Largest compression', value: `${c.tag}: ${fmt.member(c.maxCompression)}, ${c.maxCompressionCombo}` }] : []),
          ];
        })(),
        { label: 'Largest residual', value: `${worst.toExponential(2)} kN — ${residualOk ? 'in equilibrium' : 'NOT in equilibrium'}` },
      ];

  return {
    paper: input.firm.paperSize,
    documentTitle: `${project.jobNumber} ${input.subject} — rev ${input.revision}`,
    unstable,
    units,
    titleBlock,
    cover: {
      rows: [
        { label: 'Project', value: project.name },
        { label: 'Job number', value: project.jobNumber },
        ...(project.client ? [{ label: 'Client', value: project.client }] : []),
        ...(project.site ? [{ label: 'Site', value: project.site }] : []),
        { label: 'Truss', value: input.trussName },
        { label: 'Revision', value: input.revision },
        { label: 'Units', value: `${units.system} (${units.force}, ${units.length})` },
        ...(input.runLabel ? [{ label: 'Analysis run', value: input.runLabel }] : []),
        { label: 'Generated', value: isoMinute(input.generatedAt) },
      ],
      summary,
      contents,
    },
    numbers: Object.fromEntries(contents.map((c, i) => [c.anchor, String(i + 1)])),
    caution: CAUTION,
    designBasis: {
      paragraphs: (project.designBasis ?? '').split(/\n\s*\n/).map((p) => p.trim()).filter(Boolean),
      clauses,
      method: [
        'Plane truss, members pin-jointed at both ends, loads at the joints; member forces are axial, tension positive and marked (T), compression negative and marked (C).',
        'Stability and determinacy by the count m + r against 2j and by the rank of the joint-equilibrium matrix.',
        'Zero-force members by the two joint rules, repeated until nothing changes.',
        cls.kind === 'indeterminate'
          ? 'Member forces by the direct stiffness method with each member’s EA; reactions from the equilibrium of the supported joints.'
          : 'Support reactions from global equilibrium; member forces by the method of joints, joint by joint, each with at most two unknowns.',
        'Every result is checked by an independent residual of equilibrium at every joint.',
      ],
    },
    geometry,
    supports,
    takeoff,
    loadCases,
    combinations,
    stability,
    cases,
    comboTables,
    comboResidualRows,
    envelope,
    residual: {
      rows: residualRows,
      ok: residualOk,
      verdict: residualOk
        ? `Every load case is in equilibrium at every joint: the largest out-of-balance force is ${worst.toExponential(2)} kN.`
        : 'At least one load case is NOT in equilibrium: do not use these results.',
    },
    generatedAt: isoMinute(input.generatedAt),
  };
}
