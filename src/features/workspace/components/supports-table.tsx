import { useFieldArray, useWatch } from 'react-hook-form';
import type { Joint } from '@shared/model/truss';
import { Button } from '@/components/ui/button';
import { fieldErrorText } from '../utils/field-error';
import type { DraftForm } from './draft-actions';
import { RemoveCell } from './remove-cell';

export const CELL_INPUT =
  'h-8 w-full rounded-xs border bg-paper-raised px-2 text-[13px] focus:border-accent focus:outline-none disabled:bg-transparent disabled:border-transparent disabled:appearance-none';
const border = (error?: string) => (error ? 'border-danger' : 'border-paper-line');
export const TH = 'px-2 pt-2 pb-1.5 align-bottom text-left text-[12px] leading-4 font-semibold text-ink-soft whitespace-nowrap';
export const TH_RIGHT = `${TH} text-right`;

/** Every support as a row: the joint, pin or roller, and the roller's reaction-line angle. */
export function SupportsTable({ form, joints, mayEdit }: { form: DraftForm; joints: readonly Joint[]; mayEdit: boolean }) {
  const { fields, append, remove } = useFieldArray({ control: form.control, name: 'supports' });
  const supports = useWatch({ control: form.control, name: 'supports' }) ?? [];
  const errors = form.formState.errors.supports;
  const free = joints.find((j) => !supports.some((s) => s.joint === j.id));

  return (
    <div>
      <table className="w-full border-collapse border-b border-ink-soft text-[13px]">
        <thead>
          <tr className="border-y border-ink-soft">
            <th className={TH}>Joint</th>
            <th className={TH}>Support</th>
            <th className={TH_RIGHT}>Roller pushes at, ° from horizontal</th>
            <th className={TH}>
              <span className="sr-only">Remove</span>
            </th>
          </tr>
        </thead>
        <tbody>
          {fields.length === 0 && (
            <tr>
              <td colSpan={4} className="px-2 py-4 text-center text-sm text-ink-soft">
                No supports yet. Click a joint on the drawing, or add a row.
              </td>
            </tr>
          )}
          {fields.map((field, i) => {
            const kind = supports[i]?.kind;
            const rowErrors = errors?.[i] as { joint?: { message?: string }; angleDeg?: { message?: string } } | undefined;
            const jointError = fieldErrorText(rowErrors?.joint?.message);
            const angleError = fieldErrorText(rowErrors?.angleDeg?.message);
            return (
              <tr key={field.id} className="border-b border-paper-line/70 align-top">
                <td className="px-2 py-1">
                  <select aria-label={`Support ${i + 1}: joint`} className={`${CELL_INPUT} ${border(jointError)}`} {...form.register(`supports.${i}.joint`)}>
                    {joints.map((j) => (
                      <option key={j.id} value={j.id}>
                        {j.tag} ({j.x.toFixed(2)}, {j.y.toFixed(2)})
                      </option>
                    ))}
                  </select>
                  {jointError && <p className="mt-0.5 text-xs text-danger">{jointError}</p>}
                </td>
                <td className="px-2 py-1">
                  <select
                    aria-label={`Support ${i + 1}: kind`}
                    className={`${CELL_INPUT} ${border()}`}
                    {...form.register(`supports.${i}.kind`, {
                      onChange: (e) => {
                        if (e.target.value === 'roller' && form.getValues(`supports.${i}.angleDeg` as never) === undefined) {
                          form.setValue(`supports.${i}.angleDeg` as never, 90 as never);
                        }
                      },
                    })}
                  >
                    <option value="pin">Pin</option>
                    <option value="roller">Roller</option>
                  </select>
                </td>
                <td className="px-2 py-1 text-right">
                  {kind === 'roller' ? (
                    <>
                      <input
                        type="number"
                        step="any"
                        aria-label={`Support ${i + 1}: angle of the reaction line, degrees`}
                        className={`${CELL_INPUT} ${border(angleError)} w-28 text-right`}
                        {...form.register(`supports.${i}.angleDeg` as never, { valueAsNumber: true })}
                      />
                      {angleError && <p className="mt-0.5 text-xs text-danger">{angleError}</p>}
                    </>
                  ) : (
                    <span className="inline-block py-1.5 text-ink-faint">both directions</span>
                  )}
                </td>
                <RemoveCell show={mayEdit} onRemove={() => remove(i)} />
              </tr>
            );
          })}
        </tbody>
      </table>
      {mayEdit && free && (
        <Button size="sm" className="mt-2" onClick={() => append({ joint: free.id, kind: 'pin' })}>
          Add support
        </Button>
      )}
    </div>
  );
}
