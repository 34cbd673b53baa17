/**
 * The invented demo campus of DESIGN.md §7, as plain data: levels and rooms in plan metres, magnets,
 * plasma-bearing devices, instruments, bands and zone sets.
 *
 * EVERY NAME, PERSON, PLACE, SERIAL NUMBER, DATE AND NUMBER IN THIS FILE IS MADE UP for the demo. The
 * magnets' dipole moments are invented so that the fringe-field distances look like those of real
 * installations of their kind; they describe no real product. Band edges and thresholds name the
 * published source they were taken from (REFERENCES.md), and say so where recalled from memory.
 *
 * Plan frame (see server/db/schema/sites.ts): x to the right, y up the plan, metres; every level here
 * is 48 m × 30 m, drawn at 20 px per metre (960 × 600 px) with the origin at the bottom-left corner.
 */
import type { Role } from '../../../shared/schemas/common';
import type { MAGNET_SHIELDINGS, ROOM_SENSITIVITIES, SOURCE_KINDS, EMITTER_KINDS, ELECTRON_ENERGY_KINDS } from '../../../shared/schemas/vocabulary';
import type { ZoneThreshold } from '../schema/bands';
import type { PolygonM } from '../schema/sites';

export const DEMO_PASSWORD = 'fringewalk-demo';

export const PLAN_WIDTH_M = 48;
export const PLAN_DEPTH_M = 30;
export const PLAN_PX_PER_M = 20;

export interface PersonSpec {
  key: string;
  email: string;
  name: string;
  role: Role;
}

export const HARROWBY = {
  key: 'harrowby',
  name: 'Harrowby Bridge Hospital & Research Campus',
  people: [
    { key: 'admin', email: 'admin@harrowby.example', name: 'Imogen Thwaite', role: 'admin' },
    { key: 'reviewer', email: 'reviewer@harrowby.example', name: 'Dr Caspar Ollerenshaw', role: 'reviewer' },
    { key: 'emc', email: 'emc@harrowby.example', name: 'Nadia Febrero-Quist', role: 'emc' },
    { key: 'surveyor', email: 'surveyor@harrowby.example', name: 'Ada Lindqvist-Marr', role: 'surveyor' },
    { key: 'viewer', email: 'viewer@harrowby.example', name: 'Morwenna Quayle', role: 'viewer' },
    { key: 'surveyor2', email: 'surveyor2@harrowby.example', name: 'Bram Okonjo-Rees', role: 'surveyor' },
    // Walks the open 2026 survey on her phone; Bram (above) is on the earlier surveys only, so the demo also
    // has a surveyor who is not on the open survey (and sees none of it).
    { key: 'surveyor3', email: 'surveyor3@harrowby.example', name: 'Priya Halloran-Date', role: 'surveyor' },
  ] satisfies PersonSpec[],
} as const;

export const KESTREL = {
  key: 'kestrel',
  name: 'Kestrel Point Physics Lab',
  people: [{ key: 'admin', email: 'admin@kestrel.example', name: 'Yusuf Carrow', role: 'admin' }] satisfies PersonSpec[],
} as const;

export interface RoomSpec {
  key: string;
  name: string;
  use: string;
  sensitivity: (typeof ROOM_SENSITIVITIES)[number];
  polygon: PolygonM;
  /** Surveyed on a station grid in the demo surveys. */
  surveyed: boolean;
}

export interface LevelSpec {
  key: string;
  name: string;
  ordinal: number;
  /** Finished floor above the campus datum, m. */
  elevationM: number;
  rooms: RoomSpec[];
}

const rect = (x0: number, y0: number, x1: number, y1: number): PolygonM => [
  [x0, y0],
  [x1, y0],
  [x1, y1],
  [x0, y1],
];

const room = (key: string, name: string, use: string, sensitivity: RoomSpec['sensitivity'], polygon: PolygonM, surveyed = true): RoomSpec => ({
  key,
  name,
  use,
  sensitivity,
  polygon,
  surveyed,
});

export const HARROWBY_SITE = {
  key: 'campus',
  name: 'Harrowby Bridge Hospital & Research Campus',
  address: '1 Weir Lane, Harrowby Bridge (invented address)',
  notes: 'Demo site. Every person, number and plan here is made up.',
};

export const HARROWBY_LEVELS: LevelSpec[] = [
  {
    key: 'b1',
    name: 'B1 — Cyclotron and radiopharmacy',
    ordinal: 0,
    elevationM: -4.5,
    rooms: [
      room('vault', 'Cyclotron vault', 'isotope-production cyclotron vault', 'low', rect(4, 4, 16, 16)),
      room('cyc-control', 'Cyclotron control room', 'control room', 'medium', rect(16, 4, 24, 10)),
      room('radiochem', 'Radiochemistry hot-cell lab', 'radiochemistry laboratory', 'medium', rect(16, 10, 28, 16)),
      room('corridor-b1', 'Corridor B1', 'corridor', 'low', rect(0, 16, 48, 19)),
      room('stores-b1', 'Stores', 'storage', 'none', rect(28, 4, 48, 16), false),
    ],
  },
  {
    key: 'g',
    name: 'Ground — Imaging',
    ordinal: 1,
    elevationM: 0,
    rooms: [
      room('staff', 'Staff room', 'staff rest room', 'high', rect(0, 8, 14, 16)),
      room('mr1', 'MR 1 scanner room', 'MR scanner room', 'medium', rect(14, 8, 22, 16)),
      room('mr1-control', 'MR 1 control room', 'control room', 'medium', rect(22, 8, 27, 16)),
      room('mr1-equipment', 'MR 1 equipment room', 'technical room', 'low', rect(14, 2, 22, 8)),
      room('waiting', 'Imaging waiting area', 'public waiting area', 'high', rect(27, 8, 36, 16)),
      room('gamma', 'Gamma camera room', 'nuclear-medicine camera room', 'high', rect(36, 8, 48, 16)),
      room('corridor-g', 'Imaging corridor', 'corridor', 'low', rect(0, 16, 48, 19)),
      room('reception', 'Reception', 'reception', 'high', rect(0, 19, 14, 30), false),
    ],
  },
  {
    key: 'l1',
    name: 'Level 1 — Research laboratories',
    ordinal: 2,
    elevationM: 4.5,
    rooms: [
      room('nmr', 'NMR laboratory', 'NMR spectrometer laboratory', 'medium', rect(4, 4, 16, 14)),
      room('etch', 'Plasma-etch laboratory', 'plasma processing laboratory', 'medium', rect(16, 4, 28, 14)),
      room('em', 'Electron microscopy suite', 'electron microscopy', 'high', rect(28, 4, 40, 14)),
      room('corridor-l1', 'Research corridor', 'corridor', 'low', rect(0, 14, 48, 17)),
    ],
  },
  {
    key: 'roof',
    name: 'Roof — Teaching observatory',
    ordinal: 3,
    elevationM: 9,
    rooms: [room('dish', 'Radio-astronomy teaching dish enclosure', 'radio-astronomy receiver hut', 'high', rect(30, 18, 40, 26))],
  },
];

export interface SourceSpec {
  key: string;
  name: string;
  /** Short label drawn on the plan. */
  planLabel: string;
  kind: (typeof SOURCE_KINDS)[number];
  shielding: (typeof MAGNET_SHIELDINGS)[number];
  levelKey: string;
  xM: number;
  yM: number;
  zM: number;
  nominalFieldT: number;
  /** Invented far-field dipole moment, A·m². */
  dipoleMomentAM2: number;
  axis: [number, number, number];
  /** Readings taken before this date were not affected (the magnet was not there yet). */
  installedOn: string;
  notes: string;
}

export const HARROWBY_SOURCES: SourceSpec[] = [
  {
    key: 'mri',
    name: 'MR 1 — 3 T whole-body scanner',
    planLabel: 'MR 1 (3 T)',
    kind: 'mri',
    shielding: 'active',
    levelKey: 'g',
    xM: 18,
    yM: 12,
    zM: 1.2,
    nominalFieldT: 3,
    // Invented: puts the 0.5 mT line about 4 m out along the bore and 3.2 m to the side (dipole).
    dipoleMomentAM2: 1.6e5,
    axis: [1, 0, 0],
    installedOn: '2019-03-01',
    notes: 'Bore along the plan x axis. Invented demo magnet.',
  },
  {
    key: 'cyclotron',
    name: '18 MeV isotope-production cyclotron',
    planLabel: 'Cyclotron',
    kind: 'cyclotron',
    shielding: 'passive',
    levelKey: 'b1',
    xM: 10,
    yM: 10,
    zM: 1.3,
    nominalFieldT: 1.9,
    dipoleMomentAM2: 1.5e5,
    axis: [0, 0, 1],
    installedOn: '2016-09-01',
    notes: 'Main field vertical; the staff room on the ground floor sits above the vault. Invented demo magnet.',
  },
  {
    key: 'nmr',
    name: '800 MHz NMR spectrometer magnet (18.8 T)',
    planLabel: 'NMR 800 MHz',
    kind: 'nmr',
    shielding: 'active',
    levelKey: 'l1',
    xM: 10,
    yM: 9,
    zM: 1.5,
    nominalFieldT: 18.8,
    dipoleMomentAM2: 4e4,
    axis: [0, 0, 1],
    installedOn: '2021-01-15',
    notes: 'Proton NMR at 800 MHz needs about 18.8 T (42.58 MHz/T precession). Invented demo magnet.',
  },
  {
    key: 'ecr-coils',
    name: 'ECR etch tool — source solenoids (87.5 mT resonance)',
    planLabel: 'ECR solenoids',
    kind: 'other',
    shielding: 'unshielded',
    levelKey: 'l1',
    xM: 22,
    yM: 9,
    zM: 1,
    // 2.45 GHz electron-cyclotron resonance needs about 87.5 mT (DESIGN.md §1: ≈ 28 GHz per tesla).
    nominalFieldT: 0.0875,
    dipoleMomentAM2: 1.1e5,
    axis: [0, 0, 1],
    installedOn: '2026-05-04',
    notes: 'Installed in 2026, after the 2025 survey. Invented demo magnet.',
  },
];

export interface EmitterSpec {
  key: string;
  roomKey: string;
  name: string;
  kind: (typeof EMITTER_KINDS)[number];
  electronDensityPerM3: number;
  electronEnergyEv: number;
  energyKind: (typeof ELECTRON_ENERGY_KINDS)[number];
  volumeM3: number;
  xM: number;
  yM: number;
  zM: number;
  notes: string;
}

// Plasma parameters are invented, of the order usually quoted for such devices.
export const HARROWBY_EMITTERS: EmitterSpec[] = [
  {
    key: 'corridor-lamps',
    roomKey: 'corridor-g',
    name: 'Fluorescent corridor lighting (12 tubes)',
    kind: 'discharge_lamp',
    electronDensityPerM3: 1e17,
    electronEnergyEv: 1.2,
    energyKind: 'total',
    volumeM3: 7.7e-3,
    xM: 18,
    yM: 17.5,
    zM: 2.7,
    notes: 'Ceiling battens along the imaging corridor, past MR 1.',
  },
  {
    key: 'ion-gauge',
    roomKey: 'vault',
    name: 'Cold-cathode ion gauge on the cyclotron vacuum tank',
    kind: 'ion_gauge',
    electronDensityPerM3: 1e14,
    electronEnergyEv: 50,
    energyKind: 'perpendicular',
    volumeM3: 2e-5,
    xM: 12.4,
    yM: 10,
    zM: 1.3,
    notes: 'Penning-type gauge.',
  },
  {
    key: 'ecr-plasma',
    roomKey: 'etch',
    name: '2.45 GHz ECR plasma-etch tool',
    kind: 'plasma_tool',
    electronDensityPerM3: 5e16,
    electronEnergyEv: 5,
    energyKind: 'perpendicular',
    volumeM3: 0.01,
    xM: 22,
    yM: 9,
    zM: 1,
    notes: 'Magnetron-driven at 2.45 GHz; resonance zone at 87.5 mT.',
  },
];

export interface InstrumentSpec {
  key: string;
  kind: 'gaussmeter' | 'analyser' | 'antenna';
  model: string;
  serial: string;
  probe: string | null;
  calibratedOn: string;
  calibrationDueOn: string;
  relativeUncertainty: number | null;
  notes: string | null;
}

export const HARROWBY_INSTRUMENTS: InstrumentSpec[] = [
  {
    key: 'hall',
    kind: 'gaussmeter',
    model: 'Three-axis Hall gaussmeter (demo model TH-3)',
    serial: 'HB-G-0142',
    probe: '3-axis Hall',
    calibratedOn: '2026-03-02',
    calibrationDueOn: '2027-03-02',
    relativeUncertainty: 0.01,
    notes: null,
  },
  {
    key: 'fluxgate',
    kind: 'gaussmeter',
    model: 'Single-axis fluxgate magnetometer (demo model FX-1)',
    serial: 'HB-G-0077',
    probe: 'single-axis fluxgate, 2 mT range',
    calibratedOn: '2024-06-20',
    // Overdue in the demo: in calibration for the 2025 survey, due again mid-2026.
    calibrationDueOn: '2026-06-30',
    relativeUncertainty: 0.005,
    notes: 'Calibration overdue (demo).',
  },
  {
    key: 'analyser',
    kind: 'analyser',
    model: 'Handheld spectrum analyser 9 kHz–6 GHz (demo model SA-6)',
    serial: 'HB-A-0009',
    probe: null,
    calibratedOn: '2026-05-11',
    calibrationDueOn: '2027-05-11',
    relativeUncertainty: 1e-6,
    notes: null,
  },
  {
    key: 'log-periodic',
    kind: 'antenna',
    model: 'Log-periodic antenna 0.2–6 GHz (demo model LP-6)',
    serial: 'HB-N-0031',
    probe: null,
    calibratedOn: '2025-09-01',
    calibrationDueOn: '2028-09-01',
    relativeUncertainty: null,
    notes: 'Antenna-factor table to be uploaded (issue: site setup).',
  },
  {
    key: 'loop',
    kind: 'antenna',
    model: 'Active loop antenna 9 kHz–30 MHz (demo model AL-30)',
    serial: 'HB-N-0032',
    probe: null,
    calibratedOn: '2025-09-01',
    calibrationDueOn: '2028-09-01',
    relativeUncertainty: null,
    notes: null,
  },
];

/**
 * What each line asks of people, one sentence each (common practice, worded for the demo). The general
 * caution (thresholds differ by jurisdiction and implant; the site MR safety officer decides) is the
 * app's own and shows beside these, so it is not repeated here.
 */
const CAUTIONS = {
  equipment: 'Sensitive-equipment line: watches, cards, pumps and sensitive instruments may be disturbed beyond it; keep such equipment outside unless it has been cleared.',
  implants: 'Implant line: people with pacemakers or other active implants stay outside it unless the MR safety officer has cleared them.',
  projectile: 'Projectile line: ferromagnetic objects can be pulled toward the magnet beyond it; only MR-safe or MR-conditional equipment goes further.',
} as const;

export interface ZoneSetSpec {
  key: string;
  name: string;
  edition: string;
  isDefault: boolean;
  thresholds: ZoneThreshold[];
  notes: string;
}

export const HARROWBY_ZONE_SETS: ZoneSetSpec[] = [
  {
    key: 'iec-ed4',
    name: 'MR safety lines (IEC 60601-2-33 ed. 4)',
    edition: 'IEC 60601-2-33:2022 (ed. 4)',
    isDefault: true,
    thresholds: [
      { name: 'Sensitive equipment disturbed (common practice)', fieldT: 1e-4, caution: CAUTIONS.equipment },
      { name: 'B0 hazard boundary: people with implants stay outside', fieldT: 9e-4, caution: CAUTIONS.implants },
      { name: 'Projectile risk (common practice; 2013/35/EU action level)', fieldT: 3e-3, caution: CAUTIONS.projectile },
    ],
    notes: 'Edition 4 (2022) moved the B0 hazard boundary to 0.9 mT (REFERENCES.md). 3 mT from 2013/35/EU Annex II, recalled.',
  },
  {
    key: 'iec-ed3',
    name: 'MR safety lines (IEC 60601-2-33 to 2015)',
    edition: 'IEC 60601-2-33, editions up to 2015',
    isDefault: false,
    thresholds: [
      { name: 'Sensitive equipment disturbed (common practice)', fieldT: 1e-4, caution: CAUTIONS.equipment },
      { name: 'Controlled-access boundary: people with implants stay outside', fieldT: 5e-4, caution: CAUTIONS.implants },
      { name: 'Projectile risk (common practice; 2013/35/EU action level)', fieldT: 3e-3, caution: CAUTIONS.projectile },
    ],
    notes: 'Editions up to 2015 bound the controlled-access area at 0.5 mT (REFERENCES.md).',
  },
];

export interface WatchBandSpec {
  key: string;
  name: string;
  lowerHz: number;
  upperHz: number;
  reason: string;
  source: string;
  severity: 'low' | 'medium' | 'high' | 'critical';
  /** Band of one site (the MR scanner's receive band) rather than the whole organisation. */
  siteScoped?: boolean;
}

/** A few bands for the demo organisation; the full starter set belongs to the EMC issue. */
export const HARROWBY_WATCH_BANDS: WatchBandSpec[] = [
  {
    key: 'ra-hi',
    name: 'Radio astronomy — H I line',
    lowerHz: 1400e6,
    upperHz: 1427e6,
    reason: 'Roof teaching dish; all emissions prohibited in this band',
    source: 'ITU Radio Regulations (2020), Article 5, RR 5.340',
    severity: 'critical',
  },
  {
    key: 'ism-2g4',
    name: 'ISM 2.4 GHz',
    lowerHz: 2400e6,
    upperHz: 2500e6,
    reason: 'Wi-Fi and the campus telemetry network',
    source: 'ITU Radio Regulations (2020), RR 5.150',
    severity: 'medium',
  },
  {
    key: 'ism-13m56',
    name: 'ISM 13.56 MHz',
    lowerHz: 13.553e6,
    upperHz: 13.567e6,
    reason: 'RFID door readers in the imaging wing',
    source: 'ITU Radio Regulations (2020), RR 5.150; 47 CFR §18.301',
    severity: 'low',
  },
  {
    key: 'gps-l1',
    name: 'GPS L1',
    lowerHz: 1575.42e6 - 1.023e6,
    upperHz: 1575.42e6 + 1.023e6,
    reason: 'Timing receiver for the radiopharmacy dispatch clock',
    source: 'IS-GPS-200 (carrier 1575.42 MHz); ±1.023 MHz main-lobe width recalled from memory',
    severity: 'high',
  },
  {
    key: 'aviation-vhf',
    name: 'VHF aviation',
    lowerHz: 108e6,
    upperHz: 137e6,
    reason: 'Helipad radio on the roof',
    source: 'ICAO Annex 10 (radionavigation 108–117.975 MHz, communications 117.975–137 MHz)',
    severity: 'high',
  },
  {
    key: 'mics',
    name: 'Medical implant communications (MICS)',
    lowerHz: 402e6,
    upperHz: 405e6,
    reason: 'Implant programmers in cardiology',
    source: 'FCC MedRadio, 47 CFR §95',
    severity: 'high',
  },
];

/** Half-width of the demo MR receive band around the proton precession frequency, Hz (invented). */
export const MR_RECEIVE_HALF_WIDTH_HZ = 0.5e6;

export const KESTREL_SITE = {
  key: 'test-hall',
  name: 'Kestrel Point magnet test hall',
  address: 'Kestrel Point (invented address)',
  notes: 'Second demo organisation, to show that organisations never see each other. Made up.',
};

export const KESTREL_LEVELS: LevelSpec[] = [
  {
    key: 'hall',
    name: 'Test hall floor',
    ordinal: 0,
    elevationM: 0,
    rooms: [
      room('bay1', 'Magnet test bay 1', 'superconducting magnet test bay', 'low', rect(6, 6, 26, 22)),
      room('hall-office', 'Hall office', 'office', 'high', rect(26, 6, 36, 14)),
    ],
  },
];

export const KESTREL_SOURCES: SourceSpec[] = [
  {
    key: 'solenoid',
    name: 'Superconducting test solenoid (5 T)',
    planLabel: 'Test solenoid (5 T)',
    kind: 'test_magnet',
    shielding: 'unshielded',
    levelKey: 'hall',
    xM: 16,
    yM: 14,
    zM: 1.5,
    nominalFieldT: 5,
    dipoleMomentAM2: 2e5,
    axis: [0, 0, 1],
    installedOn: '2024-02-01',
    notes: 'Invented demo magnet.',
  },
];
