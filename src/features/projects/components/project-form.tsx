import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import { projectInputSchema, unitSystemSchema, type ProjectInput, type ProjectView } from '@shared/schemas/project.schema';
import { Button } from '@/components/ui/button';
import { FormError, SelectField, TextField, TextareaField, MESSAGES_AFTER_TOUCH } from '@/components/ui/field';
import { applyApiError } from '@/lib/form-errors';
import { UNIT_SYSTEM_LABELS } from '@/lib/format';
import { useCreateProject } from '../api/create-project';
import { useUpdateProject } from '../api/update-project';

type ProjectValues = z.output<typeof projectInputSchema>;

const FIELDS = ['name', 'jobNumber', 'client', 'site', 'designBasis', 'unitSystem'] as const;

const EMPTY: ProjectInput = { name: '', jobNumber: '', client: '', site: '', designBasis: '', unitSystem: 'SI' };

interface ProjectFormProps {
  initial: ProjectInput;
  submitLabel: string;
  onSave: (values: ProjectValues) => Promise<unknown>;
  onCancel?: () => void;
}

function ProjectForm({ initial, submitLabel, onSave, onCancel }: ProjectFormProps) {
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<ProjectInput, unknown, ProjectValues>({ ...MESSAGES_AFTER_TOUCH, resolver: zodResolver(projectInputSchema), defaultValues: initial });

  const onSubmit = handleSubmit(async (values) => {
    try {
      await onSave(values);
    } catch (error) {
      applyApiError(error, setError, FIELDS);
    }
  });

  return (
    <form onSubmit={onSubmit} noValidate className="@container flex flex-col gap-4">
      <fieldset disabled={isSubmitting} className="grid grid-cols-1 gap-4 @xl:grid-cols-[10rem_1fr]">
        <TextField label="Job number" autoComplete="off" placeholder="e.g. 24-031" error={errors.jobNumber?.message} {...register('jobNumber')} />
        <TextField label="Project name" autoComplete="off" placeholder="e.g. Riverside depot roof" error={errors.name?.message} {...register('name')} />
        <div className="grid grid-cols-1 gap-4 @xl:col-span-2 @xl:grid-cols-2">
          <TextField label="Client" autoComplete="off" error={errors.client?.message} {...register('client')} />
          <TextField label="Site" autoComplete="off" error={errors.site?.message} {...register('site')} />
        </div>
        <div className="@xl:col-span-2">
          <TextareaField
            label="Design basis"
            rows={3}
            placeholder="Codes, load sources and assumptions the calc sheets state, e.g. loads to ASCE/SEI 7-16; timber to NDS 2018."
            error={errors.designBasis?.message}
            {...register('designBasis')}
          />
        </div>
        <div className="@xl:col-span-2 @xl:max-w-xs">
          <SelectField label="Units" error={errors.unitSystem?.message} hint="Shown on every sheet of the project." {...register('unitSystem')}>
            {unitSystemSchema.options.map((system) => (
              <option key={system} value={system}>
                {UNIT_SYSTEM_LABELS[system]}
              </option>
            ))}
          </SelectField>
        </div>
      </fieldset>
      <FormError message={errors.root?.server?.message} />
      <div className="flex gap-2">
        <Button type="submit" variant="primary" busy={isSubmitting}>
          {submitLabel}
        </Button>
        {onCancel && (
          <Button onClick={onCancel} disabled={isSubmitting}>
            Cancel
          </Button>
        )}
      </div>
    </form>
  );
}

export function CreateProjectForm({ onCreated, onCancel }: { onCreated: (project: ProjectView) => void; onCancel?: () => void }) {
  const create = useCreateProject();
  return (
    <ProjectForm
      initial={EMPTY}
      submitLabel="Create project"
      onCancel={onCancel}
      onSave={async (values) => onCreated(await create.mutateAsync(values))}
    />
  );
}

export function EditProjectForm({ project, onSaved, onCancel }: { project: ProjectView; onSaved: () => void; onCancel: () => void }) {
  const update = useUpdateProject({ errorsShownInline: true });
  const initial: ProjectInput = {
    name: project.name,
    jobNumber: project.jobNumber,
    client: project.client,
    site: project.site,
    designBasis: project.designBasis,
    unitSystem: project.unitSystem,
  };
  return (
    <ProjectForm
      initial={initial}
      submitLabel="Save changes"
      onCancel={onCancel}
      onSave={async (values) => {
        await update.mutateAsync({ projectId: project.id, changes: values });
        onSaved();
      }}
    />
  );
}
