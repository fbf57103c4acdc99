import type { TrussModel } from '@shared/model/truss';
import type { CaseResult, TrussAnalysis } from '@shared/solver';
import type { UnitSystemId } from '@shared/units';
import { trussBands, type TrussBand } from '@shared/drawing/truss-svg';
import { formatters, tagOf, type Formatters } from './format';
import type { CalcSheetInput, CalcSheetView, ContentsEntry, SummaryRow } from './types';

/** Largest residual, relative to the largest load, that the sheet calls "in equilibrium" (issue 4 item 7). */
export const RESIDUAL_RELATIVE_LIMIT = 1e-9;

/** A case's largest out-of-balance force over its largest load (the residual itself when unloaded). */
export function residualRatio(c: CaseResult): number {
  return c.check.largestLoad > 0 ? c.residual / c.check.largestLoad : c.residual;
}

/** What every section reads: the input, the unit formatters, tags, bands of a long truss. */
export interface SheetContext {
  input: CalcSheetInput;
  model: TrussModel;
  analysis: TrussAnalysis;
  system: UnitSystemId;
  fmt: Formatters;
  /** Forces below this print as zero. */
  zeroTol: number;
  tags: ReturnType<typeof tagOf>;
  unstable: boolean;
  bands: TrussBand[];
  lengthText(m: number): string;
  memberLength(memberId: string): number;
  /** Draws each band of a long truss as its own row, captioned with its x range when there are several. */
  banded(draw: (band: TrussBand) => string): string;
}

export function sheetContext(input: CalcSheetInput): SheetContext {
  const { model, analysis, project } = input;
  const system: UnitSystemId = project.unitSystem === 'US' ? 'us' : 'si';
  const largestLoad = Math.max(
    0,
    ...model.loadCases.flatMap((c) => c.loads.map((l) => Math.hypot(l.fx, l.fy))),
  );
  // Forces below this are printed as zero: far below the last printed digit (0.005 kN).
  const zeroTol = Math.max(1e-9, largestLoad * 1e-9);
  const fmt = formatters(system, zeroTol);
  const jointById = new Map(model.joints.map((j) => [j.id, j]));
  const memberLength = (id: string) => {
    const m = model.members.find((x) => x.id === id);
    const a = m && jointById.get(m.from);
    const b = m && jointById.get(m.to);
    return a && b ? Math.hypot(b.x - a.x, b.y - a.y) : 0;
  };
  const bands = trussBands(model);
  const lengthText = (m: number) => fmt.qty(m, 'length');
  const banded = (draw: (band: TrussBand) => string) => {
    if (bands.length === 1) return draw(bands[0]);
    return bands
      .map((b, i) => `<div class="band"><div class="band-caption">Part ${i + 1} of ${bands.length}: x = ${lengthText(b.x0)} to ${lengthText(b.x1)}</div>${draw(b)}</div>`)
      .join('');
  };
  return {
    input,
    model,
    analysis,
    system,
    fmt,
    zeroTol,
    tags: tagOf(model),
    unstable: analysis.classification.kind === 'unstable',
    bands,
    lengthText,
    memberLength,
    banded,
  };
}

/** What one section of the sheet adds: its fields of the view, its contents lines, its cover summary lines. */
export interface SectionPart<K extends keyof CalcSheetView> {
  view: Pick<CalcSheetView, K>;
  contents?: ContentsEntry[];
  summary?: SummaryRow[];
}

/** A section of the sheet: one file under view/, listed once in view/index.ts. */
export interface SheetSection<K extends keyof CalcSheetView> {
  build(ctx: SheetContext): SectionPart<K>;
}

/** The view fields a list of sections fills (distributes over the union). */
export type SectionKeys<S> = S extends SheetSection<infer K> ? K : never;
