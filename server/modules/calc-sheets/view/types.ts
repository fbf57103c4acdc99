import type { TrussModel } from '@shared/model/truss';
import type { FirmSettings, UnitSystem } from '@shared/schemas/project.schema';
import type { TrussAnalysis } from '@shared/solver';
import type { TakeoffStep } from '@shared/takeoff';
import type { RunDesign } from '@shared/design/basis';

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
  /** The run's member design checks and deflections, when the model has a member design. */
  design?: RunDesign | null;
  /** Roof loading steps (shared/takeoff), when the loads came from a takeoff. */
  takeoffSteps?: TakeoffStep[];
  /** Which analysis run the sheet was made from (printed on the cover and every page). */
  runLabel?: string;
  /** The run's number within its truss ("Run 2 of T7"), for file names. */
  runNumber?: number;
  /** When the sheet was generated. */
  generatedAt: Date | string;
  /** Set on the issued print only: the copy's id, fingerprint and verify address (every page, last page). */
  issue?: { sheetId: number; fingerprint: string; fingerprintOf: string; verifyUrl: string } | null;
  /**
   * The revision table of a sheet revision: every revision of the truss up to this one, with its
   * date and what changed against the one before (sheet-revisions/revision-compare.service.ts).
   * Absent on a run's draft, which is no revision yet.
   */
  revisionHistory?: { revision: string; date: string; status: string; lines: string[] }[];
}

/** A step of the sheet: a stable anchor id (the solver's step id), a title and typeset lines. */
export interface StepView {
  id: string;
  title: string;
  /** KaTeX HTML, one display equation per entry. */
  lines: string[];
  /** Printed reference: section number and step within it, e.g. "6.4" (set when the sheet is built). */
  number?: string;
  /** The KaTeX source of each entry of `lines` (what the sheet's arithmetic tests read back). */
  tex: string[];
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

/** A line of the cover's contents: the section's anchor and its title. */
export interface ContentsEntry {
  anchor: string;
  title: string;
}

/** A line of the cover's summary. */
export interface SummaryRow {
  label: string;
  value: string;
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
    /** Empty until the sheet is issued. */
    issuedBy: string;
    issuedDate: string;
    run: string;
    /** The firm's address as entered, line by line (the page head prints each on its own line). */
    firmAddressLines: string[];
    /** Type size (pt) of the page head and of the footer, chosen so long names fit (view/page-frame.ts). */
    headPt: number;
    footPt: number;
  };
  /** The issued copy's stamp: printed in every page's footer; the last page says how to verify it (QR code SVG). */
  issue: { sheetId: number; revision: string; fingerprint: string; fingerprintOf: string; verifyUrl: string; qrSvg: string } | null;
  cover: {
    rows: SummaryRow[];
    summary: SummaryRow[];
    contents: ContentsEntry[];
  };
  /** Section number by anchor ("1", "2", …), in the order of the contents. */
  numbers: Record<string, string>;
  caution: string;
  designBasis: {
    paragraphs: string[];
    clauses: string[];
    method: string[];
    /** The symbols the sheet's steps use, each typeset (KaTeX HTML) with what it stands for. */
    symbols: DesignBasisSymbol[];
  };
  geometry: { svg: string; jointRows: TableRow[]; memberRows: TableRow[] };
  supports: { rows: TableRow[]; materialRows: TableRow[]; materialNote: string };
  takeoff: StepView[];
  loadCases: { rows: TableRow[] };
  combinations: { rows: TableRow[] };
  /** Per built-in set the combinations cite: why they are what they are (or that they were edited). */
  combinationReasons: { title: string; asFormed: boolean; lines: string[] }[];
  stability: StepView & {
    verdict: string;
    message: string;
    mechanism: string;
    symmetry: string;
    /** How near a mechanism the stable truss is, in words ('' for an unstable one or an older run). */
    conditioning: string;
    /** True when flagged near a mechanism (the sheet shows it as a warning). */
    nearMechanism: boolean;
  };
  cases: CaseView[];
  comboTables: { title: string; head: string[]; rows: TableRow[] }[];
  comboResidualRows: TableRow[];
  envelope: { source: string; rows: TableRow[] };
  /** Reactions for bearing design: by case and combination, extremes per component, uplift in words. */
  bearings: {
    source: string;
    /** Tables of up to three supports: Rx and Ry of each under every case (cls 'case') and combination. */
    bySource: { head: string[]; rows: TableRow[] }[];
    /** Two rows per support (Rx, Ry): support, kind, component, max, from, min, from. */
    extremes: TableRow[];
    words: string[];
  };
  residual: { rows: TableRow[]; verdict: string; ok: boolean };
  /** Member design pages: one per group, the governing member's steps in full, the others in a table. */
  designChecks: {
    present: boolean;
    standard: string;
    caution: string;
    notApplied: string[];
    /** The symbols the design steps print, with their meanings (shared/design/symbols.ts), before the first group. */
    symbols: { symbol: string; meaning: string }[];
    error: string | null;
    groups: DesignGroupView[];
    /** The project's design units: the force unit of the tables' headings and the line saying what the steps are worked in. */
    units: { force: string; line: string };
  };
  /** Joint deflections by the unit-load method, after the member forces. */
  deflection: {
    present: boolean;
    rows: TableRow[];
    tables: { title: string; rows: TableRow[]; sum: string }[];
    note: string;
    /** The deflected shape per service combination, exaggerated with its scale written; a sentence when not drawn. */
    shapes: { title: string; svg: string }[];
    shapesNote: string | null;
    /** Units of the tables' headings: deflection and lengths (mm or in), force, area, stress. */
    units: { length: string; force: string; area: string; stress: string };
  };
  generatedAt: string;
  /** The cover's revision table (view/revision-table.ts); no rows on a draft. */
  revisionTable: { rows: { revision: string; date: string; status: string; lines: string[] }[] };
}

/** One design group on the sheet. */
export interface DesignGroupView {
  anchor: string;
  title: string;
  /** Material, section, lengths: label and value. */
  basis: SummaryRow[];
  governing: { tag: string; line: string; steps: TableRow[]; notes: string[]; refused?: string } | null;
  /** Every member of the group: tag, tension, compression, governing combination, clause, utilisation, result. */
  rows: TableRow[];
}

/**
 * One symbol of the design basis: its KaTeX source and HTML, and what it stands for. `group`
 * 'takeoff': written by the roof load takeoff's steps, listed under that section's heading.
 */
export interface DesignBasisSymbol {
  html: string;
  tex: string;
  meaning: string;
  group?: 'takeoff';
  /** The first symbol of its group: the list prints the group's heading before it. */
  groupStart?: boolean;
}
