import { zodResolver } from '@hookform/resolvers/zod';
import { memo, useEffect, useMemo, useRef, useState } from 'react';
import { useForm, useWatch, type Resolver } from 'react-hook-form';
import type { InstrumentRow, WatchBandRow } from '@/db';
import { Alert } from '@/components/alert';
import { Field } from '@/components/field';
import { formatFluxDensity } from '@shared/units';
import { PROBE_ORIENTATIONS } from '@shared/schemas/vocabulary';
import { isCalibrationOverdue } from '../lib/calibration';
import { computeFieldFeedback, type FeedbackSettings } from '../lib/feedback';
import {
  PICKER_FIELD_UNITS,
  PROBE_ORIENTATION_LABELS,
  ReadingFormSchema,
  isImplausibleField,
  implausibleMessage,
  liveFieldTesla,
  type ParsedReading,
  type ReadingFormValues,
} from '../lib/reading-form';
import { FeedbackPanel } from './feedback-panel';
import { CheckboxField, FormActions, SelectField } from './form-controls';

export interface ReadingFormProps {
  /** Gaussmeters to choose from. */
  instruments: readonly InstrumentRow[];
  initialValues: ReadingFormValues;
  /** When the reading was (or is being) taken: the calibration check uses this date. */
  measuredAt: Date;
  feedbackSettings: FeedbackSettings;
  watchBands: readonly WatchBandRow[];
  editing: boolean;
  /** False until a station is picked or placed; the form stays fillable, Save explains. */
  stationReady: boolean;
  onValuesChange: (values: ReadingFormValues) => void;
  onUnitChange: (unit: ReadingFormValues['unit']) => void;
  /** Resolves when stored; rejects with a message (or field messages) when not. */
  onSubmit: (reading: ParsedReading, photo: File | null) => Promise<void>;
  onCancel?: () => void;
}

/** Record field (shared schema path) → form box, for errors the store reports after the form passed. */
const RECORD_TO_FORM: Record<string, keyof ReadingFormValues> = {
  magnitudeT: 'magnitude',
  bxT: 'bx',
  byT: 'by',
  bzT: 'bz',
  heightM: 'height',
  backgroundT: 'background',
  notes: 'notes',
  unit: 'unit',
  probeOrientation: 'probeOrientation',
  instrumentId: 'instrumentId',
};

export class FormSubmitError extends Error {
  constructor(
    message: string,
    readonly fieldErrors: Record<string, string> = {},
  ) {
    super(message);
  }
}

export const ReadingForm = memo(function ReadingForm(props: ReadingFormProps) {
  const { instruments, initialValues, measuredAt, feedbackSettings, watchBands, editing, stationReady } = props;
  const form = useForm<ReadingFormValues, unknown, ParsedReading>({
    defaultValues: initialValues,
    resolver: zodResolver(ReadingFormSchema) as unknown as Resolver<ReadingFormValues, unknown, ParsedReading>,
    mode: 'onTouched',
  });
  const { register, handleSubmit, formState, setError, control, reset } = form;
  const values = useWatch({ control }) as ReadingFormValues;
  const [photo, setPhoto] = useState<File | null>(null);
  const [submitError, setSubmitError] = useState<string | null>(null);
  const onValuesChange = useRef(props.onValuesChange);
  onValuesChange.current = props.onValuesChange;

  useEffect(() => {
    onValuesChange.current(values);
  }, [values]);

  const fieldT = liveFieldTesla(values);
  const instrument = instruments.find((i) => i.id === values.instrumentId) ?? null;
  const feedback = useMemo(
    () => (fieldT === null ? null : computeFieldFeedback(fieldT, instrument?.relativeUncertainty ?? null, feedbackSettings)),
    [fieldT, instrument?.relativeUncertainty, feedbackSettings],
  );
  const overdue = instrument ? isCalibrationOverdue(instrument.calibrationDueOn, measuredAt) : false;
  const implausible = fieldT !== null && isImplausibleField(fieldT);
  const errors = formState.errors;

  const submit = handleSubmit(async (reading) => {
    setSubmitError(null);
    if (!stationReady) {
      setSubmitError('Tap the plan to place a station, or tap an existing station, before saving.');
      return;
    }
    try {
      await props.onSubmit(reading, photo);
      reset({ ...initialValues, unit: values.unit, instrumentId: values.instrumentId, probeOrientation: values.probeOrientation, height: values.height, magnitude: '', bx: '', by: '', bz: '', notes: '', background: '', confirmImplausible: false });
      setPhoto(null);
    } catch (error) {
      const fieldErrors = error instanceof FormSubmitError ? error.fieldErrors : {};
      for (const [path, message] of Object.entries(fieldErrors)) {
        const box = RECORD_TO_FORM[path.split('.')[0] ?? ''];
        if (box) setError(box, { message });
      }
      setSubmitError(error instanceof Error ? error.message : 'Could not save the reading.');
    }
  });

  const unitSelect = register('unit', { onChange: (e) => props.onUnitChange(e.target.value) });

  return (
    <form onSubmit={submit} noValidate className="flex flex-col gap-4" aria-label={editing ? 'Edit field reading' : 'New field reading'}>
      <fieldset className="flex flex-col gap-3">
        <legend className="mb-2 text-lg font-bold">Field</legend>
        <div className="grid grid-cols-2 gap-2" role="radiogroup" aria-label="How the field was read">
          {(['magnitude', 'components'] as const).map((mode) => (
            <label
              key={mode}
              className={`flex min-h-touch cursor-pointer items-center justify-center rounded-lg border-2 px-2 text-center font-bold ${values.mode === mode ? 'border-accent bg-accent-soft text-accent-soft-fg' : 'border-field-border bg-surface'}`}
            >
              <input type="radio" value={mode} className="sr-only" {...register('mode')} />
              {mode === 'magnitude' ? '|B| only' : 'Bx, By, Bz'}
            </label>
          ))}
        </div>
        <div className="grid grid-cols-[minmax(0,1fr)_auto] items-start gap-2">
          {values.mode === 'magnitude' ? (
            <Field className="min-w-0" label="|B|" inputMode="decimal" autoComplete="off" placeholder="e.g. 0.52" error={errors.magnitude?.message} {...register('magnitude')} />
          ) : (
            <div className="grid grid-cols-3 gap-2">
              <Field className="min-w-0" label="Bx" inputMode="text" autoComplete="off" error={errors.bx?.message} {...register('bx')} />
              <Field className="min-w-0" label="By" inputMode="text" autoComplete="off" error={errors.by?.message} {...register('by')} />
              <Field className="min-w-0" label="Bz" inputMode="text" autoComplete="off" error={errors.bz?.message} {...register('bz')} />
            </div>
          )}
          <SelectField label="Unit" error={errors.unit?.message} defaultValue={initialValues.unit} {...unitSelect}>
            {PICKER_FIELD_UNITS.map((u) => (
              <option key={u} value={u}>
                {u}
              </option>
            ))}
          </SelectField>
        </div>
        {values.mode === 'components' && fieldT !== null && (
          <p className="font-bold" data-testid="derived-magnitude">
            |B| = {formatFluxDensity(fieldT, { unit: values.unit })} (from the three components)
          </p>
        )}
        {implausible && (
          <div className="rounded-lg border-l-8 border-warning bg-warning-soft px-3 py-2" role="status">
            <p className="text-fg">{implausibleMessage(fieldT as number, values.unit)}</p>
            <CheckboxField label="Yes, this value is right" error={errors.confirmImplausible?.message ? 'Confirm the value, or correct it, to save.' : undefined} {...register('confirmImplausible')} />
          </div>
        )}
      </fieldset>

      <FeedbackPanel feedback={feedback} unit={values.unit} watchBands={watchBands} />

      <fieldset className="flex flex-col gap-3">
        <legend className="mb-2 text-lg font-bold">Instrument and probe</legend>
        <SelectField
          label="Gaussmeter"
          error={errors.instrumentId?.message}
          defaultValue={initialValues.instrumentId}
          {...register('instrumentId')}
          hint={
            overdue && instrument ? (
              <Alert tone="warning" title="Calibration overdue" className="mt-1">
                {instrument.model} ({instrument.serial}) fell due for calibration on {instrument.calibrationDueOn}, before this reading's date. The reading still saves and is marked with this
                instrument; arrange recalibration.
              </Alert>
            ) : undefined
          }
        >
          <option value="">— not recorded —</option>
          {instruments.map((i) => (
            <option key={i.id} value={i.id}>
              {i.model} · {i.serial}
              {isCalibrationOverdue(i.calibrationDueOn, measuredAt) ? ' (calibration overdue)' : ''}
            </option>
          ))}
        </SelectField>
        <SelectField label="Probe orientation" error={errors.probeOrientation?.message} defaultValue={initialValues.probeOrientation} {...register('probeOrientation')}>
          {PROBE_ORIENTATIONS.map((o) => (
            <option key={o} value={o}>
              {PROBE_ORIENTATION_LABELS[o]}
            </option>
          ))}
        </SelectField>
        <Field label="Probe height above the floor (m)" inputMode="decimal" autoComplete="off" error={errors.height?.message} {...register('height')} />
        <Field label={`Background noted (${values.unit}, optional)`} inputMode="decimal" autoComplete="off" error={errors.background?.message} {...register('background')} />
        <CheckboxField label="Meter zeroed before this reading" {...register('zeroed')} />
      </fieldset>

      <div className="flex flex-col gap-1">
        <label htmlFor="reading-notes" className="font-bold">
          Notes
        </label>
        <textarea id="reading-notes" rows={2} className="rounded-lg border-2 border-field-border bg-surface px-3 py-2 text-lg text-fg" {...register('notes')} />
        {errors.notes && <p className="text-sm font-bold text-danger">{errors.notes.message}</p>}
      </div>

      <div className="flex flex-col gap-1">
        <label htmlFor="reading-photo" className="font-bold">
          Photo (optional)
        </label>
        <input
          id="reading-photo"
          type="file"
          accept="image/*"
          capture="environment"
          className="min-h-touch rounded-lg border-2 border-field-border bg-surface p-2 text-fg file:mr-3 file:min-h-10 file:rounded file:border-0 file:bg-accent file:px-3 file:font-bold file:text-accent-fg"
          onChange={(e) => setPhoto(e.target.files?.[0] ?? null)}
        />
        {photo && <p className="text-sm text-fg-muted">{photo.name}: resized on this device before it is stored.</p>}
      </div>

      <FormActions
        submitError={submitError}
        busy={formState.isSubmitting}
        submitLabel={editing ? 'Save changes' : 'Save reading'}
        onCancel={props.onCancel}
      />
    </form>
  );
});
