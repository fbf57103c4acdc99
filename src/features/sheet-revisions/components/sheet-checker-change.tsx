import { useState } from 'react';
import type { SheetRevisionView } from '@shared/schemas/review.schema';
import { Button } from '@/components/ui/button';
import { FormError, SelectField } from '@/components/ui/field';
import { errorMessage } from '@/lib/api-client';
import { useCheckers } from '../api/get-checkers';
import { useReassignChecker } from '../api/transition-sheet';

/** For an admin, on a revision in check: hand it to another reviewer (the new checker gets the e-mail). */
export function SheetCheckerChange({ sheet }: { sheet: SheetRevisionView }) {
  const [open, setOpen] = useState(false);
  const [checkerId, setCheckerId] = useState('');
  const [error, setError] = useState<string>();
  const checkers = useCheckers(open);
  const reassign = useReassignChecker();
  const choices = (checkers.data ?? []).filter((c) => c.id !== sheet.preparedBy.id && c.id !== sheet.checker?.id);

  if (!open) {
    return (
      <p className="mb-4 text-sm text-ink-soft">
        Checker: <span className="font-medium text-ink">{sheet.checker?.name ?? 'any reviewer (sent before checkers were chosen)'}</span>{' '}
        <Button size="sm" variant="quiet" onClick={() => setOpen(true)}>
          Change the checker
        </Button>
      </p>
    );
  }
  const save = () => {
    if (!checkerId) {
      setError('Choose the reviewer who checks it instead.');
      return;
    }
    reassign.mutate({ sheetId: sheet.id, checkerId: Number(checkerId), note: '' }, { onSuccess: () => setOpen(false) });
  };
  return (
    <div className="mb-4 flex flex-wrap items-end gap-3">
      <SelectField
        label="New checker"
        value={checkerId}
        error={error ?? (checkers.isError ? errorMessage(checkers.error) : undefined)}
        onChange={(e) => {
          setCheckerId(e.target.value);
          setError(undefined);
        }}
      >
        <option value="">{checkers.isPending ? 'Loading the reviewers…' : 'Choose a reviewer'}</option>
        {choices.map((c) => (
          <option key={c.id} value={c.id}>
            {c.name} ({c.email})
          </option>
        ))}
      </SelectField>
      <Button size="sm" variant="primary" busy={reassign.isPending} onClick={save}>
        Hand it over
      </Button>
      <Button size="sm" variant="quiet" onClick={() => setOpen(false)} disabled={reassign.isPending}>
        Cancel
      </Button>
      <FormError message={reassign.isError ? errorMessage(reassign.error) : undefined} />
    </div>
  );
}
