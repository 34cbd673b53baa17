import { zodResolver } from '@hookform/resolvers/zod';
import { useCallback, useState } from 'react';
import { useForm } from 'react-hook-form';
import { Polygon, Tooltip } from 'react-leaflet';
import { z } from 'zod';
import { pixelToPlanM, planMToPixel, type PlanCalibration } from '@shared/plans/calibration';
import type { Plan } from '@shared/schemas/plan';
import { RoomCreateSchema, type Room } from '@shared/schemas/room';
import { ROOM_SENSITIVITIES } from '@shared/schemas/vocabulary';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { Field } from '@/components/field';
import { useCreateRoom } from '../data/create-room';
import { useDeleteRoom } from '../data/delete-room';
import { useRooms } from '../data/list-rooms';
import { useUpdateRoom } from '../data/update-room';
import { pixelToLatLng, type PixelPoint } from '../plan-geometry';
import { ConfirmButton } from '@/components/confirm-button';
import { emptyToNull, reportFormError } from './form-errors';
import { SENSITIVITY_LABELS } from './labels';
import { PlanMap } from './plan-map';
import { QueryState } from './query-state';
import { RoomDrawTool, RoomEditTool } from './room-draw-tools';
import { SelectField } from '@/components/select-field';
import { EmptyState } from '@/components/empty-state';

const SENSITIVITY_COLOURS: Record<Room['sensitivity'], string> = { none: '#4a5451', low: '#1c716b', medium: '#a15726', high: '#a3261b' };

/** The room's name, use and sensitivity: the shared schema without the outline, which comes from the map. */
const RoomDetailsSchema = RoomCreateSchema.omit({ polygonM: true });

type Editing = { kind: 'new'; outline: PixelPoint[] | null } | { kind: 'edit'; room: Room; outline: PixelPoint[] };

function toMetres(outline: PixelPoint[], calibration: PlanCalibration): [number, number][] {
  return outline.map((p) => {
    const m = pixelToPlanM(p, calibration);
    return [m.xM, m.yM];
  });
}

function RoomDetailsForm({ room, busy, outlineReady, onSubmit, onCancel }: {
  room?: Room;
  busy: boolean;
  outlineReady: boolean;
  onSubmit: (values: z.output<typeof RoomDetailsSchema>, setError: (field: 'name' | 'use' | 'sensitivity' | 'polygonM', message: string) => void) => void;
  onCancel: () => void;
}) {
  const [outlineError, setOutlineError] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm({ resolver: zodResolver(RoomDetailsSchema), defaultValues: { name: room?.name ?? '', use: room?.use ?? '', sensitivity: room?.sensitivity ?? 'none' } });
  return (
    <form
      noValidate
      aria-label={room ? `Edit room ${room.name}` : 'New room'}
      className="grid grid-cols-1 gap-4 sm:grid-cols-3"
      onSubmit={handleSubmit((values) => {
        setOutlineError(null);
        onSubmit(values, (field, message) => (field === 'polygonM' ? setOutlineError(message) : setError(field, { type: 'server', message })));
      })}
    >
      <Field label="Room name" error={errors.name?.message} {...register('name')} />
      <Field label="Use (optional)" placeholder="MR scanner room" error={errors.use?.message} {...register('use', { setValueAs: emptyToNull })} />
      <SelectField
        label="Sensitivity"
        options={ROOM_SENSITIVITIES.map((s) => ({ value: s, label: SENSITIVITY_LABELS[s] }))}
        error={errors.sensitivity?.message}
        {...register('sensitivity')}
      />
      {(outlineError || !outlineReady) && (
        <p className={`text-sm font-bold sm:col-span-3 ${outlineError ? 'text-danger' : 'text-fg-muted'}`} role={outlineError ? 'alert' : undefined}>
          {outlineError ?? 'Draw the outline on the plan first: click each corner, then click the first corner again to close it.'}
        </p>
      )}
      <div className="flex flex-wrap gap-3 sm:col-span-3">
        <Button type="submit" busy={busy} busyLabel="Saving…" disabled={!outlineReady}>
          {room ? 'Save room' : 'Save room'}
        </Button>
        <Button variant="secondary" onClick={onCancel}>
          Cancel
        </Button>
      </div>
    </form>
  );
}

export function RoomsPanel({ organisationId, siteId, levelId, plan, imageUrl, canEdit }: {
  organisationId: string;
  siteId: string;
  levelId: string;
  plan: Plan;
  imageUrl: string;
  canEdit: boolean;
}) {
  const rooms = useRooms(organisationId, siteId, levelId);
  const create = useCreateRoom(organisationId, siteId, levelId);
  const update = useUpdateRoom(organisationId, siteId, levelId);
  const remove = useDeleteRoom(organisationId, siteId, levelId);
  const [editing, setEditing] = useState<Editing | null>(null);
  const onDrawn = useCallback((outline: PixelPoint[]) => setEditing({ kind: 'new', outline }), []);
  const onEdited = useCallback((outline: PixelPoint[]) => setEditing((current) => (current?.kind === 'edit' ? { ...current, outline } : current)), []);
  const calibration = plan.calibration;
  if (!calibration) {
    return (
      <Alert tone="info" title="Calibrate the plan first">
        Rooms are stored in metres, so the plan needs its scale and origin before you draw them. Open the “Calibrate” tab.
      </Alert>
    );
  }
  const list = rooms.data?.rooms ?? [];

  const submit = (values: z.output<typeof RoomDetailsSchema>, setFieldError: (field: 'name' | 'use' | 'sensitivity' | 'polygonM', message: string) => void) => {
    if (!editing?.outline) return;
    const polygonM = toMetres(editing.outline, calibration);
    const fields = ['name', 'use', 'sensitivity', 'polygonM'] as const;
    const setError = (field: string, { message }: { message?: string }) => setFieldError(field.startsWith('polygonM') ? 'polygonM' : (field as 'name'), message ?? '');
    const local = z.object({ polygonM: RoomCreateSchema.shape.polygonM }).safeParse({ polygonM });
    if (!local.success) {
      setFieldError('polygonM', local.error.issues[0]?.message ?? 'The outline is not valid.');
      return;
    }
    const onError = (error: unknown) => reportFormError(error, setError as never, fields);
    if (editing.kind === 'new') create.mutate({ ...values, polygonM }, { onSuccess: () => setEditing(null), onError });
    else update.mutate({ roomId: editing.room.id, body: { ...values, polygonM } }, { onSuccess: () => setEditing(null), onError });
  };

  return (
    <div className="flex flex-col gap-4">
      {canEdit && !editing && (
        <div>
          <Button onClick={() => setEditing({ kind: 'new', outline: null })}>Draw a room</Button>
        </div>
      )}
      <PlanMap
        imageUrl={imageUrl}
        widthPx={plan.widthPx}
        heightPx={plan.heightPx}
        label="Plan with rooms"
        metresPerPixel={calibration.metresPerPixel}
        picking={(editing?.kind === 'new' && !editing.outline) || editing?.kind === 'edit'}
        prompt={
          editing?.kind === 'new' && !editing.outline ? (
            <>
              <span className="font-bold">Drawing a room: </span>click each corner of the room on the plan; click the first corner again to close the outline.
            </>
          ) : editing?.kind === 'edit' ? (
            <>
              <span className="font-bold">Editing {editing.room.name}: </span>drag a corner to move it; drag a middle handle to add a corner.
            </>
          ) : undefined
        }
      >
        {list
          .filter((room) => editing?.kind !== 'edit' || editing.room.id !== room.id)
          .map((room) => (
            <Polygon
              key={room.id}
              positions={room.polygonM.map(([xM, yM]) => pixelToLatLng(planMToPixel({ xM, yM }, calibration)))}
              pathOptions={{ color: SENSITIVITY_COLOURS[room.sensitivity], weight: 2, fillOpacity: 0.12 }}
            >
              <Tooltip>{room.name}</Tooltip>
            </Polygon>
          ))}
        {editing?.kind === 'new' && editing.outline && (
          <Polygon positions={editing.outline.map(pixelToLatLng)} pathOptions={{ color: '#a15726', weight: 3, dashArray: '6 4' }} />
        )}
        {editing?.kind === 'new' && !editing.outline && <RoomDrawTool onDrawn={onDrawn} />}
        {editing?.kind === 'edit' && <RoomEditTool key={editing.room.id} outline={editing.outline} onChange={onEdited} />}
      </PlanMap>
      {editing && (
        <div className="rounded-xl border border-border bg-surface p-4">
          <RoomDetailsForm
            key={editing.kind === 'edit' ? editing.room.id : 'new'}
            room={editing.kind === 'edit' ? editing.room : undefined}
            busy={create.isPending || update.isPending}
            outlineReady={Boolean(editing.outline)}
            onSubmit={submit}
            onCancel={() => setEditing(null)}
          />
        </div>
      )}
      <section aria-labelledby="rooms-heading" className="flex flex-col gap-3">
        <h3 id="rooms-heading" className="text-xl font-bold">
          Rooms on this level
        </h3>
        {!rooms.data ? (
          <QueryState label="rooms" query={rooms} />
        ) : list.length === 0 ? (
          <EmptyState title="No rooms yet">{canEdit ? 'Use “Draw a room” and click its corners on the plan.' : 'An admin or reviewer draws the rooms on this plan.'}</EmptyState>
        ) : (
          <ul className="grid grid-cols-1 gap-3 md:grid-cols-2" aria-label="Rooms">
            {list.map((room) => (
              <li key={room.id} className="rounded-xl border border-border bg-surface p-4" data-testid="room-card">
                <h4 className="text-lg font-bold">{room.name}</h4>
                <p className="text-sm">
                  {room.use ?? 'Use not given'} · sensitivity {SENSITIVITY_LABELS[room.sensitivity].toLowerCase()} · {room.areaM2.toFixed(1)} m²
                </p>
                {canEdit && (
                  <div className="mt-2 flex flex-wrap gap-2">
                    <Button
                      variant="secondary"
                      disabled={editing !== null}
                      onClick={() =>
                        setEditing({ kind: 'edit', room, outline: room.polygonM.map(([xM, yM]) => planMToPixel({ xM, yM }, calibration)) })
                      }
                    >
                      Edit
                    </Button>
                    <ConfirmButton
                      title={`Delete room ${room.name}?`}
                      body="Stations inside it are re-assigned to whichever room contains them, or to none. Emitters in the room must be deleted first."
                      confirmLabel="Delete room"
                      busy={remove.isPending && remove.variables === room.id}
                      onConfirm={() => remove.mutate(room.id)}
                    >
                      Delete
                    </ConfirmButton>
                  </div>
                )}
              </li>
            ))}
          </ul>
        )}
      </section>
    </div>
  );
}
