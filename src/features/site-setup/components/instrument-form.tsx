import { zodResolver } from '@hookform/resolvers/zod';
import { useForm, useWatch } from 'react-hook-form';
import type { z } from 'zod';
import { InstrumentCreateSchema, type Instrument } from '@shared/schemas/instrument';
import { INSTRUMENT_KINDS } from '@shared/schemas/vocabulary';
import { Button } from '@/components/button';
import { Field } from '@/components/field';
import { useSaveInstrument } from '../data/save-instrument';
import { emptyToNull, reportFormError, toNumberOrNull } from './form-errors';
import { INSTRUMENT_KIND_LABELS } from './labels';
import { SelectField } from '@/components/select-field';

const FIELDS = ['kind', 'model', 'serial', 'probe', 'calibratedOn', 'calibrationDueOn', 'calibrationCertificate', 'relativeUncertainty', 'notes'] as const;

export function InstrumentForm({ organisationId, instrument, onDone }: { organisationId: string; instrument?: Instrument; onDone: () => void }) {
  const save = useSaveInstrument(organisationId);
  const {
    register,
    handleSubmit,
    setError,
    control,
    formState: { errors },
  } = useForm<z.input<typeof InstrumentCreateSchema>, unknown, z.output<typeof InstrumentCreateSchema>>({
    resolver: zodResolver(InstrumentCreateSchema),
    defaultValues: {
      kind: instrument?.kind ?? 'gaussmeter',
      model: instrument?.model ?? '',
      serial: instrument?.serial ?? '',
      probe: instrument?.probe ?? null,
      calibratedOn: instrument?.calibratedOn ?? null,
      calibrationDueOn: instrument?.calibrationDueOn ?? null,
      calibrationCertificate: instrument?.calibrationCertificate ?? null,
      relativeUncertainty: instrument?.relativeUncertainty ?? null,
      notes: instrument?.notes ?? null,
    },
  });
  const kind = useWatch({ control, name: 'kind' });
  return (
    <form
      noValidate
      aria-label={instrument ? `Edit ${instrument.model} ${instrument.serial}` : 'Add an instrument'}
      className="grid grid-cols-1 gap-4 sm:grid-cols-2"
      onSubmit={handleSubmit((values) => {
        // Editing cannot change the kind (the API's update schema has none).
        const body = instrument ? { ...values, kind: instrument.kind } : values;
        save.mutate({ instrumentId: instrument?.id, body }, { onSuccess: onDone, onError: (error) => reportFormError(error, setError, FIELDS) });
      })}
    >
      <SelectField
        label="Kind"
        disabled={Boolean(instrument)}
        options={INSTRUMENT_KINDS.map((k) => ({ value: k, label: INSTRUMENT_KIND_LABELS[k] }))}
        error={errors.kind?.message}
        {...register('kind')}
      />
      <Field label="Make and model" error={errors.model?.message} {...register('model')} />
      <Field label="Serial number" autoComplete="off" error={errors.serial?.message} {...register('serial')} />
      {kind === 'gaussmeter' && <Field label="Probe (optional)" placeholder="3-axis Hall" error={errors.probe?.message} {...register('probe', { setValueAs: emptyToNull })} />}
      <Field label="Calibrated on (optional)" type="date" error={errors.calibratedOn?.message} {...register('calibratedOn', { setValueAs: emptyToNull })} />
      <Field label="Calibration due on (optional)" type="date" error={errors.calibrationDueOn?.message} {...register('calibrationDueOn', { setValueAs: emptyToNull })} />
      <Field
        label="Certificate number (optional)"
        error={errors.calibrationCertificate?.message}
        {...register('calibrationCertificate', { setValueAs: emptyToNull })}
      />
      {kind !== 'antenna' && (
        <Field
          label={kind === 'gaussmeter' ? 'Relative uncertainty' : 'Relative uncertainty (optional)'}
          hint="As a fraction: 0.02 for 2 %"
          inputMode="decimal"
          autoComplete="off"
          error={errors.relativeUncertainty?.message}
          {...register('relativeUncertainty', { setValueAs: toNumberOrNull })}
        />
      )}
      <Field label="Notes (optional)" className="sm:col-span-2" error={errors.notes?.message} {...register('notes', { setValueAs: emptyToNull })} />
      <div className="flex flex-wrap gap-3 sm:col-span-2">
        <Button type="submit" busy={save.isPending} busyLabel="Saving…">
          {instrument ? 'Save instrument' : 'Add instrument'}
        </Button>
        <Button variant="secondary" onClick={onDone}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
