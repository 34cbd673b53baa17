/**
 * The device store (Dexie over IndexedDB): the truth on the device. What a surveyor needs with no
 * network (a survey taken offline and everything on its site), what they capture (walks, stations,
 * readings, sweeps, their photos and traces), and the outbox the sync pushes. Every captured write goes
 * with its outbox entry in one transaction (src/features/capture/data/write-synced.ts).
 */
import Dexie, { type Table } from 'dexie';
import { declareVersions } from './schema';
import type {
  AttachmentRow,
  DecisionRow,
  DraftRow,
  EmitterRow,
  FieldReadingRow,
  InstrumentRow,
  LevelRow,
  MetaRow,
  OutboxRow,
  PlanImageRow,
  PlanRow,
  RemoteFileRow,
  RoomRow,
  SiteRow,
  SourceRow,
  StationRow,
  SurveyRow,
  SweepRow,
  SyncConflictRow,
  SyncStateRow,
  WalkRow,
  WatchBandRow,
  ZoneSetRow,
} from './types';

export const DB_NAME = 'fringewalk';

export class FringewalkDb extends Dexie {
  surveys!: Table<SurveyRow, string>;
  sites!: Table<SiteRow, string>;
  levels!: Table<LevelRow, string>;
  plans!: Table<PlanRow, string>;
  planImages!: Table<PlanImageRow, string>;
  rooms!: Table<RoomRow, string>;
  sources!: Table<SourceRow, string>;
  emitters!: Table<EmitterRow, string>;
  instruments!: Table<InstrumentRow, string>;
  watchBands!: Table<WatchBandRow, string>;
  zoneSets!: Table<ZoneSetRow, string>;
  walks!: Table<WalkRow, string>;
  stations!: Table<StationRow, string>;
  fieldReadings!: Table<FieldReadingRow, string>;
  sweeps!: Table<SweepRow, string>;
  attachments!: Table<AttachmentRow, string>;
  decisions!: Table<DecisionRow, string>;
  outbox!: Table<OutboxRow, number>;
  syncState!: Table<SyncStateRow, string>;
  drafts!: Table<DraftRow, string>;
  meta!: Table<MetaRow, string>;
  syncConflicts!: Table<SyncConflictRow, [string, string]>;
  remoteFiles!: Table<RemoteFileRow, [string, string]>;

  constructor(name: string = DB_NAME) {
    super(name);
    declareVersions(this);
  }
}

/** The app's one store. Tests reset it with `db.delete()` + `db.open()`, or open a second instance to simulate a reload. */
export const db = new FringewalkDb();
