import { useState } from 'react';
import { useFieldArray, useWatch } from 'react-hook-form';
import { COMBINATION_SETS, CombinationError, combinationsBuild, combinationsIgnoredCases, type CombinationSetId } from '@shared/combinations';
import { Button } from '@/components/ui/button';
import { fieldErrorText } from '../utils/field-error';
import type { DraftForm } from './draft-actions';
import { CELL_INPUT, TH, TH_RIGHT } from './supports-table';
import { RemoveCell } from './remove-cell';

/** Combinations from a built-in code set (each with its clause) or written by hand. */
export function CombinationsSection({ form, mayEdit }: { form: DraftForm; mayEdit: boolean }) {
  const { fields, append, remove, replace } = useFieldArray({ control: form.control, name: 'combinations' });
  const combos = useWatch({ control: form.control, name: 'combinations' }) ?? [];
  const cases = useWatch({ control: form.control, name: 'loadCases' }) ?? [];
  const [setId, setSetId] = useState<CombinationSetId>(COMBINATION_SETS[0]!.id);
  const [problem, setProblem] = useState<string | null>(null);
  const [notes, setNotes] = useState<string[]>([]);
  const info = COMBINATION_SETS.find((s) => s.id === setId);
  const errors = form.formState.errors.combinations;

  const build = (mode: 'replace' | 'add') => {
    setProblem(null);
    try {
      const built = combinationsBuild(setId, cases).map((c) => ({ name: c.name, factors: c.factors, clause: c.clause }));
      if (built.length === 0) {
        setProblem('This set gives no combinations for these load cases: add a dead-load case first.');
        return;
      }
      if (mode === 'replace') replace(built);
      else append(built);
      setNotes(combinationsIgnoredCases(cases).map((c) => c.reason));
    } catch (error) {
      setProblem(error instanceof CombinationError ? error.message : 'The combinations could not be built from these load cases.');
    }
  };

  const setFactor = (i: number, caseId: string, text: string) => {
    const v = text.trim() === '' ? 0 : Number(text);
    if (!Number.isFinite(v)) return;
    const factors = { ...(form.getValues(`combinations.${i}.factors`) ?? {}) };
    if (v === 0) delete factors[caseId];
    else factors[caseId] = v;
    form.setValue(`combinations.${i}.factors`, factors, { shouldDirty: true });
  };

  return (
    <div className="flex flex-col gap-3">
      {mayEdit && (
        <div className="flex flex-wrap items-end gap-2 rounded-xs border border-paper-line bg-paper px-3 py-3">
          <label className="flex flex-col gap-1 text-xs font-semibold text-ink-soft">
            Code set
            <select className={`${CELL_INPUT} border-paper-line w-80 font-normal`} value={setId} onChange={(e) => setSetId(e.target.value as CombinationSetId)}>
              {COMBINATION_SETS.map((s) => (
                <option key={s.id} value={s.id}>
                  {s.title}
                </option>
              ))}
            </select>
          </label>
          <Button size="sm" variant="primary" onClick={() => build('replace')} disabled={cases.length === 0}>
            Use this set
          </Button>
          <Button size="sm" onClick={() => build('add')} disabled={cases.length === 0}>
            Add its combinations
          </Button>
          {info && <p className="w-full text-xs text-ink-faint">{info.basis}</p>}
        </div>
      )}
      {problem && (
        <p role="alert" className="text-sm text-danger">
          {problem}
        </p>
      )}
      {notes.map((n) => (
        <p key={n} className="text-xs text-ink-soft">
          {n}
        </p>
      ))}

      <div className="overflow-x-auto">
        <table className="w-full border-collapse border-b border-ink-soft text-[13px]">
          <thead>
            <tr className="border-y border-ink-soft">
              <th className={TH}>Combination</th>
              {cases.map((c) => (
                <th key={c.id} className={TH_RIGHT} title={c.name}>
                  × {c.id}
                </th>
              ))}
              <th className={TH}>Clause</th>
              <th className={TH}>
                <span className="sr-only">Remove</span>
              </th>
            </tr>
          </thead>
          <tbody>
            {fields.length === 0 && (
              <tr>
                <td colSpan={cases.length + 3} className="px-2 py-4 text-center text-sm text-ink-soft">
                  No combinations: results are given per load case, and the envelope runs over the cases.
                </td>
              </tr>
            )}
            {fields.map((field, i) => {
              const nameError = fieldErrorText(errors?.[i]?.name?.message);
              return (
                <tr key={field.id} className="border-b border-paper-line/70 align-top">
                  <td className="min-w-40 px-2 py-1">
                    <input aria-label={`Combination ${i + 1}: name`} className={`${CELL_INPUT} ${nameError ? 'border-danger' : 'border-paper-line'}`} {...form.register(`combinations.${i}.name`)} />
                    {nameError && <p className="mt-0.5 text-xs text-danger">{nameError}</p>}
                  </td>
                  {cases.map((c) => (
                    <td key={c.id} className="w-20 px-1 py-1">
                      <input
                        // Uncontrolled, so "1." can be typed on the way to "1.25"; remounted when the row is replaced.
                        key={`${field.id}-${c.id}`}
                        type="number"
                        step="any"
                        aria-label={`Combination ${i + 1}: factor on ${c.id}`}
                        className={`${CELL_INPUT} border-paper-line text-right`}
                        defaultValue={combos[i]?.factors?.[c.id] ?? ''}
                        placeholder="—"
                        onChange={(e) => setFactor(i, c.id, e.target.value)}
                      />
                    </td>
                  ))}
                  <td className="min-w-56 px-2 py-1">
                    <input aria-label={`Combination ${i + 1}: clause`} className={`${CELL_INPUT} border-paper-line text-ink-soft`} {...form.register(`combinations.${i}.clause`)} />
                  </td>
                  <RemoveCell show={mayEdit} onRemove={() => remove(i)} />
                </tr>
              );
            })}
          </tbody>
        </table>
      </div>
      {mayEdit && (
        <div>
          <Button size="sm" onClick={() => append({ name: `C${fields.length + 1}`, factors: {}, clause: '' })} disabled={cases.length === 0}>
            Add a combination by hand
          </Button>
        </div>
      )}
    </div>
  );
}
