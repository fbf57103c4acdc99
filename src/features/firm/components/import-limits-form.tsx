import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { IMPORT_LIMIT_BOUNDS, importLimitsSchema, type ImportLimits } from '@shared/schemas/import-limits.schema';
import { Button } from '@/components/ui/button';
import { FormError, TextField, MESSAGES_AFTER_TOUCH } from '@/components/ui/field';
import { ErrorState, LoadingState } from '@/components/ui/states';
import { applyApiError } from '@/lib/form-errors';
import { useImportLimits, useUpdateImportLimits } from '../api/import-limits';

const n = (v: number) => v.toLocaleString('en-US');

/**
 * The caps on reading an uploaded drawing. A drawing over a cap is refused with a sentence
 * that sends people here; an admin raises the cap when the firm's drawings are that large.
 */
export function ImportLimitsForm({ editable }: { editable: boolean }) {
  const limits = useImportLimits();
  const update = useUpdateImportLimits();
  const {
    register,
    handleSubmit,
    setError,
    reset,
    formState: { errors, isSubmitting, isDirty },
  } = useForm<ImportLimits>({ ...MESSAGES_AFTER_TOUCH, resolver: zodResolver(importLimitsSchema), values: limits.data });

  if (limits.isPending) return <LoadingState label="Loading the drawing limits…" />;
  if (limits.isError) return <ErrorState title="The drawing limits could not be loaded" error={limits.error} onRetry={() => void limits.refetch()} />;

  const onSubmit = handleSubmit(async (values) => {
    try {
      reset(await update.mutateAsync(values));
    } catch (error) {
      applyApiError(error, setError, ['maxSegments', 'maxBlockDepth', 'timeLimitSeconds']);
    }
  });
  const b = IMPORT_LIMIT_BOUNDS;
  return (
    <form onSubmit={onSubmit} noValidate className="flex max-w-xl flex-col gap-4" aria-label="Drawing limits">
      <p className="text-sm text-ink-soft">
        Blocks inserted inside blocks can make a small file describe millions of lines. An upload over these limits is refused with a
        sentence naming the limit, and nothing is stored. Defaults: {n(b.maxSegments.default)} segments, {b.maxBlockDepth.default} levels,{' '}
        {b.timeLimitSeconds.default} s.
      </p>
      <fieldset disabled={!editable || isSubmitting} className="flex flex-col gap-4">
        <TextField
          label="Most line segments"
          type="number"
          inputMode="numeric"
          hint={`Lines and polyline spans after the blocks are exploded, ${n(b.maxSegments.min)} to ${n(b.maxSegments.max)}.`}
          error={errors.maxSegments?.message}
          {...register('maxSegments', { valueAsNumber: true })}
        />
        <TextField
          label="Deepest block nesting"
          type="number"
          inputMode="numeric"
          hint={`Blocks inside blocks, ${b.maxBlockDepth.min} to ${b.maxBlockDepth.max} levels.`}
          error={errors.maxBlockDepth?.message}
          {...register('maxBlockDepth', { valueAsNumber: true })}
        />
        <TextField
          label="Time limit (seconds)"
          type="number"
          inputMode="numeric"
          hint={`Reading one drawing is stopped after this long, ${b.timeLimitSeconds.min} to ${b.timeLimitSeconds.max} s.`}
          error={errors.timeLimitSeconds?.message}
          {...register('timeLimitSeconds', { valueAsNumber: true })}
        />
      </fieldset>
      {limits.data.updatedAt && (
        <p className="text-xs text-ink-faint">
          Last changed by {limits.data.updatedBy || 'a former user'} on {new Date(limits.data.updatedAt).toLocaleString()}.
        </p>
      )}
      <FormError message={errors.root?.server?.message} />
      {editable && (
        <div className="flex gap-2">
          <Button type="submit" variant="primary" busy={isSubmitting} disabled={!isDirty}>
            Save drawing limits
          </Button>
          {isDirty && (
            <Button onClick={() => reset(limits.data)} disabled={isSubmitting}>
              Discard changes
            </Button>
          )}
        </div>
      )}
    </form>
  );
}
