import { useState } from 'react';
import { useFieldArray, useWatch } from 'react-hook-form';
import { loadCategorySchema, type Joint, type LoadCategory } from '@shared/model/truss';
import { Button } from '@/components/ui/button';
import { CATEGORY_LABELS } from '../utils/model-draft';
import { fieldErrorText } from '../utils/field-error';
import { draftActions, type DraftForm } from './draft-actions';
import { CELL_INPUT, TH, TH_RIGHT } from './supports-table';
import { RemoveCell } from './remove-cell';

interface LoadsSectionProps {
  form: DraftForm;
  joints: readonly Joint[];
  mayEdit: boolean;
  /** "Detach and edit by hand" for a case whose loads come from the roof loading; absent for readers. */
  onDetach?: (caseId: string) => void;
  /** Why detaching cannot happen now (unsaved edits, a save under way), or null. */
  detachBlocked?: string | null;
}

const border = (error?: string) => (error ? 'border-danger' : 'border-paper-line');

/** Load cases with their category, and every joint load in one table for exact entry and bulk edits. */
export function LoadsSection({ form, joints, mayEdit, onDetach, detachBlocked = null }: LoadsSectionProps) {
  const actions = draftActions(form);
  const caseArray = useFieldArray({ control: form.control, name: 'loadCases' });
  const loadArray = useFieldArray({ control: form.control, name: 'loads' });
  const cases = useWatch({ control: form.control, name: 'loadCases' }) ?? [];
  const loads = useWatch({ control: form.control, name: 'loads' }) ?? [];
  const [newCategory, setNewCategory] = useState<LoadCategory>('dead');
  const [selected, setSelected] = useState<Set<number>>(new Set());
  const [bulkFy, setBulkFy] = useState('');
  const [caseFilter, setCaseFilter] = useState('');
  const errors = form.formState.errors;
  const tags = new Map(joints.map((j) => [j.id, j.tag]));
  // Cases the roof loading wrote: their loads are shown read-only until detached (what is shown is what a run solves).
  const fromTakeoff = new Set(cases.filter((c) => c.source === 'roof-loading').map((c) => c.id));
  const [confirming, setConfirming] = useState<string | null>(null);

  const visible = loadArray.fields.map((f, i) => ({ f, i })).filter(({ i }) => !caseFilter || loads[i]?.caseId === caseFilter);
  const editable = visible.filter(({ i }) => !fromTakeoff.has(loads[i]?.caseId ?? ''));
  const allSelected = editable.length > 0 && editable.every(({ i }) => selected.has(i));
  const toggle = (i: number) =>
    setSelected((s) => {
      const next = new Set(s);
      if (next.has(i)) next.delete(i);
      else next.add(i);
      return next;
    });

  const applyFy = () => {
    const v = Number(bulkFy);
    if (bulkFy.trim() === '' || !Number.isFinite(v)) return;
    for (const i of selected) form.setValue(`loads.${i}.fy`, v, { shouldDirty: true });
  };
  const moveTo = (caseId: string) => {
    for (const i of selected) form.setValue(`loads.${i}.caseId`, caseId, { shouldDirty: true });
  };

  return (
    <div className="flex flex-col gap-6">
      <section aria-labelledby="load-cases-title">
        <h3 id="load-cases-title" className="mb-2 text-sm font-semibold text-ink">
          Load cases
        </h3>
        <table className="w-full border-collapse border-b border-ink-soft text-[13px]">
          <thead>
            <tr className="border-y border-ink-soft">
              <th className={TH}>Id</th>
              <th className={TH}>Name</th>
              <th className={TH}>Category</th>
              <th className={TH_RIGHT}>Joint loads</th>
              <th className={TH}>
                <span className="sr-only">Remove</span>
              </th>
            </tr>
          </thead>
          <tbody>
            {caseArray.fields.length === 0 && (
              <tr>
                <td colSpan={5} className="px-2 py-4 text-center text-sm text-ink-soft">
                  No load cases yet. Add one below, or let the roof loading add its cases.
                </td>
              </tr>
            )}
            {caseArray.fields.map((field, i) => {
              const c = cases[i];
              const count = loads.filter((l) => l.caseId === c?.id).length;
              const nameError = fieldErrorText(errors.loadCases?.[i]?.name?.message);
              return (
                <tr key={field.id} className="border-b border-paper-line/70 align-top">
                  <td className="px-2 py-2 font-medium text-ink">{c?.id}</td>
                  <td className="px-2 py-1">
                    <input aria-label={`Load case ${c?.id}: name`} className={`${CELL_INPUT} ${border(nameError)}`} {...form.register(`loadCases.${i}.name`)} />
                    {nameError && <p className="mt-0.5 text-xs text-danger">{nameError}</p>}
                  </td>
                  <td className="px-2 py-1">
                    <select aria-label={`Load case ${c?.id}: category`} className={`${CELL_INPUT} ${border()}`} {...form.register(`loadCases.${i}.category`)}>
                      {loadCategorySchema.options.map((cat) => (
                        <option key={cat} value={cat}>
                          {CATEGORY_LABELS[cat]}
                        </option>
                      ))}
                    </select>
                  </td>
                  <td className="figures px-2 py-2 text-right text-ink-soft">
                    {count}
                    {c && fromTakeoff.has(c.id) && (
                      <span className="ml-2 text-[11px] text-accent">
                        from the roof loading
                        {mayEdit && onDetach && (
                          <button
                            type="button"
                            className="ml-2 font-medium text-accent underline disabled:text-ink-faint disabled:no-underline"
                            disabled={Boolean(detachBlocked)}
                            title={detachBlocked ?? undefined}
                            onClick={() => setConfirming(c.id)}
                          >
                            Detach and edit by hand
                          </button>
                        )}
                      </span>
                    )}
                  </td>
                  <RemoveCell show={Boolean(mayEdit && c)} onRemove={() => c && actions.removeCase(c.id)} />
                </tr>
              );
            })}
          </tbody>
        </table>
        {confirming && fromTakeoff.has(confirming) && onDetach && (
          <div role="alertdialog" aria-label={`Detach the loads of case ${confirming}`} className="mt-2 rounded-xs border border-compression/40 bg-compression/5 px-3 py-2 text-sm">
            <p className="text-ink">
              The roof loading will no longer update the loads of case {confirming}: they stay as they are now and become loads you edit by hand. Detach them?
            </p>
            <div className="mt-2 flex gap-2">
              <Button
                size="sm"
                variant="primary"
                onClick={() => {
                  onDetach(confirming);
                  setConfirming(null);
                }}
              >
                Detach
              </Button>
              <Button size="sm" variant="quiet" onClick={() => setConfirming(null)}>
                Cancel
              </Button>
            </div>
          </div>
        )}
        {detachBlocked && fromTakeoff.size > 0 && mayEdit && <p className="mt-1 text-xs text-ink-soft">{detachBlocked}</p>}
        {mayEdit && (
          <div className="mt-2 flex items-center gap-2">
            <select aria-label="Category of the new load case" className={`${CELL_INPUT} ${border()} w-40`} value={newCategory} onChange={(e) => setNewCategory(e.target.value as LoadCategory)}>
              {loadCategorySchema.options.map((cat) => (
                <option key={cat} value={cat}>
                  {CATEGORY_LABELS[cat]}
                </option>
              ))}
            </select>
            <Button size="sm" onClick={() => actions.addCase(newCategory)}>
              Add load case
            </Button>
          </div>
        )}
      </section>

      <section aria-labelledby="joint-loads-title">
        <div className="mb-2 flex flex-wrap items-end justify-between gap-2">
          <h3 id="joint-loads-title" className="text-sm font-semibold text-ink">
            Joint loads <span className="font-normal text-ink-faint">kN; +x right, +y up (gravity loads have Fy &lt; 0)</span>
          </h3>
          <select aria-label="Show the loads of" className={`${CELL_INPUT} ${border()} w-48`} value={caseFilter} onChange={(e) => setCaseFilter(e.target.value)}>
            <option value="">All load cases</option>
            {cases.map((c) => (
              <option key={c.id} value={c.id}>
                {c.id} — {c.name}
              </option>
            ))}
          </select>
        </div>

        {mayEdit && selected.size > 0 && (
          <div className="mb-2 flex flex-wrap items-center gap-2 rounded-xs border border-accent/30 bg-accent-soft/50 px-3 py-2 text-xs text-ink">
            <span className="font-medium">{selected.size} selected</span>
            <label className="flex items-center gap-1">
              Fy
              <input type="number" step="any" aria-label="Fy for the selected loads, kN" className={`${CELL_INPUT} ${border()} w-24 text-right`} value={bulkFy} onChange={(e) => setBulkFy(e.target.value)} />
              kN
            </label>
            <Button size="sm" onClick={applyFy}>
              Set Fy
            </Button>
            <select aria-label="Move the selected loads to case" className={`${CELL_INPUT} ${border()} w-44`} value="" onChange={(e) => e.target.value && moveTo(e.target.value)}>
              <option value="">Move to case…</option>
              {cases.map((c) => (
                <option key={c.id} value={c.id}>
                  {c.id} — {c.name}
                </option>
              ))}
            </select>
            <Button
              size="sm"
              variant="danger"
              onClick={() => {
                actions.removeLoads(selected);
                setSelected(new Set());
              }}
            >
              Remove selected
            </Button>
          </div>
        )}

        <table className="w-full border-collapse border-b border-ink-soft text-[13px]">
          <thead>
            <tr className="border-y border-ink-soft">
              <th className={`${TH} w-8`}>
                {mayEdit && (
                  <input
                    type="checkbox"
                    className="accent-accent"
                    aria-label="Select all loads shown"
                    checked={allSelected}
                    onChange={() => setSelected(allSelected ? new Set() : new Set(editable.map(({ i }) => i)))}
                  />
                )}
              </th>
              <th className={TH}>Case</th>
              <th className={TH}>Joint</th>
              <th className={TH_RIGHT}>Fx, kN</th>
              <th className={TH_RIGHT}>Fy, kN</th>
              <th className={TH}>Note</th>
              <th className={TH}>
                <span className="sr-only">Remove</span>
              </th>
            </tr>
          </thead>
          <tbody>
            {visible.length === 0 && (
              <tr>
                <td colSpan={7} className="px-2 py-4 text-center text-sm text-ink-soft">
                  No joint loads{caseFilter ? ' in this case' : ''}. Click a joint on the drawing, add a row, or use the roof loading.
                </td>
              </tr>
            )}
            {visible.map(({ f, i }) => {
              const l = loads[i];
              if (l && fromTakeoff.has(l.caseId)) {
                return (
                  <tr key={f.id} className="border-b border-paper-line/70 align-top text-ink-soft" aria-label={`Load ${i + 1}: from the roof loading`}>
                    <td className="px-2 py-2" />
                    <td className="px-2 py-2">{l.caseId}</td>
                    <td className="px-2 py-2">{tags.get(l.joint) ?? l.joint}</td>
                    <td className="figures px-2 py-2 text-right">{Number(l.fx).toFixed(3)}</td>
                    <td className="figures px-2 py-2 text-right">{Number(l.fy).toFixed(3)}</td>
                    <td className="px-2 py-2 text-[11px] text-accent" colSpan={2}>
                      from the roof loading
                    </td>
                  </tr>
                );
              }
              const e = errors.loads?.[i];
              const fxError = fieldErrorText(e?.fx?.message);
              const fyError = fieldErrorText(e?.fy?.message);
              const caseError = fieldErrorText(e?.caseId?.message);
              return (
                <tr key={f.id} className={`border-b border-paper-line/70 align-top ${selected.has(i) ? 'bg-accent-soft/40' : ''}`}>
                  <td className="px-2 py-2">
                    {mayEdit && <input type="checkbox" className="accent-accent" aria-label={`Select load ${i + 1}`} checked={selected.has(i)} onChange={() => toggle(i)} />}
                  </td>
                  <td className="px-2 py-1">
                    <select aria-label={`Load ${i + 1}: case`} className={`${CELL_INPUT} ${border(caseError)}`} {...form.register(`loads.${i}.caseId`)}>
                      {cases.map((c) => (
                        <option key={c.id} value={c.id}>
                          {c.id}
                        </option>
                      ))}
                    </select>
                    {caseError && <p className="mt-0.5 text-xs text-danger">{caseError}</p>}
                  </td>
                  <td className="px-2 py-1">
                    <select aria-label={`Load ${i + 1}: joint`} className={`${CELL_INPUT} ${border()}`} {...form.register(`loads.${i}.joint`)}>
                      {joints.map((j) => (
                        <option key={j.id} value={j.id}>
                          {tags.get(j.id)}
                        </option>
                      ))}
                    </select>
                  </td>
                  <td className="w-28 px-2 py-1">
                    <input type="number" step="any" aria-label={`Load ${i + 1}: Fx, kN`} className={`${CELL_INPUT} ${border(fxError)} text-right`} {...form.register(`loads.${i}.fx`, { valueAsNumber: true })} />
                    {fxError && <p className="mt-0.5 text-xs text-danger">{fxError}</p>}
                  </td>
                  <td className="w-28 px-2 py-1">
                    <input type="number" step="any" aria-label={`Load ${i + 1}: Fy, kN`} className={`${CELL_INPUT} ${border(fyError)} text-right`} {...form.register(`loads.${i}.fy`, { valueAsNumber: true })} />
                    {fyError && <p className="mt-0.5 text-xs text-danger">{fyError}</p>}
                  </td>
                  <td className="px-2 py-1">
                    <input aria-label={`Load ${i + 1}: note`} className={`${CELL_INPUT} ${border()}`} {...form.register(`loads.${i}.note`)} />
                  </td>
                  <td className="w-16 px-2 py-1 text-right">
                    {mayEdit && (
                      <button
                        type="button"
                        className="py-1.5 text-xs text-danger hover:underline"
                        onClick={() => {
                          loadArray.remove(i);
                          setSelected(new Set());
                        }}
                      >
                        Remove
                      </button>
                    )}
                  </td>
                </tr>
              );
            })}
          </tbody>
        </table>
        {mayEdit && cases.length > 0 && joints.length > 0 && (
          <Button size="sm" className="mt-2" onClick={() => loadArray.append({ caseId: caseFilter || cases[0]!.id, joint: joints[0]!.id, fx: 0, fy: 0 })}>
            Add joint load
          </Button>
        )}
        {fromTakeoff.size > 0 && (
          <p className="mt-2 text-xs text-ink-soft">
            Loads marked “from the roof loading” are the roof loading’s and read-only: change the roof loading and use its loads again, or detach a case to edit its loads by hand. A run solves the loads shown here.
          </p>
        )}
      </section>
    </div>
  );
}
