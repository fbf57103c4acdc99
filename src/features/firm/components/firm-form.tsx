import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { firmSettingsSchema, type FirmSettings } from '@shared/schemas/project.schema';
import { Button } from '@/components/ui/button';
import { FormError, TextField, TextareaField, MESSAGES_AFTER_TOUCH } from '@/components/ui/field';
import { applyApiError } from '@/lib/form-errors';
import { useUpdateFirm } from '../api/update-firm';

type FirmFormInput = z.input<typeof firmSettingsSchema>;

const PAPER_SIZES = [
  { value: 'A4', label: 'A4', detail: '210 × 297 mm' },
  { value: 'Letter', label: 'Letter', detail: '8.5 × 11 in' },
] as const;

/** The firm's title-block details, printed on every calc sheet. */
export function FirmForm({ firm, editable }: { firm: FirmSettings; editable: boolean }) {
  const update = useUpdateFirm();
  const {
    register,
    handleSubmit,
    setError,
    reset,
    formState: { errors, isSubmitting, isDirty },
  } = useForm<FirmFormInput, unknown, FirmSettings>({ ...MESSAGES_AFTER_TOUCH, resolver: zodResolver(firmSettingsSchema), values: firm });

  const onSubmit = handleSubmit(async (values) => {
    try {
      reset(await update.mutateAsync(values));
    } catch (error) {
      applyApiError(error, setError, ['name', 'address', 'paperSize']);
    }
  });

  return (
    <form onSubmit={onSubmit} noValidate className="flex max-w-xl flex-col gap-4">
      <fieldset disabled={!editable || isSubmitting} className="flex flex-col gap-4">
        <TextField label="Firm name" autoComplete="organization" error={errors.name?.message} {...register('name')} />
        <TextareaField label="Address" rows={3} error={errors.address?.message} hint="As it should read in the title block." {...register('address')} />
        <div className="flex flex-col gap-1">
          <span className="text-xs font-semibold text-ink-soft">Paper size</span>
          <div role="radiogroup" aria-label="Paper size" className="flex gap-2">
            {PAPER_SIZES.map((size) => (
              <label
                key={size.value}
                className="flex cursor-pointer items-center gap-2 rounded-xs border border-paper-line bg-paper-raised px-3 py-2 text-sm has-checked:border-accent has-checked:bg-accent-soft/50"
              >
                <input type="radio" value={size.value} className="accent-accent" {...register('paperSize')} />
                <span className="font-medium">{size.label}</span>
                <span className="figures text-xs text-ink-faint">{size.detail}</span>
              </label>
            ))}
          </div>
          {errors.paperSize?.message && <p className="text-xs text-danger">{errors.paperSize.message}</p>}
        </div>
      </fieldset>
      <FormError message={errors.root?.server?.message} />
      {editable && (
        <div className="flex gap-2">
          <Button type="submit" variant="primary" busy={isSubmitting} disabled={!isDirty}>
            Save firm details
          </Button>
          {isDirty && (
            <Button onClick={() => reset(firm)} disabled={isSubmitting}>
              Discard changes
            </Button>
          )}
        </div>
      )}
    </form>
  );
}
