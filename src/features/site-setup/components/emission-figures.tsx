import type { Emission } from '@shared/schemas/emitter';
import { formatFluxDensity, formatPower } from '@shared/units';

const BASIS_TEXT: Record<Emission['fieldBasis'], string> = {
  query: 'at the field you gave',
  room_readings: 'at the highest field read in the room',
  reference_1T: 'at 1 T as a reference (power grows with B²)',
};

/** W/m³ has no unit in shared/units (volume powers are not typed by users): format the number here. */
export function formatPowerPerVolume(wattsPerM3: number): string {
  return `${wattsPerM3.toPrecision(3).replace('e+', 'e')} W/m³`;
}

export function EmissionFigures({ emission, note }: { emission: Emission | null; note: string }) {
  if (!emission) return <p className="text-sm text-fg-muted">{note}</p>;
  return (
    <div className="text-sm" data-testid="emission-figures">
      <p>
        <span className="font-bold">{formatPowerPerVolume(emission.perVolumeWPerM3)}</span> per volume ·{' '}
        <span className="font-bold">{formatPower(emission.totalW, { unit: 'W', significantDigits: 3 })}</span> in total
      </p>
      <p className="text-fg-muted">
        {BASIS_TEXT[emission.fieldBasis]} ({formatFluxDensity(emission.fieldT, { significantDigits: 3 })}). {note}
      </p>
    </div>
  );
}
