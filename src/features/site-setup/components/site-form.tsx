import { zodResolver } from '@hookform/resolvers/zod';
import { useForm, type UseFormSetError } from 'react-hook-form';
import type { z } from 'zod';
import { SiteCreateSchema, type SiteCreate } from '@shared/schemas/site';
import { Button } from '@/components/button';
import { Field } from '@/components/field';
import { emptyToNull } from './form-errors';

export interface SiteFormProps {
  defaultValues?: { name: string; address: string | null; notes: string | null };
  submitLabel: string;
  busy: boolean;
  onSubmit: (values: SiteCreate, setError: UseFormSetError<z.input<typeof SiteCreateSchema>>) => void;
  onCancel?: () => void;
}

export function SiteForm({ defaultValues, submitLabel, busy, onSubmit, onCancel }: SiteFormProps) {
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm({
    resolver: zodResolver(SiteCreateSchema),
    defaultValues: { name: defaultValues?.name ?? '', address: defaultValues?.address ?? '', notes: defaultValues?.notes ?? '' },
  });
  return (
    <form noValidate onSubmit={handleSubmit((values) => onSubmit(values, setError))} className="flex flex-col gap-4" aria-label={submitLabel}>
      <Field label="Site name" autoComplete="off" error={errors.name?.message} {...register('name')} />
      <Field label="Address (optional)" autoComplete="street-address" error={errors.address?.message} {...register('address', { setValueAs: emptyToNull })} />
      <Field label="Notes (optional)" error={errors.notes?.message} {...register('notes', { setValueAs: emptyToNull })} />
      <div className="flex flex-wrap gap-3">
        <Button type="submit" busy={busy} busyLabel="Saving…">
          {submitLabel}
        </Button>
        {onCancel && (
          <Button variant="secondary" onClick={onCancel}>
            Cancel
          </Button>
        )}
      </div>
    </form>
  );
}
