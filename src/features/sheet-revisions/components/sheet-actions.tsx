import { useState, type ReactNode } from 'react';
import type { UserView } from '@shared/schemas/auth.schema';
import type { SheetAction, SheetRevisionView } from '@shared/schemas/review.schema';
import { Button } from '@/components/ui/button';
import { FormError, SelectField, TextareaField } from '@/components/ui/field';
import { errorMessage } from '@/lib/api-client';
import { useCheckers } from '../api/get-checkers';
import { useTransitionSheet } from '../api/transition-sheet';
import { SHEET_ACTION_LABELS, sheetActionsFor } from '../utils/sheet-actions';

const CONFIRM_TEXT: Record<SheetAction, string> = {
  submit: 'Choose who checks it: that reviewer gets an e-mail asking them to check this revision, and only they can return it or mark it checked. You can no longer change it while it is in check.',
  return: 'The preparer gets an e-mail with your note and the open comments. They revise the model and start a new revision.',
  check: 'You confirm the revision as checked; your name and today’s date go into its signature block.',
  issue: 'Panelpoint prints the final PDF with the signature block filled, stores it with its SHA-256 fingerprint and signs the record with the firm’s key. An issued revision can never change.',
};

/**
 * The buttons for the moves this person may make, each confirmed with an optional note for the
 * audit log; `children` (links such as the PDF) sit in the same row before them.
 */
export function SheetActions({ sheet, user, children }: { sheet: SheetRevisionView; user: Pick<UserView, 'id' | 'role'>; children?: ReactNode }) {
  const actions = sheetActionsFor(user, sheet);
  const [pending, setPending] = useState<SheetAction | null>(null);
  const [note, setNote] = useState('');
  const [noteError, setNoteError] = useState<string>();
  const [checkerId, setCheckerId] = useState('');
  const [checkerError, setCheckerError] = useState<string>();
  const transition = useTransitionSheet();
  const checkers = useCheckers(pending === 'submit');
  const openCount = sheet.openCommentIds.length;

  if (actions.length === 0) return <div className="flex flex-wrap justify-end gap-2">{children}</div>;

  const start = (action: SheetAction) => {
    transition.reset();
    setNoteError(undefined);
    setCheckerError(undefined);
    setPending(action);
  };
  const confirm = () => {
    if (!pending) return;
    if (pending === 'return' && !note.trim()) {
      setNoteError('Say why it goes back: the preparer reads this first.');
      return;
    }
    if (pending === 'submit' && !checkerId) {
      setCheckerError('Choose the checker: the reviewer who will check this revision.');
      return;
    }
    transition.mutate(
      { sheetId: sheet.id, action: pending, note: note.trim(), ...(pending === 'submit' ? { checkerId: Number(checkerId) } : {}) },
      {
        onSuccess: () => {
          setPending(null);
          setNote('');
          setCheckerId('');
        },
      },
    );
  };

  return (
    <div className="relative flex flex-col items-end gap-2">
      <div className="flex flex-wrap justify-end gap-2">
        {children}
        {actions.map((action) => (
          <Button
            key={action}
            variant={action === 'return' ? 'danger' : 'primary'}
            onClick={() => start(action)}
            disabled={action === 'check' && openCount > 0}
            title={action === 'check' && openCount > 0 ? `Resolve the ${openCount} open comment thread(s) first, or return it.` : undefined}
            aria-pressed={pending === action}
          >
            {SHEET_ACTION_LABELS[action]}
          </Button>
        ))}
      </div>
      {actions.includes('check') && openCount > 0 && (
        <p className="text-xs text-ink-soft">
          {openCount} comment thread{openCount === 1 ? ' is' : 's are'} still open: resolve {openCount === 1 ? 'it' : 'them'} before marking it checked, or return it.
        </p>
      )}
      {pending && (
        <div className="absolute top-11 right-0 z-20 w-[26rem] max-w-[90vw] rounded-xs border border-paper-line bg-paper-raised p-4 text-left outline outline-1 outline-ink-soft">
          <p className="mb-3 text-sm text-ink-soft">{CONFIRM_TEXT[pending]}</p>
          {pending === 'submit' && (
            <div className="mb-3">
              <SelectField
                label="Checker"
                value={checkerId}
                error={checkerError ?? (checkers.isError ? errorMessage(checkers.error) : undefined)}
                hint={checkers.data && checkers.data.length === 0 ? 'The firm has no active reviewer yet: ask your admin to invite one.' : undefined}
                onChange={(e) => {
                  setCheckerId(e.target.value);
                  setCheckerError(undefined);
                }}
              >
                <option value="">{checkers.isPending ? 'Loading the reviewers…' : 'Choose a reviewer'}</option>
                {checkers.data?.map((c) => (
                  <option key={c.id} value={c.id}>
                    {c.name} ({c.email})
                  </option>
                ))}
              </SelectField>
            </div>
          )}
          <TextareaField
            label={pending === 'return' ? 'Why it goes back' : 'Note for the audit log (optional)'}
            rows={3}
            value={note}
            maxLength={2000}
            error={noteError}
            onChange={(e) => setNote(e.target.value)}
          />
          <div className="mt-3 flex flex-col gap-3">
            <FormError message={transition.isError ? errorMessage(transition.error) : undefined} />
            {transition.isPending && pending === 'issue' && (
              <p role="status" className="text-xs text-ink-soft">
                Printing the PDF and signing the record; this can take several seconds.
              </p>
            )}
            <div className="flex justify-end gap-2">
              <Button variant="quiet" onClick={() => setPending(null)} disabled={transition.isPending}>
                Cancel
              </Button>
              <Button variant={pending === 'return' ? 'danger' : 'primary'} busy={transition.isPending} onClick={confirm}>
                {SHEET_ACTION_LABELS[pending]}
              </Button>
            </div>
          </div>
        </div>
      )}
    </div>
  );
}
