import type { RoofTakeoffResult } from '@shared/takeoff';
import { takeoffStepKatex } from '@shared/takeoff';
import { numberFormat } from '@shared/units';
import { alignedRows } from '@shared/text/breakable-tex';
import { Tex } from './tex';
import { TH, TH_RIGHT } from './supports-table';

const f = (v: number, d: number) => numberFormat(v, d);
const ordinal = (n: number) => `${n}${n % 10 === 1 && n % 100 !== 11 ? 'st' : n % 10 === 2 && n % 100 !== 12 ? 'nd' : n % 10 === 3 && n % 100 !== 13 ? 'rd' : 'th'}`;

/**
 * The takeoff as the server computed it: widths, line loads, and the purlin reactions both ways.
 * `loadLetter` is the truss's load letter (loadLetterOf in @shared/solver, the sheet's rule): P,
 * unless a tag of this truss could be read as P.
 */
export function TakeoffPreview({ result, caseNames, loadLetter }: { result: RoofTakeoffResult; caseNames: ReadonlyMap<string, string>; loadLetter: string }) {
  const equalSpans = result.spans.every((s) => Math.abs(s - result.spans[0]!) < 1e-9);
  return (
    <div className="flex flex-col gap-4" aria-label="Roof loading preview">
      <p className="figures text-sm text-ink">
        Truss {result.trussIndex + 1} of {result.trussCount} ({ordinal(result.trussIndex + 1)} from the end, {result.trussPosition}) · purlin spans{' '}
        {equalSpans ? `${result.spans.length} × ${f(result.spans[0]!, 3)} m` : result.spans.map((s) => f(s, 3)).join(', ') + ' m'} · reaction on this truss per 1 kN/m of purlin load:{' '}
        <strong>{f(result.exactPerUnit, 3)} m</strong> continuous, <strong>{f(result.tributaryPerUnit, 3)} m</strong> by tributary length
      </p>

      <table className="w-full max-w-xl border-collapse text-[13px]">
        <caption className="mb-1 text-left text-xs font-semibold text-ink-soft">Purlins and tributary widths</caption>
        <thead>
          <tr className="border-y border-ink-soft">
            <th className={TH}>Purlin at</th>
            <th className={TH_RIGHT}>x, m</th>
            <th className={TH_RIGHT}>Width along slope, m</th>
            <th className={TH_RIGHT}>Width on plan, m</th>
          </tr>
        </thead>
        <tbody className="figures">
          {result.purlins.map((p) => (
            <tr key={p.joint} className="border-b border-paper-line/60">
              <td className="px-2 py-1 font-medium">{p.tag}</td>
              <td className="px-2 py-1 text-right">{f(p.x, 3)}</td>
              <td className="px-2 py-1 text-right">{f(p.widthSlope, 3)}</td>
              <td className="px-2 py-1 text-right">{f(p.widthPlan, 3)}</td>
            </tr>
          ))}
        </tbody>
      </table>

      {result.cases.map((c) => (
        <table key={c.caseId} className="w-full border-collapse text-[13px]" aria-label={`Roof loading of load case ${c.caseId}`}>
          <caption className="mb-1 text-left text-xs font-semibold text-ink-soft">
            {c.caseId} — {caseNames.get(c.caseId) ?? 'new case'}: q = {f(c.q, 3)} kPa on the {c.basis === 'slope' ? 'sloped roof area' : 'horizontal projection'}
            {c.pattern && (
              <span className="block font-normal text-ink">
                Governing span pattern for this truss: <strong>{c.pattern.label}</strong> — {f(c.pattern.exactPerUnit, 3)} m per 1 kN/m continuous (all spans
                loaded: {f(result.exactPerUnit, 3)} m); ASCE/SEI 7-16 4.3.3, 7.5
              </span>
            )}
          </caption>
          <thead>
            <tr className="border-y border-ink-soft">
              <th className={TH}>Purlin at</th>
              <th className={TH_RIGHT}>Width b, m</th>
              <th className={TH_RIGHT}>w = q·b, kN/m</th>
              <th className={`${TH_RIGHT} ${result.method === 'exact' ? 'text-accent' : ''}`}>Reaction, three-moment, kN</th>
              <th className={`${TH_RIGHT} ${result.method === 'tributary' ? 'text-accent' : ''}`}>Reaction, tributary, kN</th>
              <th className={TH_RIGHT}>Difference</th>
              <th className={TH_RIGHT}>Joint load Fy, kN</th>
            </tr>
          </thead>
          <tbody className="figures">
            {c.purlins.map((p) => {
              const load = c.loads.find((l) => l.joint === p.joint);
              return (
                <tr key={p.joint} className="border-b border-paper-line/60">
                  <td className="px-2 py-1 font-medium">{p.tag}</td>
                  <td className="px-2 py-1 text-right">{f(p.width, 3)}</td>
                  <td className="px-2 py-1 text-right">{f(p.w, 3)}</td>
                  <td className={`px-2 py-1 text-right ${result.method === 'exact' ? 'font-semibold text-ink' : 'text-ink-soft'}`}>{f(p.exact, 2)}</td>
                  <td className={`px-2 py-1 text-right ${result.method === 'tributary' ? 'font-semibold text-ink' : 'text-ink-soft'}`}>{f(p.tributary, 2)}</td>
                  <td className="px-2 py-1 text-right text-ink-soft">{p.differencePct === null ? '—' : `${f(p.differencePct, 1)} %`}</td>
                  <td className="px-2 py-1 text-right">{load ? f(load.fy, 2) : '—'}</td>
                </tr>
              );
            })}
          </tbody>
        </table>
      ))}
      {result.wind && (
        <table className="w-full border-collapse border-b border-ink-soft text-[13px]" aria-label={`Wind on the roof, load case ${result.wind.caseId}`}>
          <caption className="mb-1 text-left text-xs font-semibold text-ink-soft">
            {result.wind.caseId} — {caseNames.get(result.wind.caseId) ?? 'new case'}: wind normal to the roof, q = {f(result.wind.q, 3)} kPa onto the{' '}
            {result.wind.windward} slope; coefficients windward {result.wind.cWindward === null ? '—' : f(result.wind.cWindward, 2)}, leeward{' '}
            {result.wind.cLeeward === null ? '—' : f(result.wind.cLeeward, 2)}
          </caption>
          <thead>
            <tr className="border-y border-ink-soft">
              <th className={TH}>Purlin at</th>
              <th className={TH_RIGHT}>x, m</th>
              <th className={TH_RIGHT}>wx, kN/m</th>
              <th className={TH_RIGHT}>wy, kN/m</th>
              <th className={TH_RIGHT}>Joint load Fx, kN</th>
              <th className={TH_RIGHT}>Joint load Fy, kN</th>
            </tr>
          </thead>
          <tbody className="figures">
            {result.wind.purlins.map((p) => (
              <tr key={p.joint} className="border-b border-paper-line/60">
                <td className="px-2 py-1 font-medium">{p.tag}</td>
                <td className="px-2 py-1 text-right">{f(result.purlins.find((r) => r.joint === p.joint)?.x ?? Number.NaN, 3)}</td>
                <td className="px-2 py-1 text-right">{f(p.wx, 3)}</td>
                <td className="px-2 py-1 text-right">{f(p.wy, 3)}</td>
                <td className="px-2 py-1 text-right">{f(p.fx, 2)}</td>
                <td className="px-2 py-1 text-right">{f(p.fy, 2)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
      <p className="text-xs text-ink-faint">
        Difference = (tributary − three-moment) / three-moment. The joint loads use the {result.method === 'exact' ? 'three-moment (continuous purlin)' : 'tributary-length'} reactions, downward (Fy &lt; 0).
      </p>

      <details className="rounded-xs border border-paper-line bg-paper px-3 py-2">
        <summary className="cursor-pointer text-sm font-medium text-ink">Every step of the roof loading ({result.steps.length})</summary>
        <ol className="mt-2 flex flex-col gap-2">
          {result.steps.map((s) => (
            <li key={s.id}>
              <p className="text-xs font-semibold text-ink-soft">{s.title}</p>
              {/* Each row its own equation, as on the sheet, so a long row wraps inside the card. */}
              {alignedRows(takeoffStepKatex(s, { loadLetter })).map((row, k) => (
                <Tex key={k} source={row} />
              ))}
            </li>
          ))}
        </ol>
      </details>
    </div>
  );
}
