import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import { z } from 'zod';
import { WatchBandCreateSchema, type WatchBand } from '@shared/schemas/watch-band';
import { SEVERITIES } from '@shared/schemas/vocabulary';
import { formatFrequency, frequencyTextSchema } from '@shared/units';
import { Button } from '@/components/button';
import { Field } from '@/components/field';
import { SelectField } from '@/components/select-field';
import { applyRequestError, checkedBy, emptyToNull } from '@/lib/form-errors';
import { showToast } from '@/lib/toast';
import { useSaveWatchBand } from '../data/save-watch-band';
import { SEVERITY_LABELS } from './labels';

/** The edges typed with their unit ("2.4 GHz", "402 MHz"); the threshold as text; then the shared schema. */
const WatchBandFormSchema = z
  .object({
    ...WatchBandCreateSchema.shape,
    lowerHz: frequencyTextSchema,
    upperHz: frequencyTextSchema,
    thresholdDbWPerM2Hz: z
      .string()
      .nullable()
      .transform((t, ctx) => {
        if (t === null || t.trim() === '') return null;
        const n = Number(t.trim().replace(/\s*dB.*$/i, ''));
        if (!Number.isFinite(n)) {
          ctx.addIssue({ code: 'custom', message: 'Give the threshold as a number of dB(W/(m²·Hz)), e.g. -239.' });
          return z.NEVER;
        }
        return n;
      }),
  })
  .transform(checkedBy(WatchBandCreateSchema));
type WatchBandFormInput = z.input<typeof WatchBandFormSchema>;

const FIELDS = ['name', 'lowerHz', 'upperHz', 'reason', 'source', 'severity', 'thresholdDbWPerM2Hz', 'notes'] as const;
const NEEDS_NETWORK = 'Saving needs a network connection. Nothing was changed; try again when you are back online.';

/** Hertz back to text the unit parser reads again without loss ("1574.397 MHz"). */
const editable = (hz: number) => formatFrequency(hz, { significantDigits: 10 }).replace(/(\.\d*?)0+(?=\s)/, '$1').replace(/\.(?=\s)/, '');

export function WatchBandForm({ organisationId, band, onDone }: { organisationId: string; band?: WatchBand; onDone: () => void }) {
  const save = useSaveWatchBand(organisationId);
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm<WatchBandFormInput, unknown, z.output<typeof WatchBandFormSchema>>({
    resolver: zodResolver(WatchBandFormSchema),
    defaultValues: {
      name: band?.name ?? '',
      lowerHz: band ? editable(band.lowerHz) : '',
      upperHz: band ? editable(band.upperHz) : '',
      reason: band?.reason ?? '',
      source: band?.source ?? '',
      severity: band?.severity ?? 'medium',
      thresholdDbWPerM2Hz: band?.thresholdDbWPerM2Hz === null || band?.thresholdDbWPerM2Hz === undefined ? null : String(band.thresholdDbWPerM2Hz),
      siteId: band?.siteId ?? null,
      notes: band?.notes ?? null,
    },
  });
  return (
    <form
      noValidate
      aria-label={band ? `Edit ${band.name}` : 'New watch band'}
      className="grid grid-cols-1 gap-4 sm:grid-cols-2"
      onSubmit={handleSubmit((values) =>
        save.mutate(
          { watchBandId: band?.id, body: values },
          {
            onSuccess: () => {
              showToast({ tone: 'ok', message: band ? `Saved ${values.name}.` : `Now watching ${values.name}.` });
              onDone();
            },
            onError: (error) => {
              const rest = applyRequestError(error, setError, FIELDS, { offlineMessage: NEEDS_NETWORK });
              if (rest) showToast({ tone: 'danger', message: rest });
            },
          },
        ),
      )}
    >
      <Field label="Band name" className="sm:col-span-2" placeholder="Campus telemetry 433 MHz" error={errors.name?.message} {...register('name')} />
      <Field label="Lower edge" hint="With its unit: 402 MHz, 2.4 GHz" autoComplete="off" error={errors.lowerHz?.message} {...register('lowerHz')} />
      <Field label="Upper edge" hint="With its unit: 405 MHz, 2.5 GHz" autoComplete="off" error={errors.upperHz?.message} {...register('upperHz')} />
      <Field label="Why it is protected" className="sm:col-span-2" error={errors.reason?.message} {...register('reason')} />
      <Field
        label="Source of the edges"
        className="sm:col-span-2"
        hint="The published table or document; write “recalled from memory” until someone has checked it"
        error={errors.source?.message}
        {...register('source')}
      />
      <SelectField label="Severity" options={SEVERITIES.map((s) => ({ value: s, label: SEVERITY_LABELS[s] }))} error={errors.severity?.message} {...register('severity')} />
      <Field
        label="Interference threshold (optional)"
        hint="dB(W/(m²·Hz)) at the receiver, when the source gives one"
        inputMode="decimal"
        autoComplete="off"
        error={errors.thresholdDbWPerM2Hz?.message}
        {...register('thresholdDbWPerM2Hz', { setValueAs: emptyToNull })}
      />
      <Field label="Notes (optional)" className="sm:col-span-2" error={errors.notes?.message} {...register('notes', { setValueAs: emptyToNull })} />
      <div className="flex gap-3 sm:col-span-2">
        <Button type="submit" busy={save.isPending} busyLabel="Saving…">
          {band ? 'Save band' : 'Add band'}
        </Button>
        <Button variant="secondary" onClick={onDone}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
