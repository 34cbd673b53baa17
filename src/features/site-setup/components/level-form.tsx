import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import { LevelCreateSchema } from '@shared/schemas/site';
import { Button } from '@/components/button';
import { Field } from '@/components/field';
import { useCreateLevel } from '../data/create-level';
import { reportFormError } from './form-errors';

/** Add a level to a site: its name, its order in lists (bottom floor first) and floor height. */
export function LevelForm({ organisationId, siteId, nextOrdinal }: { organisationId: string; siteId: string; nextOrdinal: number }) {
  const createLevel = useCreateLevel(organisationId, siteId);
  const {
    register,
    handleSubmit,
    setError,
    reset,
    formState: { errors },
  } = useForm({ resolver: zodResolver(LevelCreateSchema), defaultValues: { name: '', ordinal: nextOrdinal, elevationM: 0 } });
  return (
    <form
      noValidate
      aria-label="Add a level"
      className="grid grid-cols-1 gap-4 sm:grid-cols-[2fr_1fr_1fr_auto] sm:items-end"
      onSubmit={handleSubmit((values) =>
        createLevel.mutate(values, {
          onSuccess: () => reset({ name: '', ordinal: values.ordinal + 1, elevationM: 0 }),
          onError: (error) => reportFormError(error, setError, ['name', 'ordinal', 'elevationM']),
        }),
      )}
    >
      <Field label="Level name" placeholder="Ground floor" error={errors.name?.message} {...register('name')} />
      <Field label="Order" type="number" inputMode="numeric" error={errors.ordinal?.message} {...register('ordinal', { valueAsNumber: true })} />
      <Field
        label="Floor height (m)"
        type="number"
        step="any"
        inputMode="decimal"
        error={errors.elevationM?.message}
        {...register('elevationM', { valueAsNumber: true })}
      />
      <Button type="submit" busy={createLevel.isPending} busyLabel="Adding…">
        Add level
      </Button>
    </form>
  );
}
