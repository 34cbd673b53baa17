import { zodResolver } from '@hookform/resolvers/zod';
import { memo, useEffect, useRef, useState } from 'react';
import { useFieldArray, useForm, useWatch, type Resolver } from 'react-hook-form';
import type { InstrumentRow } from '@/db';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { Field } from '@/components/field';
import { formatFrequency } from '@shared/units';
import { DETECTORS } from '@shared/schemas/vocabulary';
import { isCalibrationOverdue } from '../lib/calibration';
import { checkTraceCsv, DETECTOR_LABELS, FREQUENCY_UNITS, SweepFormSchema, type ParsedSweep, type SweepFormValues, type TraceCheck } from '../lib/sweep-form';
import { FormActions, SelectField } from './form-controls';
import { FormSubmitError } from './reading-form';


export interface SweepFormProps {
  analysers: readonly InstrumentRow[];
  antennas: readonly InstrumentRow[];
  initialValues: SweepFormValues;
  measuredAt: Date;
  editing: boolean;
  stationReady: boolean;
  onValuesChange: (values: SweepFormValues) => void;
  onSubmit: (sweep: ParsedSweep, trace: File | null) => Promise<void>;
  onCancel?: () => void;
}

const RECORD_TO_FORM: Record<string, string> = {
  startHz: 'start',
  stopHz: 'stop',
  rbwHz: 'rbw',
  referenceLevelDbm: 'referenceLevel',
  detector: 'detector',
  notes: 'notes',
};

function UnitSelect({ label, ...rest }: { label: string } & React.SelectHTMLAttributes<HTMLSelectElement>) {
  return (
    <SelectField label={label} {...rest}>
      {FREQUENCY_UNITS.map((u) => (
        <option key={u} value={u}>
          {u}
        </option>
      ))}
    </SelectField>
  );
}

export const SweepForm = memo(function SweepForm(props: SweepFormProps) {
  const { analysers, antennas, initialValues, measuredAt, editing, stationReady } = props;
  const form = useForm<SweepFormValues, unknown, ParsedSweep>({
    defaultValues: initialValues,
    resolver: zodResolver(SweepFormSchema) as unknown as Resolver<SweepFormValues, unknown, ParsedSweep>,
    mode: 'onTouched',
  });
  const { register, handleSubmit, formState, control, setError, reset } = form;
  const peaks = useFieldArray({ control, name: 'peaks' });
  const values = useWatch({ control }) as SweepFormValues;
  const [trace, setTrace] = useState<{ file: File; check: TraceCheck } | null>(null);
  const [submitError, setSubmitError] = useState<string | null>(null);
  const onValuesChange = useRef(props.onValuesChange);
  onValuesChange.current = props.onValuesChange;
  useEffect(() => {
    onValuesChange.current(values);
  }, [values]);
  const errors = formState.errors;
  const analyser = analysers.find((a) => a.id === values.analyserId) ?? null;
  const antenna = antennas.find((a) => a.id === values.antennaId) ?? null;
  const overdue = [analyser, antenna].filter((i): i is InstrumentRow => i !== null && isCalibrationOverdue(i.calibrationDueOn, measuredAt));

  const submit = handleSubmit(async (sweep) => {
    setSubmitError(null);
    if (!stationReady) {
      setSubmitError('Tap the plan to place a station, or tap an existing station, before saving.');
      return;
    }
    if (trace && !trace.check.ok) {
      setSubmitError(`The trace file cannot be kept: ${trace.check.message} Remove it or choose another.`);
      return;
    }
    try {
      await props.onSubmit(sweep, trace?.file ?? null);
      reset({ ...initialValues, analyserId: values.analyserId, antennaId: values.antennaId, startUnit: values.startUnit, stopUnit: values.stopUnit, rbwUnit: values.rbwUnit, detector: values.detector });
      setTrace(null);
    } catch (error) {
      const fieldErrors = error instanceof FormSubmitError ? error.fieldErrors : {};
      for (const [path, message] of Object.entries(fieldErrors)) {
        const box = RECORD_TO_FORM[path.split('.')[0] ?? ''];
        if (box) setError(box as keyof SweepFormValues, { message });
      }
      setSubmitError(error instanceof Error ? error.message : 'Could not save the sweep.');
    }
  });

  const onTraceChosen = async (file: File | undefined) => {
    if (!file) {
      setTrace(null);
      return;
    }
    const check = file.size > 20 * 1024 * 1024 ? ({ ok: false, message: 'The file is over 20 MB.' } as const) : checkTraceCsv(await file.text());
    setTrace({ file, check });
  };

  return (
    <form onSubmit={submit} noValidate className="flex flex-col gap-4" aria-label={editing ? 'Edit sweep' : 'New sweep'}>
      <fieldset className="flex flex-col gap-3">
        <legend className="mb-2 text-lg font-bold">Analyser and antenna</legend>
        <SelectField label="Spectrum analyser" defaultValue={initialValues.analyserId} {...register('analyserId')}>
          <option value="">— not recorded —</option>
          {analysers.map((i) => (
            <option key={i.id} value={i.id}>
              {i.model} · {i.serial}
            </option>
          ))}
        </SelectField>
        <SelectField label="Antenna" defaultValue={initialValues.antennaId} {...register('antennaId')}>
          <option value="">— not recorded —</option>
          {antennas.map((i) => (
            <option key={i.id} value={i.id}>
              {i.model} · {i.serial}
            </option>
          ))}
        </SelectField>
        {overdue.map((i) => (
          <Alert key={i.id} tone="warning" title="Calibration overdue">
            {i.model} ({i.serial}) fell due for calibration on {i.calibrationDueOn}.
          </Alert>
        ))}
      </fieldset>

      <fieldset className="flex flex-col gap-3">
        <legend className="mb-2 text-lg font-bold">Span and settings</legend>
        <div className="grid grid-cols-[minmax(0,1fr)_auto] items-start gap-2">
          <Field className="min-w-0" label="Start frequency" inputMode="decimal" autoComplete="off" error={errors.start?.message} {...register('start')} />
          <UnitSelect label="Unit" aria-label="Start frequency unit" defaultValue={initialValues.startUnit} {...register('startUnit')} />
          <Field className="min-w-0" label="Stop frequency" inputMode="decimal" autoComplete="off" error={errors.stop?.message} {...register('stop')} />
          <UnitSelect label="Unit" aria-label="Stop frequency unit" defaultValue={initialValues.stopUnit} {...register('stopUnit')} />
          <Field className="min-w-0" label="RBW" inputMode="decimal" autoComplete="off" error={errors.rbw?.message} {...register('rbw')} />
          <UnitSelect label="Unit" aria-label="RBW unit" defaultValue={initialValues.rbwUnit} {...register('rbwUnit')} />
        </div>
        <Field label="Reference level (dBm)" inputMode="text" autoComplete="off" error={errors.referenceLevel?.message} {...register('referenceLevel')} />
        <SelectField label="Detector" error={errors.detector?.message} defaultValue={initialValues.detector} {...register('detector')}>
          {DETECTORS.map((d) => (
            <option key={d} value={d}>
              {DETECTOR_LABELS[d]}
            </option>
          ))}
        </SelectField>
      </fieldset>

      <fieldset className="flex flex-col gap-3">
        <legend className="mb-2 text-lg font-bold">Peak markers</legend>
        {peaks.fields.length === 0 && <p className="text-fg-muted">No peaks marked.</p>}
        {peaks.fields.map((row, i) => {
          const rowErrors = errors.peaks?.[i];
          return (
            <div key={row.id} className="grid grid-cols-[minmax(0,1fr)_auto] items-start gap-2 rounded-lg border border-border p-2" data-testid="peak-row">
              <Field className="min-w-0" label={`Peak ${i + 1} frequency`} inputMode="decimal" autoComplete="off" error={rowErrors?.frequency?.message} {...register(`peaks.${i}.frequency`)} />
              <UnitSelect label="Unit" aria-label={`Peak ${i + 1} unit`} defaultValue={row.unit} {...register(`peaks.${i}.unit`)} />
              <Field className="min-w-0" label={`Peak ${i + 1} level (dBm)`} inputMode="text" autoComplete="off" error={rowErrors?.level?.message} {...register(`peaks.${i}.level`)} />
              <Button variant="secondary" className="mt-7" onClick={() => peaks.remove(i)} aria-label={`Remove peak ${i + 1}`}>
                Remove
              </Button>
            </div>
          );
        })}
        <Button variant="secondary" onClick={() => peaks.append({ frequency: '', unit: values.stopUnit ?? 'MHz', level: '' })}>
          Add peak marker
        </Button>
        {errors.peaks?.message && <p className="text-sm font-bold text-danger">{errors.peaks.message}</p>}
      </fieldset>

      <div className="flex flex-col gap-1">
        <label htmlFor="sweep-trace" className="font-bold">
          Trace file (CSV of frequency, level; optional)
        </label>
        <input
          id="sweep-trace"
          type="file"
          accept=".csv,text/csv,text/plain"
          className="min-h-touch rounded-lg border-2 border-field-border bg-surface p-2 text-fg file:mr-3 file:min-h-10 file:rounded file:border-0 file:bg-accent file:px-3 file:font-bold file:text-accent-fg"
          onChange={(e) => void onTraceChosen(e.target.files?.[0])}
        />
        {trace?.check.ok && (
          <p className="text-sm text-fg" data-testid="trace-summary">
            {trace.file.name}: {trace.check.rows} rows, {formatFrequency(trace.check.minHz)} – {formatFrequency(trace.check.maxHz)}. Kept with the sweep.
          </p>
        )}
        {trace && !trace.check.ok && <p className="text-sm font-bold text-danger">{trace.check.message}</p>}
      </div>

      <div className="flex flex-col gap-1">
        <label htmlFor="sweep-notes" className="font-bold">
          Notes
        </label>
        <textarea id="sweep-notes" rows={2} className="rounded-lg border-2 border-field-border bg-surface px-3 py-2 text-lg text-fg" {...register('notes')} />
      </div>

      <FormActions
        submitError={submitError}
        busy={formState.isSubmitting}
        submitLabel={editing ? 'Save changes' : 'Save sweep'}
        onCancel={props.onCancel}
      />
    </form>
  );
});
