import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm, useWatch, type FieldErrors, type UseFormRegister } from 'react-hook-form';
import { z } from 'zod';
import { ELECTRON_VOLT_J, perVolumeEmissionWPerM3, type EmissionEnergyKind } from '@shared/physics';
import { EmitterCreateSchema, type Emitter } from '@shared/schemas/emitter';
import type { Room } from '@shared/schemas/room';
import { ELECTRON_ENERGY_KINDS, EMITTER_KINDS } from '@shared/schemas/vocabulary';
import { energyTextSchema, fluxDensityTextSchema, formatEnergy, formatPower, isPhysicsInputError, parseFluxDensityTesla, parseEnergyJ } from '@shared/units';
import { Button } from '@/components/button';
import { Field } from '@/components/field';
import { useSaveEmitter } from '../data/save-emitter';
import { formatPowerPerVolume } from './emission-figures';
import { emptyToNull, reportFormError } from './form-errors';
import { EMITTER_KIND_LABELS, ENERGY_KIND_LABELS } from './labels';
import { SelectField } from '@/components/select-field';

/** The shared schema with the energy typed with its unit ("10 eV", "2 keV"), stored in eV. */
const EmitterFormSchema = EmitterCreateSchema.extend({
  electronEnergyEv: energyTextSchema.transform((joules) => joules / ELECTRON_VOLT_J).pipe(EmitterCreateSchema.shape.electronEnergyEv),
  electronDensityPerM3: z.coerce.number<string>().pipe(EmitterCreateSchema.shape.electronDensityPerM3),
  volumeM3: z.coerce.number<string>().pipe(EmitterCreateSchema.shape.volumeM3),
});
type EmitterFormInput = z.input<typeof EmitterFormSchema>;

/** The emission law's energy kinds, named as the wire contract names them. */
const ENERGY_KIND_FOR_PHYSICS: Record<Emitter['energyKind'], EmissionEnergyKind> = { total: 'totalIsotropic', perpendicular: 'perpendicular' };

/** Per-volume and total power for the typed values, with the same shared/physics function as the server. */
function preview(values: Partial<EmitterFormInput>, fieldText: string): { text: string; error: boolean } {
  try {
    const fieldTesla = parseFluxDensityTesla(fieldText);
    const energyJ = parseEnergyJ(values.electronEnergyEv ?? '');
    const densityPerM3 = Number(values.electronDensityPerM3);
    const volumeM3 = Number(values.volumeM3);
    if (!(densityPerM3 > 0) || !(volumeM3 > 0)) return { text: 'Type the density and the volume to see the emitted power.', error: false };
    const { powerPerVolumeWPerM3 } = perVolumeEmissionWPerM3({ densityPerM3, fieldTesla, energyJ, energyKind: ENERGY_KIND_FOR_PHYSICS[values.energyKind ?? 'total'] });
    return {
      text: `${formatPowerPerVolume(powerPerVolumeWPerM3)} per volume, ${formatPower(powerPerVolumeWPerM3 * volumeM3, { unit: 'W', significantDigits: 3 })} in total at ${fieldText.trim()}`,
      error: false,
    };
  } catch (error) {
    if (isPhysicsInputError(error)) return { text: error.message, error: true };
    throw error;
  }
}

export function EmitterForm({ organisationId, siteId, rooms, emitter, onDone }: { organisationId: string; siteId: string; rooms: Room[]; emitter?: Emitter; onDone: () => void }) {
  const save = useSaveEmitter(organisationId, siteId);
  const {
    register,
    handleSubmit,
    setError,
    control,
    formState: { errors },
  } = useForm<EmitterFormInput, unknown, z.output<typeof EmitterFormSchema>>({
    resolver: zodResolver(EmitterFormSchema),
    defaultValues: {
      roomId: emitter?.roomId ?? rooms[0]?.id ?? '',
      name: emitter?.name ?? '',
      kind: emitter?.kind ?? 'discharge_lamp',
      electronDensityPerM3: emitter ? String(emitter.electronDensityPerM3) : '',
      electronEnergyEv: emitter ? formatEnergy(emitter.electronEnergyEv * ELECTRON_VOLT_J, { unit: 'eV', significantDigits: 6 }) : '',
      energyKind: emitter?.energyKind ?? 'total',
      volumeM3: emitter ? String(emitter.volumeM3) : '',
      notes: emitter?.notes ?? '',
    },
  });
  const values = useWatch({ control });
  return (
    <EmitterFormBody
      register={register}
      errors={errors}
      rooms={rooms}
      values={values}
      busy={save.isPending}
      emitter={emitter}
      onCancel={onDone}
      onSubmit={handleSubmit((body) =>
        save.mutate(
          { emitterId: emitter?.id, body },
          { onSuccess: onDone, onError: (error) => reportFormError(error, setError, ['roomId', 'name', 'kind', 'electronDensityPerM3', 'electronEnergyEv', 'energyKind', 'volumeM3', 'notes']) },
        ),
      )}
    />
  );
}

function EmitterFormBody({ register, errors, rooms, values, busy, emitter, onSubmit, onCancel }: {
  register: UseFormRegister<EmitterFormInput>;
  errors: FieldErrors<EmitterFormInput>;
  rooms: Room[];
  values: Partial<EmitterFormInput>;
  busy: boolean;
  emitter?: Emitter;
  onSubmit: () => void;
  onCancel: () => void;
}) {
  const [fieldText, setFieldText] = useState(emitter?.emission ? `${emitter.emission.fieldT} T` : '10 mT');
  const fieldError = (() => {
    try {
      fluxDensityTextSchema.parse(fieldText);
      return undefined;
    } catch {
      return 'Give the field with its unit, e.g. 10 mT.';
    }
  })();
  const shown = preview(values, fieldText);
  return (
    <form noValidate aria-label={emitter ? `Edit ${emitter.name}` : 'Add an emitter'} className="grid grid-cols-1 gap-4 sm:grid-cols-2" onSubmit={(event) => { event.preventDefault(); onSubmit(); }}>
      <Field label="Emitter name" error={errors.name?.message} {...register('name')} />
      <SelectField label="Room" options={rooms.map((r) => ({ value: r.id, label: r.name }))} error={errors.roomId?.message} {...register('roomId')} />
      <SelectField label="Kind" options={EMITTER_KINDS.map((k) => ({ value: k, label: EMITTER_KIND_LABELS[k] }))} error={errors.kind?.message} {...register('kind')} />
      <Field label="Electron density (per m³)" hint="e.g. 1e17" inputMode="decimal" autoComplete="off" error={errors.electronDensityPerM3?.message} {...register('electronDensityPerM3')} />
      <Field label="Electron energy" hint="With its unit: 5 eV, 2 keV" autoComplete="off" error={errors.electronEnergyEv?.message} {...register('electronEnergyEv')} />
      <SelectField
        label="That energy is"
        options={ELECTRON_ENERGY_KINDS.map((k) => ({ value: k, label: ENERGY_KIND_LABELS[k] }))}
        error={errors.energyKind?.message}
        {...register('energyKind')}
      />
      <Field label="Plasma volume (m³)" hint="e.g. 2e-4 for 200 cm³" inputMode="decimal" autoComplete="off" error={errors.volumeM3?.message} {...register('volumeM3')} />
      <Field
        label="Field at the emitter, for the preview"
        hint="Not saved: the server uses the highest field read in the room, or 1 T as a reference"
        value={fieldText}
        onChange={(event) => setFieldText(event.target.value)}
        error={fieldError}
        autoComplete="off"
      />
      <p className={`sm:col-span-2 ${shown.error ? 'font-bold text-danger' : 'font-bold'}`} role="status" data-testid="emission-preview">
        {shown.text}
      </p>
      <Field label="Notes (optional)" className="sm:col-span-2" error={errors.notes?.message} {...register('notes', { setValueAs: emptyToNull })} />
      <div className="flex flex-wrap gap-3 sm:col-span-2">
        <Button type="submit" busy={busy} busyLabel="Saving…">
          {emitter ? 'Save emitter' : 'Add emitter'}
        </Button>
        <Button variant="secondary" onClick={onCancel}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
