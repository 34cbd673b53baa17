import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import { z } from 'zod';
import type { Level } from '@shared/schemas/site';
import { SourceCreateSchema, type Source } from '@shared/schemas/source';
import { MAGNET_SHIELDINGS, SOURCE_KINDS, SOURCE_STATES } from '@shared/schemas/vocabulary';
import { formatFluxDensity, fluxDensityTextSchema } from '@shared/units';
import { Button } from '@/components/button';
import { Field } from '@/components/field';
import { useSaveSource } from '../data/save-source';
import { emptyToNull, reportFormError } from './form-errors';
import { SelectField } from '@/components/select-field';
import { SHIELDING_LABELS, SOURCE_KIND_LABELS, SOURCE_STATE_LABELS } from './labels';

/** The shared schema, with the nominal field typed as text with its unit ("3 T", "30 kG"). */
const SourceFormSchema = SourceCreateSchema.extend({
  nominalFieldT: fluxDensityTextSchema.pipe(SourceCreateSchema.shape.nominalFieldT),
});

export function SourceForm({
  organisationId,
  siteId,
  levels,
  source,
  onDone,
}: {
  organisationId: string;
  siteId: string;
  levels: Level[];
  source?: Source;
  onDone: () => void;
}) {
  const save = useSaveSource(organisationId, siteId);
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm<z.input<typeof SourceFormSchema>, unknown, z.output<typeof SourceFormSchema>>({
    resolver: zodResolver(SourceFormSchema),
    defaultValues: {
      name: source?.name ?? '',
      kind: source?.kind ?? 'mri',
      state: source?.state ?? 'at_field',
      shielding: source?.shielding ?? 'unknown',
      nominalFieldT: source ? formatFluxDensity(source.nominalFieldT, { significantDigits: 6 }) : '',
      levelId: source?.levelId ?? levels[0]?.id ?? null,
      notes: source?.notes ?? '',
    },
  });
  return (
    <form
      noValidate
      aria-label={source ? `Edit ${source.name}` : 'Add a magnet'}
      className="grid grid-cols-1 gap-4 sm:grid-cols-2"
      onSubmit={handleSubmit((values) =>
        save.mutate(
          { sourceId: source?.id, body: values },
          { onSuccess: onDone, onError: (error) => reportFormError(error, setError, ['name', 'kind', 'state', 'shielding', 'nominalFieldT', 'levelId', 'notes']) },
        ),
      )}
    >
      <Field label="Magnet name" error={errors.name?.message} {...register('name')} />
      <SelectField label="Kind" options={SOURCE_KINDS.map((k) => ({ value: k, label: SOURCE_KIND_LABELS[k] }))} error={errors.kind?.message} {...register('kind')} />
      <Field
        label="Nominal field"
        hint="With its unit: 3 T, 400 mT, 30 kG"
        autoComplete="off"
        error={errors.nominalFieldT?.message}
        {...register('nominalFieldT')}
      />
      <SelectField label="State" options={SOURCE_STATES.map((k) => ({ value: k, label: SOURCE_STATE_LABELS[k] }))} error={errors.state?.message} {...register('state')} />
      <SelectField
        label="Shielding"
        options={MAGNET_SHIELDINGS.map((k) => ({ value: k, label: SHIELDING_LABELS[k] }))}
        error={errors.shielding?.message}
        {...register('shielding')}
      />
      <SelectField
        label="Level"
        hint="Place it on that level's plan afterwards"
        options={[{ value: '', label: 'Not on a plan yet' }, ...levels.map((l) => ({ value: l.id, label: l.name }))]}
        error={errors.levelId?.message}
        {...register('levelId', { setValueAs: emptyToNull })}
      />
      <Field label="Notes (optional)" className="sm:col-span-2" error={errors.notes?.message} {...register('notes', { setValueAs: emptyToNull })} />
      <div className="flex flex-wrap gap-3 sm:col-span-2">
        <Button type="submit" busy={save.isPending} busyLabel="Saving…">
          {source ? 'Save magnet' : 'Add magnet'}
        </Button>
        <Button variant="secondary" onClick={onDone}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
