import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { trussInputSchema, type TrussInput, type TrussView } from '@shared/schemas/project.schema';
import { Button } from '@/components/ui/button';
import { FormError, TextField, MESSAGES_AFTER_TOUCH } from '@/components/ui/field';
import { applyApiError } from '@/lib/form-errors';
import { useCreateTruss } from '../api/create-truss';

interface AddTrussFormProps {
  projectId: number;
  onAdded: (truss: TrussView) => void;
  onCancel: () => void;
}

export function AddTrussForm({ projectId, onAdded, onCancel }: AddTrussFormProps) {
  const create = useCreateTruss();
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<TrussInput>({ ...MESSAGES_AFTER_TOUCH, resolver: zodResolver(trussInputSchema), defaultValues: { name: '' } });

  const onSubmit = handleSubmit(async (input) => {
    try {
      onAdded(await create.mutateAsync({ projectId, input }));
    } catch (error) {
      applyApiError(error, setError, ['name']);
    }
  });

  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-3">
      <div className="flex flex-wrap items-start gap-2">
        <fieldset disabled={isSubmitting} className="min-w-64 flex-1">
          <TextField label="Truss name" autoFocus autoComplete="off" placeholder="e.g. T1 – typical interior truss" error={errors.name?.message} {...register('name')} />
        </fieldset>
        <div className="flex gap-2 pt-5">
          <Button type="submit" variant="primary" busy={isSubmitting}>
            Add truss
          </Button>
          <Button onClick={onCancel} disabled={isSubmitting}>
            Cancel
          </Button>
        </div>
      </div>
      <FormError message={errors.root?.server?.message} />
    </form>
  );
}
