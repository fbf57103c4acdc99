import type { ReactionEnvelopeRow } from '@shared/solver';
import type { UnitSystemId } from '@shared/units';
import { forceDigits, forceText, forceUnit, FORCE_ZERO_KN } from '../utils/force-format';

const TH = 'px-2 py-1.5 text-left';
const TH_NUM = 'px-2 py-1.5 text-right';

/** Uplift at a support in words, in the project's unit: what the bearing must hold down, and under which combination. */
export function upliftWords(row: ReactionEnvelopeRow, unitSystem: UnitSystemId): string | null {
  if (row.ryMin >= -FORCE_ZERO_KN) return null;
  return `Uplift at ${row.at}: under ${row.ryMinCombo} the support must hold the truss down with ${forceText(-row.ryMin, unitSystem)}. Design the bearing's anchor or hold-down for it.`;
}

/**
 * Each support's largest and least Rx and Ry over the combinations (or the cases), with the
 * combination that gives each, for bearing design; uplift is said in words under the table.
 */
export function ReactionEnvelopeTable({ rows, over, unitSystem }: { rows: ReactionEnvelopeRow[]; over: string; unitSystem: UnitSystemId }) {
  const unit = forceUnit(unitSystem);
  const words = rows.map((r) => upliftWords(r, unitSystem)).filter((w): w is string => w !== null);
  return (
    <div>
      <h3 className="mb-2 text-sm font-semibold text-ink">Reactions for bearing design</h3>
      <table aria-label="Reaction envelope" className="w-full border-collapse text-[13px]">
        <thead>
          <tr className="border-y border-ink-soft text-[12px] font-semibold text-ink-soft">
            <th className={TH}>Joint</th>
            <th className={TH}>Component</th>
            <th className={TH_NUM}>Max ({unit})</th>
            <th className={TH}>from</th>
            <th className={TH_NUM}>Min ({unit})</th>
            <th className={TH}>from</th>
          </tr>
        </thead>
        <tbody className="figures">
          {rows.flatMap((r) => [
            <tr key={`${r.joint}-x`} className="border-b border-paper-line/60">
              <td className="px-2 py-1 font-medium">{r.at}</td>
              <td className="px-2 py-1 text-ink-soft">Rx</td>
              <td className="px-2 py-1 text-right">{forceDigits(r.rxMax, unitSystem)}</td>
              <td className="px-2 py-1 text-ink-soft">{r.rxMaxCombo ?? '—'}</td>
              <td className="px-2 py-1 text-right">{forceDigits(r.rxMin, unitSystem)}</td>
              <td className="px-2 py-1 text-ink-soft">{r.rxMinCombo ?? '—'}</td>
            </tr>,
            <tr key={`${r.joint}-y`} className="border-b border-paper-line/60">
              <td className="px-2 py-1" />
              <td className="px-2 py-1 text-ink-soft">Ry</td>
              <td className="px-2 py-1 text-right">{forceDigits(r.ryMax, unitSystem)}</td>
              <td className="px-2 py-1 text-ink-soft">{r.ryMaxCombo ?? '—'}</td>
              <td className={`px-2 py-1 text-right ${r.ryMin < -FORCE_ZERO_KN ? 'font-semibold text-danger' : ''}`}>{forceDigits(r.ryMin, unitSystem)}</td>
              <td className="px-2 py-1 text-ink-soft">{r.ryMinCombo ?? '—'}</td>
            </tr>,
          ])}
        </tbody>
      </table>
      <p className="mt-1 text-xs text-ink-faint">Over the {over}; +x right, +y up; a negative Ry is uplift.</p>
      {words.length > 0 ? (
        <ul role="alert" aria-label="Uplift" className="mt-2 flex flex-col gap-1 text-sm text-danger">
          {words.map((w) => (
            <li key={w}>{w}</li>
          ))}
        </ul>
      ) : (
        <p className="mt-2 text-sm text-ink-soft">No uplift: every support bears down under every {over === 'combinations' ? 'combination' : 'load case'}.</p>
      )}
    </div>
  );
}
