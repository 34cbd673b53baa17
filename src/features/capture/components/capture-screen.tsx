/**
 * The capture screen of one survey taken offline: plan on top, the station and the form below (side by
 * side on wide screens). Everything it reads and writes is on the device (Dexie live queries from
 * ../data), so it works the same with the network off.
 */
import { memo, useCallback, useEffect, useMemo, useRef, useState } from 'react';
import { useLiveQuery } from 'dexie-react-hooks';
import { v7 as uuidv7 } from 'uuid';
import { roomForPoint } from '@shared/plans/polygon';
import { readingFieldTesla, type FieldReading, type Sweep } from '@shared/schemas/capture';
import { Alert } from '@/components/alert';
import type { DecisionRow } from '@/db';
import { showToast } from '@/lib/toast';
import {
  deleteFieldReading,
  deleteSweep,
  getDeviceId,
  isCaptureError,
  resizePhoto,
  saveFieldReadingWith,
  saveSweepWith,
  setLastFieldUnit,
  startWalk,
  findOpenWalk,
  getDraft,
  useLastFieldUnit,
  usePendingCounts,
  usePlanImageUrl,
  useRemeasureRequests,
  useStations,
  useWalkEntries,
  newestFirst,
  walkEntryId,
  pendingSummary,
  CaptureValidationError,
  type OfflineSurvey,
  type StationInput,
  type WalkEntry,
} from '../data';
import { isCalibrationOverdue, localDate } from '../lib/calibration';
import { fieldDomainFor } from '@/lib/colour-scale';
import type { FeedbackSettings } from '../lib/feedback';
import { emptyReadingForm, readingToForm, type FieldUnit, type ParsedReading, type ReadingFormValues } from '../lib/reading-form';
import { emptySweepForm, sweepToForm, type ParsedSweep, type SweepFormValues } from '../lib/sweep-form';
import { FieldLegend } from './field-legend';
import { SelectField } from './form-controls';
import { LevelSwitcher } from './level-switcher';
import { PlanView } from './plan-view';
import { FormSubmitError, ReadingForm } from './reading-form';
import { StationPanel, type StationTarget } from './station-panel';
import { SweepForm } from './sweep-form';
import { useDebouncedDraft } from './use-debounced-draft';
import { useStableCallback } from './use-stable-callback';
import { WalkList } from './walk-list';

interface PickerStation {
  id: string;
  label: string | null;
  roomId: string | null;
}

const samePickerStations = (a: readonly PickerStation[], b: readonly PickerStation[]) =>
  a === b || (a.length === b.length && a.every((s, i) => s.id === b[i]?.id && s.label === b[i]?.label && s.roomId === b[i]?.roomId));

/** The station list under the plan; re-rendered when its stations' names change, not when a save re-colours one. */
const StationPicker = memo(
  function StationPicker(props: {
    stations: readonly PickerStation[];
    wholeLevel: boolean;
    selectedId: string;
    remeasureIds: ReadonlySet<string>;
    roomName: (id: string | null) => string | null;
    onChoose: (id: string) => void;
  }) {
    const { stations, wholeLevel, selectedId, remeasureIds, roomName, onChoose } = props;
    return (
      <SelectField label={wholeLevel ? 'Or choose a station on this level' : 'Or choose a station of this walk or a re-measure request'} value={selectedId} onChange={(e) => onChoose(e.target.value)}>
        <option value="">—</option>
        {stations.map((s) => (
          <option key={s.id} value={s.id}>
            {s.label ?? 'Station'}
            {s.roomId ? ` · ${roomName(s.roomId)}` : ''}
            {remeasureIds.has(s.id) ? ' · re-measure requested' : ''}
          </option>
        ))}
      </SelectField>
    );
  },
  (a, b) =>
    a.wholeLevel === b.wholeLevel && a.selectedId === b.selectedId && a.remeasureIds === b.remeasureIds && a.roomName === b.roomName && a.onChoose === b.onChoose && samePickerStations(a.stations, b.stations),
);

type Tab = 'reading' | 'sweep' | 'walk';
type Target = { kind: 'existing'; stationId: string } | { kind: 'new'; levelId: string; xM: number; yM: number } | null;
type Editing = { kind: 'reading'; reading: FieldReading } | { kind: 'sweep'; sweep: Sweep } | null;

/** What survives a reload: the level, the station chosen, the tab, both half-filled forms and what is being edited. */
export interface CaptureDraft {
  levelId: string | null;
  target: Target;
  tab: Tab;
  reading: ReadingFormValues | null;
  sweep: SweepFormValues | null;
  editing: Editing;
}

export interface CaptureScreenProps {
  offline: OfflineSurvey;
  userId: string;
}

const NO_DECISIONS: readonly DecisionRow[] = [];

/** Entries the walk list shows before 'Show the whole walk'. */
export const WALK_LIST_LIMIT = 100;
/** Stations listed in the picker before it narrows to this walk's and the re-measure requests. */
export const PICKER_MAX_STATIONS = 300;

export function draftKey(surveyId: string) {
  return `capture:${surveyId}`;
}

function toFormError(error: unknown): FormSubmitError {
  if (error instanceof CaptureValidationError) return new FormSubmitError('Some values were refused by the device store; see the marked boxes.', error.fieldErrors);
  if (isCaptureError(error)) return new FormSubmitError(error.message);
  return new FormSubmitError(error instanceof Error ? error.message : 'Could not save.');
}

export function CaptureScreen({ offline, userId }: CaptureScreenProps) {
  // The draft is read once, when the screen opens: it seeds the forms, and the screen itself writes every
  // later version. (A live query here would re-render the whole workspace after every draft write.)
  const [draftEntry, setDraftEntry] = useState<{ value: CaptureDraft } | null | undefined>(undefined);
  const surveyDraftKey = draftKey(offline.survey.id);
  useEffect(() => {
    let live = true;
    getDraft<CaptureDraft>(surveyDraftKey).then(
      (value) => live && setDraftEntry(value === undefined ? null : { value }),
      () => live && setDraftEntry(null),
    );
    return () => {
      live = false;
    };
  }, [surveyDraftKey]);
  const lastUnit = useLastFieldUnit();
  // The device id is made on first use with a write; do that here, outside the live queries that read it
  // (Dexie refuses a read-write transaction inside a live query).
  const [deviceId, setDeviceId] = useState<string | null>(null);
  const [deviceError, setDeviceError] = useState<string | null>(null);
  useEffect(() => {
    let live = true;
    getDeviceId().then(
      (id) => live && setDeviceId(id),
      (error: unknown) => live && setDeviceError(error instanceof Error ? error.message : 'This device cannot store data.'),
    );
    return () => {
      live = false;
    };
  }, []);
  if (deviceError) {
    return (
      <Alert tone="danger" title="This device cannot store readings">
        {deviceError}
      </Alert>
    );
  }
  if (!deviceId || draftEntry === undefined || lastUnit === undefined) return <p role="status">Opening the survey on this device…</p>;
  return <CaptureWorkspace offline={offline} userId={userId} deviceId={deviceId} draft={draftEntry?.value ?? null} lastUnit={lastUnit} />;
}

function CaptureWorkspace({ offline, userId, deviceId, draft, lastUnit }: CaptureScreenProps & { deviceId: string; draft: CaptureDraft | null; lastUnit: FieldUnit }) {
  const { survey } = offline;
  const surveyId = survey.id;
  const orgId = survey.organisationId;
  const levelsWithPlan = offline.levels;
  const [levelId, setLevelId] = useState<string | null>(() => (draft?.levelId && offline.levels.some((l) => l.id === draft.levelId) ? draft.levelId : (levelsWithPlan[0]?.id ?? null)));
  const [target, setTarget] = useState<Target>(draft?.target ?? null);
  const [tab, setTab] = useState<Tab>(draft?.tab ?? 'reading');
  const [editing, setEditing] = useState<Editing>(draft?.editing ?? null);
  const [formKey, setFormKey] = useState(0);
  const gaussmeters = useMemo(() => offline.instruments.filter((i) => i.kind === 'gaussmeter' && !i.archived), [offline.instruments]);
  const analysers = useMemo(() => offline.instruments.filter((i) => i.kind === 'analyser' && !i.archived), [offline.instruments]);
  const antennas = useMemo(() => offline.instruments.filter((i) => i.kind === 'antenna' && !i.archived), [offline.instruments]);
  // Offer an instrument that is in calibration today first; the surveyor can still pick another.
  const defaultGaussmeterId = (gaussmeters.find((i) => !isCalibrationOverdue(i.calibrationDueOn, new Date())) ?? gaussmeters[0])?.id ?? '';
  const [readingInitial, setReadingInitial] = useState<ReadingFormValues>(() => draft?.reading ?? emptyReadingForm(lastUnit, defaultGaussmeterId));
  const [sweepInitial, setSweepInitial] = useState<SweepFormValues>(() => draft?.sweep ?? emptySweepForm(analysers[0]?.id ?? '', antennas[0]?.id ?? ''));

  const plan = offline.plans.find((p) => p.levelId === levelId);
  const imageUrl = usePlanImageUrl(plan?.id);
  // Not useCurrentWalk: it asks for the device id inside its live query, and getDeviceId opens a read-write
  // transaction, which Dexie refuses there. The id is known here, so the open walk is a plain read.
  const walk = useLiveQuery(() => findOpenWalk(surveyId, deviceId), [surveyId, deviceId]);
  // The walk list shows the newest WALK_LIST_LIMIT entries until asked for all: a long day stays quick
  // to update after every save on a phone.
  const [showAllEntries, setShowAllEntries] = useState(false);
  const stations = useStations(surveyId, levelId);
  const viewEntries = useWalkEntries(walk?.id, showAllEntries ? {} : { limit: WALK_LIST_LIMIT + 1 });
  // What this screen saved since the store's last answer: committed records, shown at once instead of
  // after the live query's next read. Any answer that arrives after a commit includes that commit (a
  // read overlapping a write is read again), so the first new answer replaces these.
  const [committed, setCommitted] = useState<{ base: readonly WalkEntry[] | undefined; entries: WalkEntry[] } | null>(null);
  const entries = useMemo(() => {
    if (!committed || committed.base !== viewEntries) return viewEntries;
    const ids = new Set(committed.entries.map(walkEntryId));
    return [...committed.entries, ...(viewEntries ?? []).filter((e) => !ids.has(walkEntryId(e)))].sort(newestFirst);
  }, [committed, viewEntries]);
  const showCommitted = (entry: WalkEntry) =>
    setCommitted((c) => ({ base: viewEntries, entries: [...(c && c.base === viewEntries ? c.entries.filter((e) => walkEntryId(e) !== walkEntryId(entry)) : []), entry] }));
  const entriesLimited = !showAllEntries && (entries?.length ?? 0) > WALK_LIST_LIMIT;
  const shownEntries = useMemo(() => (entriesLimited ? entries?.slice(0, WALK_LIST_LIMIT) : entries), [entries, entriesLimited]);
  const remeasure = useRemeasureRequests(surveyId);
  const pending = usePendingCounts(surveyId);
  const remeasureIds = useMemo(() => new Set(remeasure?.keys() ?? []), [remeasure]);
  const levelRooms = useMemo(() => offline.rooms.filter((r) => r.levelId === levelId), [offline.rooms, levelId]);
  const domain = useMemo(() => fieldDomainFor((stations ?? []).map((s) => s.latestFieldT)), [stations]);
  const feedbackSettings: FeedbackSettings = useMemo(
    () => ({ species: survey.species, maxHarmonic: survey.maxHarmonic, zoneSet: offline.zoneSet, watchBands: offline.watchBands }),
    [survey.species, survey.maxHarmonic, offline.zoneSet, offline.watchBands],
  );

  // The draft: everything on screen that is not saved yet, written after a pause and when the page hides.
  const { schedule } = useDebouncedDraft(draftKey(surveyId));
  const current = useRef<CaptureDraft>({ levelId, target, tab, reading: readingInitial, sweep: sweepInitial, editing });
  const writeDraft = useCallback((patch: Partial<CaptureDraft>) => {
    current.current = { ...current.current, ...patch };
    schedule(current.current);
  }, [schedule]);
  const chooseLevel = (id: string) => {
    setLevelId(id);
    writeDraft({ levelId: id });
  };
  const chooseTarget = (t: Target) => {
    setTarget(t);
    writeDraft({ target: t });
  };
  const chooseTab = (t: Tab) => {
    setTab(t);
    writeDraft({ tab: t });
  };

  const stationById = useMemo(() => new Map((stations ?? []).map((s) => [s.id, s])), [stations]);
  const roomName = useCallback((id: string | null) => offline.rooms.find((r) => r.id === id)?.name ?? null, [offline.rooms]);
  const chosen = target?.kind === 'existing' ? stationById.get(target.stationId) : undefined;
  const stationTarget: StationTarget | null = useMemo(() => {
    if (!target) return null;
    if (target.kind === 'new') return { kind: 'new', xM: target.xM, yM: target.yM, roomName: roomForPoint(levelRooms, target.xM, target.yM)?.name ?? null };
    if (!chosen) return null;
    return { kind: 'existing', stationId: chosen.id, label: chosen.label ?? 'Station', roomName: roomName(chosen.roomId), latestFieldT: chosen.latestFieldT };
  }, [target, chosen?.id, chosen?.label, chosen?.roomId, chosen?.latestFieldT, levelRooms, roomName]); // eslint-disable-line react-hooks/exhaustive-deps -- the fields shown, not the row object
  const stationRemeasure = useMemo(() => (target?.kind === 'existing' ? (remeasure?.get(target.stationId) ?? NO_DECISIONS) : NO_DECISIONS), [target, remeasure]);
  // A picked station on another level is not on screen: treat it as not chosen until its level is shown.
  const stationReady = stationTarget !== null;

  const walkPath = useMemo(() => {
    const path: Array<readonly [number, number]> = [];
    let last: string | null = null;
    for (const e of [...(entries ?? [])].reverse()) {
      const id = e.kind === 'reading' ? e.reading.stationId : e.sweep.stationId;
      const s = stationById.get(id);
      if (!s || id === last) continue;
      path.push([s.xM, s.yM]);
      last = id;
    }
    return path;
  }, [entries, stationById]);

  const ensureWalk = async () => walk ?? (await startWalk({ surveyId, orgId, userId }));

  /**
   * The station a save goes to: the one picked, or a new one to create with the record (in its
   * transaction, so a refused save leaves no station behind).
   */
  const stationFor = (walkId: string, heightM: number): { stationId: string; newStation?: StationInput } => {
    if (!target) throw new FormSubmitError('Choose a station first.');
    if (target.kind === 'existing') return { stationId: target.stationId };
    const room = roomForPoint(levelRooms, target.xM, target.yM);
    const newStation: StationInput = {
      id: uuidv7(),
      organisationId: orgId,
      surveyId,
      levelId: target.levelId,
      walkId,
      roomId: room?.id ?? null,
      label: `S${(stations?.length ?? 0) + 1}`,
      xM: target.xM,
      yM: target.yM,
      heightM,
      createdByUserId: userId,
      notes: null,
    };
    return { stationId: newStation.id as string, newStation };
  };
  const placed = (station: { id: string } | null) => {
    if (station) chooseTarget({ kind: 'existing', stationId: station.id });
  };

  const saveReading = useStableCallback(async (parsed: ParsedReading, photo: File | null) => {
    // Marks for tests/bench/capture.bench.ts: where the time of a save goes (store vs. screen).
    performance.mark('capture:save-start');
    try {
      const w = await ensureWalk();
      const photoBlob = photo ? await resizePhoto(photo) : undefined;
      const original = editing?.kind === 'reading' ? editing.reading : null;
      const { stationId, newStation } = original ? { stationId: original.stationId, newStation: undefined } : stationFor(w.id, parsed.heightM);
      const saved = await saveFieldReadingWith(
        {
          ...(original ? { id: original.id } : {}),
          organisationId: orgId,
          surveyId,
          stationId,
          walkId: original?.walkId ?? w.id,
          instrumentId: parsed.instrumentId,
          surveyorUserId: original?.surveyorUserId ?? userId,
          magnitudeT: parsed.magnitudeT,
          bxT: parsed.bxT,
          byT: parsed.byT,
          bzT: parsed.bzT,
          unit: parsed.unit,
          probeOrientation: parsed.probeOrientation,
          heightM: parsed.heightM,
          backgroundT: parsed.backgroundT,
          zeroed: parsed.zeroed,
          measuredAt: original?.measuredAt ?? new Date().toISOString(),
          notes: parsed.notes,
          photoObjectKey: photoBlob ? null : (original?.photoObjectKey ?? null),
          photoSha256: photoBlob ? null : (original?.photoSha256 ?? null),
        },
        { ...(photoBlob ? { photo: photoBlob } : {}), ...(newStation ? { newStation } : {}) },
      );
      placed(saved.station);
      showCommitted({ kind: 'reading', reading: { ...saved.reading, fieldT: readingFieldTesla(saved.reading) } });
    } catch (error) {
      throw toFormError(error);
    }
    performance.mark('capture:save-stored');
    const next = { ...emptyReadingForm(parsed.unit, parsed.instrumentId ?? ''), probeOrientation: parsed.probeOrientation, height: String(parsed.heightM) };
    if (editing) {
      setEditing(null);
      setReadingInitial(next);
      setFormKey((k) => k + 1);
    }
    writeDraft({ reading: next, editing: null });
    showToast({ tone: 'ok', message: editing ? 'Reading corrected on this device.' : 'Reading saved on this device.' });
  });

  const saveSweepRecord = useStableCallback(async (parsed: ParsedSweep, trace: File | null) => {
    try {
      const w = await ensureWalk();
      const original = editing?.kind === 'sweep' ? editing.sweep : null;
      const { stationId, newStation } = original ? { stationId: original.stationId, newStation: undefined } : stationFor(w.id, 1);
      const saved = await saveSweepWith(
        {
          ...(original ? { id: original.id } : {}),
          organisationId: orgId,
          surveyId,
          stationId,
          walkId: original?.walkId ?? w.id,
          analyserId: parsed.analyserId,
          antennaId: parsed.antennaId,
          surveyorUserId: original?.surveyorUserId ?? userId,
          measuredAt: original?.measuredAt ?? new Date().toISOString(),
          startHz: parsed.startHz,
          stopHz: parsed.stopHz,
          rbwHz: parsed.rbwHz,
          vbwHz: original?.vbwHz ?? null,
          referenceLevelDbm: parsed.referenceLevelDbm,
          attenuationDb: original?.attenuationDb ?? null,
          detector: parsed.detector,
          peaks: parsed.peaks,
          traceObjectKey: trace ? null : (original?.traceObjectKey ?? null),
          traceSha256: trace ? null : (original?.traceSha256 ?? null),
          heightM: original?.heightM ?? null,
          notes: parsed.notes,
        },
        { ...(trace ? { trace } : {}), ...(newStation ? { newStation } : {}) },
      );
      placed(saved.station);
      showCommitted({ kind: 'sweep', sweep: saved.sweep });
    } catch (error) {
      throw toFormError(error);
    }
    const next = emptySweepForm(parsed.analyserId ?? '', parsed.antennaId ?? '');
    if (editing) {
      setEditing(null);
      setSweepInitial(next);
      setFormKey((k) => k + 1);
    }
    writeDraft({ sweep: next, editing: null });
    showToast({ tone: 'ok', message: editing ? 'Sweep corrected on this device.' : 'Sweep saved on this device.' });
  });

  const startEdit = useStableCallback((entry: WalkEntry) => {
    const stationId = entry.kind === 'reading' ? entry.reading.stationId : entry.sweep.stationId;
    const ed: Editing = entry.kind === 'reading' ? { kind: 'reading', reading: entry.reading } : { kind: 'sweep', sweep: entry.sweep };
    setEditing(ed);
    chooseTarget({ kind: 'existing', stationId });
    if (entry.kind === 'reading') {
      const values = readingToForm(entry.reading);
      setReadingInitial(values);
      writeDraft({ editing: ed, reading: values, tab: 'reading' });
      setTab('reading');
    } else {
      const values = sweepToForm(entry.sweep);
      setSweepInitial(values);
      writeDraft({ editing: ed, sweep: values, tab: 'sweep' });
      setTab('sweep');
    }
    setFormKey((k) => k + 1);
  });

  const cancelEdit = useStableCallback(() => {
    const reading = emptyReadingForm(lastUnit, defaultGaussmeterId);
    const sweep = emptySweepForm(analysers[0]?.id ?? '', antennas[0]?.id ?? '');
    setEditing(null);
    setReadingInitial(reading);
    setSweepInitial(sweep);
    writeDraft({ editing: null, reading, sweep });
    setFormKey((k) => k + 1);
  });

  const remove = useStableCallback(async (entry: WalkEntry) => {
    try {
      if (entry.kind === 'reading') await deleteFieldReading(entry.reading.id);
      else await deleteSweep(entry.sweep.id);
      showToast({ tone: 'ok', message: 'Deleted on this device; the deletion syncs with the rest.' });
    } catch (error) {
      showToast({ tone: 'danger', message: error instanceof Error ? error.message : 'Could not delete.' });
    }
  });
  const onShowAll = useStableCallback(() => setShowAllEntries(true));
  const onClearTarget = useStableCallback(() => chooseTarget(null));
  const onChooseLevel = useStableCallback((id: string) => chooseLevel(id));
  const onChooseStation = useStableCallback((id: string) => chooseTarget(id ? { kind: 'existing', stationId: id } : null));
  const onPick = useStableCallback((id: string) => chooseTarget({ kind: 'existing', stationId: id }));
  const onPlace = useStableCallback((p: { xM: number; yM: number }) => {
    if (levelId) chooseTarget({ kind: 'new', levelId, xM: p.xM, yM: p.yM });
  });
  const onReadingValues = useStableCallback((values: ReadingFormValues) => writeDraft({ reading: values }));
  const onSweepValues = useStableCallback((values: SweepFormValues) => writeDraft({ sweep: values }));
  const onUnitChange = useStableCallback((unit: FieldUnit) => void setLastFieldUnit(unit).catch(() => undefined));
  const stationLabel = useStableCallback((id: string) => stationById.get(id)?.label ?? 'Station on another level');

  // A new reading is dated today (the calibration check is per calendar day); an edit keeps its own date.
  const today = localDate(new Date());
  const editedAt = editing ? (editing.kind === 'reading' ? editing.reading.measuredAt : editing.sweep.measuredAt) : null;
  const measuredAt = useMemo(() => (editedAt ? new Date(editedAt) : new Date()), [editedAt, today]); // eslint-disable-line react-hooks/exhaustive-deps
  const level = offline.levels.find((l) => l.id === levelId);
  const planStations = useMemo(() => stations ?? [], [stations]);
  const summary = pending ? pendingSummary(pending) : null;
  // A list of thousands is no use on a phone: past PICKER_MAX_STATIONS the picker offers this walk's
  // stations, re-measure requests and the one chosen; the plan reaches every other.
  const pickerStations = useMemo(() => {
    if (planStations.length <= PICKER_MAX_STATIONS) return planStations;
    const inWalk = new Set((entries ?? []).map((e) => (e.kind === 'reading' ? e.reading.stationId : e.sweep.stationId)));
    const chosen = target?.kind === 'existing' ? target.stationId : null;
    return planStations.filter((s) => inWalk.has(s.id) || remeasureIds.has(s.id) || s.id === chosen);
  }, [planStations, entries, remeasureIds, target]);

  return (
    <div className="flex flex-col gap-4 lg:grid lg:grid-cols-[minmax(0,3fr)_minmax(0,2fr)] lg:items-start">
      <div className="flex flex-col gap-2 lg:sticky lg:top-2">
        <div className="flex flex-wrap items-baseline justify-between gap-2">
          <h1 className="text-2xl font-bold">{survey.name}</h1>
          <p className="text-sm text-fg-muted" data-testid="capture-pending">
            {summary ?? 'Everything here is synced'}
          </p>
        </div>
        <LevelSwitcher levels={offline.levels} activeId={levelId} onChoose={onChooseLevel} />
        {plan ? (
          <PlanView
            key={plan.id}
            className="h-[44dvh] min-h-64 lg:h-[62dvh]"
            plan={plan}
            imageUrl={imageUrl}
            stations={stations}
            rooms={levelRooms}
            domain={domain}
            selectedStationId={target?.kind === 'existing' ? target.stationId : null}
            pendingPoint={target?.kind === 'new' && target.levelId === levelId ? target : null}
            walkPath={walkPath}
            remeasureStationIds={remeasureIds}
            onPick={onPick}
            onPlace={onPlace}
          />
        ) : (
          <Alert tone="warning" title="No plan for this level">
            {level?.name ?? 'This level'} has no plan on this device. Choose another level, or take the survey offline again once a plan is uploaded.
          </Alert>
        )}
        <FieldLegend domain={domain} unit={readingInitial.unit} />
      </div>

      <div className="flex flex-col gap-3">
        <StationPanel target={stationTarget} unit={readingInitial.unit} remeasure={stationRemeasure} onClear={onClearTarget} />
        {pickerStations.length > 0 && (
          <StationPicker
            stations={pickerStations}
            wholeLevel={pickerStations.length === planStations.length}
            selectedId={target?.kind === 'existing' ? target.stationId : ''}
            remeasureIds={remeasureIds}
            roomName={roomName}
            onChoose={onChooseStation}
          />
        )}
        <div role="tablist" aria-label="Capture" className="grid grid-cols-3 gap-2">
          {(
            [
              ['reading', 'Field reading'],
              ['sweep', 'Sweep'],
              ['walk', `Walk (${entriesLimited ? `${WALK_LIST_LIMIT}+` : (entries?.length ?? 0)})`],
            ] as const
          ).map(([id, label]) => (
            <button
              key={id}
              type="button"
              role="tab"
              aria-selected={tab === id}
              onClick={() => chooseTab(id)}
              className={`min-h-touch rounded-lg border-2 px-2 font-bold ${tab === id ? 'border-accent bg-accent text-accent-fg' : 'border-field-border bg-surface text-fg'}`}
            >
              {label}
            </button>
          ))}
        </div>
        {editing && (
          <Alert tone="info" title={`Editing a ${editing.kind === 'reading' ? 'reading' : 'sweep'} from ${new Date(measuredAt).toLocaleString()}`}>
            Saving makes a new revision; the old one stays on record.
          </Alert>
        )}
        <div role="tabpanel" className="rounded-lg border-2 border-border bg-surface p-3" hidden={tab !== 'reading'}>
          <ReadingForm
            key={`reading-${formKey}`}
            instruments={gaussmeters}
            initialValues={readingInitial}
            measuredAt={measuredAt}
            feedbackSettings={feedbackSettings}
            watchBands={offline.watchBands}
            editing={editing?.kind === 'reading'}
            stationReady={stationReady}
            onValuesChange={onReadingValues}
            onUnitChange={onUnitChange}
            onSubmit={saveReading}
            onCancel={editing?.kind === 'reading' ? cancelEdit : undefined}
          />
        </div>
        <div role="tabpanel" className="rounded-lg border-2 border-border bg-surface p-3" hidden={tab !== 'sweep'}>
          <SweepForm
            key={`sweep-${formKey}`}
            analysers={analysers}
            antennas={antennas}
            initialValues={sweepInitial}
            measuredAt={measuredAt}
            editing={editing?.kind === 'sweep'}
            stationReady={stationReady}
            onValuesChange={onSweepValues}
            onSubmit={saveSweepRecord}
            onCancel={editing?.kind === 'sweep' ? cancelEdit : undefined}
          />
        </div>
        <div role="tabpanel" hidden={tab !== 'walk'}>
          <WalkList
            entries={shownEntries}
            limited={entriesLimited}
            onShowAll={onShowAll}
            stationLabel={stationLabel}
            remeasureStationIds={remeasureIds}
            onEdit={startEdit}
            onDelete={remove}
          />
        </div>
      </div>
    </div>
  );
}
