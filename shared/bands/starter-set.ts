/**
 * The watch bands offered to every organisation (issue 8 §1), each with the published source of its
 * edges, and the receive band of an MRI scanner derived from its field.
 *
 * Sources are those of the team handbook (REFERENCES.md, "Radio bands"): the ITU Radio Regulations
 * (edition 2020) Article 5 for radio astronomy and ISM, the GPS interface specifications for the GNSS
 * carriers, ICAO Annex 10 for VHF aviation, 47 CFR §95 (MedRadio) for the implant band. Anything recalled
 * rather than read from the source says so in its `source` text, until someone checks it.
 */
import { protonPrecessionFrequencyHz } from '../physics/lines';

export type StarterSeverity = 'low' | 'medium' | 'high' | 'critical';

export interface StarterWatchBand {
  /** Stable key, so offering the set twice adds nothing twice. */
  key: string;
  name: string;
  lowerHz: number;
  upperHz: number;
  reason: string;
  source: string;
  severity: StarterSeverity;
  /** Harmful-interference threshold at the receiver, dB(W/(m²·Hz)), where the source gives one. */
  thresholdDbWPerM2Hz?: number;
}

const MHZ = 1e6;
const GHZ = 1e9;
const RR = 'ITU Radio Regulations (2020), Article 5';
const RECALLED_RA_LIST = 'the list of RR 5.340 bands beyond 1400–1427 MHz is recalled from memory: check it against the Table of Frequency Allocations';

export const STARTER_WATCH_BANDS: readonly StarterWatchBand[] = Object.freeze([
  {
    key: 'ra-1400',
    name: 'Radio astronomy 1400–1427 MHz (H I line)',
    lowerHz: 1400 * MHZ,
    upperHz: 1427 * MHZ,
    reason: 'Radio astronomy: the 21 cm hydrogen line at 1420.406 MHz; all emissions prohibited',
    source: `${RR}, RR 5.340. Threshold −239 dB(W/(m²·Hz)) for spectral-line observations from ITU-R RA.769-2 (recalled from memory)`,
    severity: 'critical',
    thresholdDbWPerM2Hz: -239,
  },
  {
    key: 'ra-2690',
    name: 'Radio astronomy 2690–2700 MHz',
    lowerHz: 2690 * MHZ,
    upperHz: 2700 * MHZ,
    reason: 'Radio astronomy continuum band; all emissions prohibited',
    source: `${RR}, RR 5.340; ${RECALLED_RA_LIST}`,
    severity: 'high',
  },
  {
    key: 'ra-10680',
    name: 'Radio astronomy 10.68–10.7 GHz',
    lowerHz: 10.68 * GHZ,
    upperHz: 10.7 * GHZ,
    reason: 'Radio astronomy continuum band; all emissions prohibited',
    source: `${RR}, RR 5.340; ${RECALLED_RA_LIST}`,
    severity: 'high',
  },
  {
    key: 'ra-23600',
    name: 'Radio astronomy 23.6–24 GHz',
    lowerHz: 23.6 * GHZ,
    upperHz: 24 * GHZ,
    reason: 'Radio astronomy (ammonia lines); all emissions prohibited',
    source: `${RR}, RR 5.340; ${RECALLED_RA_LIST}`,
    severity: 'high',
  },
  {
    key: 'ism-13',
    name: 'ISM 13.56 MHz',
    lowerHz: 13.553 * MHZ,
    upperHz: 13.567 * MHZ,
    reason: 'ISM band: RFID readers, plasma etch and deposition tools, diathermy',
    source: `${RR}, RR 5.150; 47 CFR §18.301`,
    severity: 'low',
  },
  {
    key: 'ism-27',
    name: 'ISM 27.12 MHz',
    lowerHz: 26.957 * MHZ,
    upperHz: 27.283 * MHZ,
    reason: 'ISM band: RF heating and diathermy',
    source: `${RR}, RR 5.150; 47 CFR §18.301`,
    severity: 'low',
  },
  {
    key: 'ism-40',
    name: 'ISM 40.68 MHz',
    lowerHz: 40.66 * MHZ,
    upperHz: 40.7 * MHZ,
    reason: 'ISM band: RF heating, telemetry',
    source: `${RR}, RR 5.150; 47 CFR §18.301`,
    severity: 'low',
  },
  {
    key: 'ism-2400',
    name: 'ISM 2.4 GHz',
    lowerHz: 2400 * MHZ,
    upperHz: 2500 * MHZ,
    reason: 'ISM band: Wi-Fi, Bluetooth, wireless patient monitors',
    source: `${RR}, RR 5.150; 47 CFR §18.301`,
    severity: 'medium',
  },
  {
    key: 'ism-5800',
    name: 'ISM 5.8 GHz',
    lowerHz: 5725 * MHZ,
    upperHz: 5875 * MHZ,
    reason: 'ISM band: Wi-Fi and point-to-point links',
    source: `${RR}, RR 5.150; 47 CFR §18.301`,
    severity: 'medium',
  },
  {
    key: 'gnss-l1',
    name: 'GPS L1 / Galileo E1',
    lowerHz: 1575.42 * MHZ - 1.023 * MHZ,
    upperHz: 1575.42 * MHZ + 1.023 * MHZ,
    reason: 'GNSS timing and positioning receivers',
    source: 'IS-GPS-200 (carrier 1575.42 MHz); Galileo OS SIS ICD (E1 1575.420 MHz); the ±1.023 MHz C/A main-lobe width is recalled from memory',
    severity: 'high',
  },
  {
    key: 'gnss-l2',
    name: 'GPS L2',
    lowerHz: 1227.6 * MHZ - 1.023 * MHZ,
    upperHz: 1227.6 * MHZ + 1.023 * MHZ,
    reason: 'GNSS dual-frequency receivers (survey and timing)',
    source: 'IS-GPS-200 (carrier 1227.60 MHz); the ±1.023 MHz L2C main-lobe width is recalled from memory',
    severity: 'high',
  },
  {
    key: 'gnss-l5',
    name: 'GPS L5 / Galileo E5a',
    lowerHz: 1176.45 * MHZ - 10.23 * MHZ,
    upperHz: 1176.45 * MHZ + 10.23 * MHZ,
    reason: 'GNSS safety-of-life signals (aviation receivers)',
    source: 'IS-GPS-705 (carrier 1176.45 MHz); Galileo OS SIS ICD (E5a 1176.450 MHz); the ±10.23 MHz main-lobe width is recalled from memory',
    severity: 'high',
  },
  {
    key: 'aviation-vhf',
    name: 'VHF aviation 108–137 MHz',
    lowerHz: 108 * MHZ,
    upperHz: 137 * MHZ,
    reason: 'Aeronautical radionavigation (108–117.975 MHz) and VHF voice communications (117.975–137 MHz)',
    source: 'ICAO Annex 10; ITU Radio Regulations (2020), Article 5',
    severity: 'high',
  },
  {
    key: 'mics',
    name: 'Medical implant communication 402–405 MHz',
    lowerHz: 402 * MHZ,
    upperHz: 405 * MHZ,
    reason: 'Links to implanted devices (pacemakers, neurostimulators) — MICS / MedRadio core band',
    source: '47 CFR §95 (MedRadio); ITU-R RS.1346',
    severity: 'critical',
  },
]);

/**
 * Whether two bands are the same band: the same name (ignoring case and spacing), or both edges within
 * 1 kHz (or a millionth of the upper edge, whichever is wider) — so a starter band is not offered
 * again to an organisation that already watches those edges under a name of its own.
 */
export function sameBand(a: { name: string; lowerHz: number; upperHz: number }, b: { name: string; lowerHz: number; upperHz: number }): boolean {
  const norm = (n: string) => n.trim().replace(/\s+/g, ' ').toLowerCase();
  if (norm(a.name) === norm(b.name)) return true;
  const tolerance = Math.max(1e3, 1e-6 * Math.max(a.upperHz, b.upperHz));
  return Math.abs(a.lowerHz - b.lowerHz) <= tolerance && Math.abs(a.upperHz - b.upperHz) <= tolerance;
}

/**
 * Half-width of an MRI scanner's receive band around its precession frequency, Hz. Receive bandwidths
 * are a few hundred kHz either side of the centre (common practice, recalled from memory): set the
 * scanner's own figure when its specification gives one.
 */
export const MRI_RECEIVE_HALF_WIDTH_HZ = 500e3;

/**
 * The band an MRI scanner of field `fieldT` receives in: proton NMR precession, f = (γₚ/2π)·B₀ with
 * γₚ/2π = 42.577 478 518 MHz/T (CODATA 2018). This is precession, not a cyclotron line.
 */
export function mriReceiveBand(fieldT: number, halfWidthHz = MRI_RECEIVE_HALF_WIDTH_HZ): { centreHz: number; lowerHz: number; upperHz: number } {
  if (!(halfWidthHz > 0) || !Number.isFinite(halfWidthHz)) throw new RangeError('The half-width must be a positive number of hertz.');
  const centreHz = protonPrecessionFrequencyHz(fieldT);
  return { centreHz, lowerHz: Math.max(0, centreHz - halfWidthHz), upperHz: centreHz + halfWidthHz };
}

/** The watch band for one scanner, labelled as precession so nobody reads it as a cyclotron line. */
export function mriReceiveWatchBand(scanner: { name: string; nominalFieldT: number }): Omit<StarterWatchBand, 'key'> {
  const band = mriReceiveBand(scanner.nominalFieldT);
  const centreMHz = (band.centreHz / 1e6).toFixed(3);
  return {
    name: `${scanner.name} receive band (${centreMHz} MHz)`,
    lowerHz: band.lowerHz,
    upperHz: band.upperHz,
    reason: `The scanner receives proton NMR precession at ${centreMHz} MHz (${scanner.nominalFieldT} T). Precession, not a cyclotron line`,
    source: 'Derived from the field: f = 42.577 478 518 MHz/T × B₀ (CODATA 2018 proton gyromagnetic ratio); ±500 kHz receive width is common practice, recalled from memory',
    severity: 'high',
  };
}
