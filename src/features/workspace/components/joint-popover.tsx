import { useEffect, useRef, useState } from 'react';
import { useWatch } from 'react-hook-form';
import type { Joint, LoadCategory } from '@shared/model/truss';
import { loadCategorySchema } from '@shared/model/truss';
import { Button } from '@/components/ui/button';
import { CATEGORY_LABELS } from '../utils/model-draft';
import { draftActions, type DraftForm } from './draft-actions';

interface JointPopoverProps {
  form: DraftForm;
  joint: Joint;
  /** px from the drawing's top left. */
  at: { x: number; y: number };
  /** Size of the drawing, px, so the popover stays inside it. */
  box: { width: number; height: number };
  mayEdit: boolean;
  onClose: () => void;
}

const POPOVER_WIDTH = 272;
const INPUT = 'h-8 w-full rounded-xs border border-paper-line bg-paper-raised px-2 text-sm focus:border-accent focus:outline-none';

/** Click on a joint: put a pin or a roller on it, or a joint load of a case. */
export function JointPopover({ form, joint, at, box, mayEdit, onClose }: JointPopoverProps) {
  const actions = draftActions(form);
  const supports = useWatch({ control: form.control, name: 'supports' }) ?? [];
  const loads = useWatch({ control: form.control, name: 'loads' }) ?? [];
  const cases = useWatch({ control: form.control, name: 'loadCases' }) ?? [];
  const support = supports.find((s) => s.joint === joint.id);
  const [caseId, setCaseId] = useState(cases[0]?.id ?? '');
  const [fx, setFx] = useState('0');
  const [fy, setFy] = useState('');
  const [problem, setProblem] = useState<string | null>(null);
  const ref = useRef<HTMLDivElement>(null);

  useEffect(() => {
    ref.current?.querySelector<HTMLElement>('input,select,button')?.focus();
    const onKey = (e: KeyboardEvent) => e.key === 'Escape' && onClose();
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  }, [onClose]);

  const here = loads.map((l, index) => ({ l, index })).filter(({ l }) => l.joint === joint.id);
  const left = Math.min(Math.max(8, at.x + 14), box.width - POPOVER_WIDTH - 8);
  const top = Math.min(Math.max(8, at.y - 40), Math.max(8, box.height - 330));

  const addLoad = () => {
    const x = fx.trim() === '' ? 0 : Number(fx);
    const y = fy.trim() === '' ? 0 : Number(fy);
    if (!caseId) return setProblem('Choose a load case, or add one.');
    if (!Number.isFinite(x) || !Number.isFinite(y)) return setProblem('Fx and Fy must be numbers in kN.');
    if (x === 0 && y === 0) return setProblem('Enter Fx or Fy: a load of 0 kN does nothing.');
    actions.addLoad({ caseId, joint: joint.id, fx: x, fy: y });
    setProblem(null);
    setFy('');
  };

  const chooseCase = (value: string) => {
    if (value.startsWith('new:')) setCaseId(actions.addCase(value.slice(4) as LoadCategory));
    else setCaseId(value);
  };

  return (
    <div
      ref={ref}
      role="dialog"
      aria-label={`Joint ${joint.tag}`}
      className="absolute z-10 rounded-xs border border-paper-line bg-paper-raised p-3 text-sm outline outline-1 outline-ink-soft"
      style={{ left, top, width: POPOVER_WIDTH }}
    >
      <div className="mb-2 flex items-baseline justify-between gap-2">
        <p className="font-semibold text-ink">
          Joint {joint.tag}{' '}
          <span className="figures text-xs font-normal text-ink-faint">
            ({joint.x.toFixed(3)}, {joint.y.toFixed(3)}) m
          </span>
        </p>
        <button type="button" onClick={onClose} className="text-ink-faint hover:text-ink" aria-label="Close">
          ×
        </button>
      </div>

      <fieldset disabled={!mayEdit} className="mb-3">
        <legend className="mb-1 text-[11px] font-semibold text-ink-soft">Support</legend>
        <div className="flex gap-1" role="radiogroup" aria-label="Support">
          {(['none', 'pin', 'roller'] as const).map((kind) => {
            const active = (support?.kind ?? 'none') === kind;
            return (
              <button
                key={kind}
                type="button"
                role="radio"
                aria-checked={active}
                onClick={() =>
                  actions.setSupport(joint.id, kind === 'none' ? null : kind === 'pin' ? { joint: joint.id, kind: 'pin' } : { joint: joint.id, kind: 'roller', angleDeg: 90 })
                }
                className={`h-8 flex-1 rounded-xs border text-xs font-medium ${active ? 'border-accent bg-accent-soft text-accent' : 'border-paper-line text-ink-soft hover:bg-paper-sunk'}`}
              >
                {kind === 'none' ? 'None' : kind === 'pin' ? 'Pin' : 'Roller'}
              </button>
            );
          })}
        </div>
        {support?.kind === 'roller' && (
          <label className="mt-2 flex items-center gap-2 text-xs text-ink-soft">
            Roller pushes at
            <input
              type="number"
              step="any"
              className={`${INPUT} w-20 text-right`}
              aria-label="Angle of the roller's reaction, degrees from horizontal"
              defaultValue={support.angleDeg ?? 90}
              onChange={(e) => {
                const v = Number(e.target.value);
                if (e.target.value !== '' && Number.isFinite(v)) actions.setSupport(joint.id, { joint: joint.id, kind: 'roller', angleDeg: v });
              }}
            />
            ° from horizontal, anticlockwise (90° is straight up)
          </label>
        )}
      </fieldset>

      <div>
        <p className="mb-1 text-[11px] font-semibold text-ink-soft">Joint loads</p>
        {here.length === 0 ? (
          <p className="mb-2 text-xs text-ink-faint">None at this joint.</p>
        ) : (
          <ul className="mb-2 divide-y divide-paper-line rounded-xs border border-paper-line">
            {here.map(({ l, index }) => (
              <li key={index} className="figures flex items-center justify-between gap-2 px-2 py-1 text-xs">
                <span className="font-medium text-ink">{l.caseId}</span>
                <span className="text-ink-soft">
                  Fx {l.fx} kN · Fy {l.fy} kN
                </span>
                {mayEdit && (
                  <button type="button" className="text-danger hover:underline" onClick={() => actions.removeLoads(new Set([index]))} aria-label={`Remove the ${l.caseId} load`}>
                    Remove
                  </button>
                )}
              </li>
            ))}
          </ul>
        )}
        {mayEdit && (
          <div className="grid grid-cols-[1fr_4.5rem_4.5rem] gap-1.5">
            <select aria-label="Load case" className={INPUT} value={caseId} onChange={(e) => chooseCase(e.target.value)}>
              {cases.length === 0 && <option value="">No cases yet</option>}
              {cases.map((c) => (
                <option key={c.id} value={c.id}>
                  {c.id} — {c.name}
                </option>
              ))}
              {loadCategorySchema.options.map((cat) => (
                <option key={cat} value={`new:${cat}`}>
                  + New {CATEGORY_LABELS[cat].toLowerCase()} case
                </option>
              ))}
            </select>
            <input aria-label="Fx, kN" placeholder="Fx kN" type="number" step="any" className={`${INPUT} text-right`} value={fx} onChange={(e) => setFx(e.target.value)} />
            <input aria-label="Fy, kN (negative is down)" placeholder="Fy kN" type="number" step="any" className={`${INPUT} text-right`} value={fy} onChange={(e) => setFy(e.target.value)} />
            <p className="col-span-3 text-[11px] text-ink-faint">kN; +x right, +y up (a gravity load has Fy &lt; 0).</p>
            {problem && (
              <p role="alert" className="col-span-3 text-xs text-danger">
                {problem}
              </p>
            )}
            <div className="col-span-3 flex justify-end gap-2">
              <Button size="sm" variant="secondary" onClick={addLoad}>
                Add load
              </Button>
              <Button size="sm" variant="primary" onClick={onClose}>
                Done
              </Button>
            </div>
          </div>
        )}
      </div>
    </div>
  );
}
