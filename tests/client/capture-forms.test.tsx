import { act, cleanup, fireEvent, render, screen, waitFor } from '@testing-library/react';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { cyclotronFrequencyHz } from '@shared/physics';
import { formatFrequency } from '@shared/units';
import type { InstrumentRow, WatchBandRow, ZoneSetRow } from '@/db';
import { ReadingForm } from '@/features/capture/components/reading-form';
import { SweepForm } from '@/features/capture/components/sweep-form';
import { emptyReadingForm } from '@/features/capture/lib/reading-form';
import { emptySweepForm } from '@/features/capture/lib/sweep-form';

afterEach(cleanup);

const ORG = '00000000-0000-7000-8000-000000000001';
const instrument = (id: string, model: string, calibrationDueOn: string, relativeUncertainty: number): InstrumentRow => ({
  id,
  organisationId: ORG,
  revision: 1,
  kind: 'gaussmeter',
  model,
  serial: `SN-${id.slice(-2)}`,
  probe: null,
  calibratedOn: null,
  calibrationDueOn,
  relativeUncertainty,
  archived: false,
  calibrationOverdue: false,
});
const HALL = instrument('00000000-0000-7000-8000-0000000000c1', 'Hall meter', '2099-01-01', 0.01);
const FLUXGATE = instrument('00000000-0000-7000-8000-0000000000c2', 'Fluxgate', '2026-06-30', 0.005);
// ITU Radio Regulations (2020) RR 5.150: the 2400–2500 MHz ISM band (REFERENCES.md).
const ISM: WatchBandRow = { id: '00000000-0000-7000-8000-0000000000a1', organisationId: ORG, revision: 1, siteId: null, name: 'ISM 2.4 GHz', lowerHz: 2400e6, upperHz: 2500e6, reason: 'Wi-Fi', source: 'RR 5.150', severity: 'medium' };
const ZONES: ZoneSetRow = {
  id: '00000000-0000-7000-8000-0000000000b1',
  organisationId: ORG,
  revision: 1,
  name: 'MR safety lines',
  edition: 'IEC 60601-2-33:2022 (ed. 4)',
  thresholds: [
    { name: 'B0 hazard boundary', fieldT: 9e-4, caution: 'People with implants stay outside.' },
    { name: 'Projectile risk', fieldT: 3e-3, caution: 'Control what is carried in.' },
  ],
};
const SETTINGS = { species: ['electron', 'proton'] as const, maxHarmonic: 3, zoneSet: ZONES, watchBands: [ISM] };

function renderReadingForm(onSubmit = vi.fn(async () => {}), measuredAt = new Date(2026, 11, 1)) {
  render(
    <ReadingForm
      instruments={[HALL, FLUXGATE]}
      initialValues={emptyReadingForm('mT', HALL.id)}
      measuredAt={measuredAt}
      feedbackSettings={SETTINGS}
      watchBands={[ISM]}
      editing={false}
      stationReady
      onValuesChange={() => {}}
      onUnitChange={() => {}}
      onSubmit={onSubmit}
    />,
  );
  return onSubmit;
}

describe('the field reading form', () => {
  it('shows the safety class and names the watch band as soon as 87.5 mT is typed', async () => {
    renderReadingForm();
    fireEvent.input(screen.getByLabelText('|B|'), { target: { value: '87.5' } });
    const hits = await screen.findByTestId('band-hits');
    expect(hits.textContent).toContain('ISM 2.4 GHz');
    // The electron line shown is the physics module's, widened by the Hall meter's ±1 %:
    // NRL Plasma Formulary f_ce = 2.80e6 Hz/G × 875 G ≈ 2.45 GHz.
    const centre = cyclotronFrequencyHz('electron', 87.5e-3);
    expect(centre / 1e9).toBeCloseTo(2.45, 2);
    expect(hits.textContent).toContain(formatFrequency(centre * 0.99));
    expect(hits.textContent).toContain(formatFrequency(centre * 1.01));
    expect(screen.getByTestId('safety-class').textContent).toContain('Projectile risk');
    expect(screen.getByTestId('safety-class').textContent).toContain('Control what is carried in.');
    expect(screen.getByTestId('frequency-ruler')).toBeTruthy();
  });

  it('shows no band hit for 0.5 mT, and the class below the 0.9 mT boundary', async () => {
    renderReadingForm();
    fireEvent.input(screen.getByLabelText('|B|'), { target: { value: '0.5' } });
    await waitFor(() => expect(screen.getByTestId('safety-class').textContent).toContain('Below the lowest line (B0 hazard boundary)'));
    expect(screen.queryByTestId('band-hits')).toBeNull();
  });

  it('derives |B| from three components and shows it', async () => {
    renderReadingForm();
    fireEvent.click(screen.getByLabelText('Bx, By, Bz'));
    fireEvent.input(await screen.findByLabelText('Bx'), { target: { value: '0.3' } });
    fireEvent.input(screen.getByLabelText('By'), { target: { value: '-0.4' } });
    fireEvent.input(screen.getByLabelText('Bz'), { target: { value: '0' } });
    await waitFor(() => expect(screen.getByTestId('derived-magnitude').textContent).toContain('0.5000 mT'));
  });

  it('warns when the chosen instrument was overdue for calibration on the reading date', async () => {
    renderReadingForm(undefined, new Date(2026, 6, 1));
    expect(screen.queryByText('Calibration overdue')).toBeNull();
    fireEvent.change(screen.getByLabelText('Gaussmeter'), { target: { value: FLUXGATE.id } });
    expect(await screen.findByText('Calibration overdue')).toBeTruthy();
  });

  it('shows a typing error next to the box and saves nothing', async () => {
    const onSubmit = renderReadingForm();
    fireEvent.input(screen.getByLabelText('|B|'), { target: { value: '0,5' } });
    await act(async () => {
      fireEvent.click(screen.getByRole('button', { name: 'Save reading' }));
    });
    expect(await screen.findByText(/use a point for decimals/)).toBeTruthy();
    expect(onSubmit).not.toHaveBeenCalled();
  });

  it('asks to confirm 12 T instead of refusing it', async () => {
    const onSubmit = renderReadingForm();
    fireEvent.change(screen.getByLabelText('Unit'), { target: { value: 'T' } });
    fireEvent.input(screen.getByLabelText('|B|'), { target: { value: '12' } });
    await act(async () => {
      fireEvent.click(screen.getByRole('button', { name: 'Save reading' }));
    });
    expect(await screen.findByText(/Confirm the value/)).toBeTruthy();
    expect(onSubmit).not.toHaveBeenCalled();
    fireEvent.click(screen.getByLabelText('Yes, this value is right'));
    await act(async () => {
      fireEvent.click(screen.getByRole('button', { name: 'Save reading' }));
    });
    await waitFor(() => expect(onSubmit).toHaveBeenCalledTimes(1));
    const [parsed] = onSubmit.mock.calls[0] as unknown as [{ magnitudeT: number; unit: string }];
    expect(parsed.magnitudeT).toBe(12);
    expect(parsed.unit).toBe('T');
  });
});

describe('the sweep form', () => {
  it('adds and removes peak rows and refuses a peak outside the span', async () => {
    const onSubmit = vi.fn(async () => {});
    render(
      <SweepForm analysers={[]} antennas={[]} initialValues={emptySweepForm()} measuredAt={new Date()} editing={false} stationReady onValuesChange={() => {}} onSubmit={onSubmit} />,
    );
    fireEvent.input(screen.getByLabelText('Start frequency'), { target: { value: '2300' } });
    fireEvent.input(screen.getByLabelText('Stop frequency'), { target: { value: '2600' } });
    fireEvent.click(screen.getByRole('button', { name: 'Add peak marker' }));
    fireEvent.click(screen.getByRole('button', { name: 'Add peak marker' }));
    expect(screen.getAllByTestId('peak-row')).toHaveLength(2);
    fireEvent.click(screen.getByRole('button', { name: 'Remove peak 2' }));
    expect(screen.getAllByTestId('peak-row')).toHaveLength(1);
    fireEvent.input(screen.getByLabelText('Peak 1 frequency'), { target: { value: '3000' } });
    fireEvent.input(screen.getByLabelText('Peak 1 level (dBm)'), { target: { value: '-40' } });
    await act(async () => {
      fireEvent.click(screen.getByRole('button', { name: 'Save sweep' }));
    });
    expect(await screen.findByText('Peak 1 lies outside the sweep span.')).toBeTruthy();
    expect(onSubmit).not.toHaveBeenCalled();
    fireEvent.input(screen.getByLabelText('Peak 1 frequency'), { target: { value: '2449.6' } });
    await act(async () => {
      fireEvent.click(screen.getByRole('button', { name: 'Save sweep' }));
    });
    await waitFor(() => expect(onSubmit).toHaveBeenCalledTimes(1));
  });
});
