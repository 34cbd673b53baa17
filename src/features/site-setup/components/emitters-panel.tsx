import { useState } from 'react';
import { Button } from '@/components/button';
import { useDeleteEmitter } from '../data/delete-emitter';
import { useEmitters } from '../data/list-emitters';
import { useRooms } from '../data/list-rooms';
import { ConfirmButton } from '@/components/confirm-button';
import { EmissionFigures } from './emission-figures';
import { EmitterForm } from './emitter-form';
import { EMITTER_KIND_LABELS, ENERGY_KIND_LABELS } from './labels';
import { QueryState } from './query-state';
import { EmptyState } from '@/components/empty-state';

/** Emitters in this level's rooms, with their emitted power, and the form to add or edit one. */
export function EmittersPanel({ organisationId, siteId, levelId, canEdit }: { organisationId: string; siteId: string; levelId: string; canEdit: boolean }) {
  const rooms = useRooms(organisationId, siteId, levelId);
  const emitters = useEmitters(organisationId, siteId);
  const remove = useDeleteEmitter(organisationId, siteId);
  const [editing, setEditing] = useState<string | 'new' | null>(null);
  const roomList = rooms.data?.rooms ?? [];
  const here = (emitters.data?.emitters ?? []).filter((e) => e.levelId === levelId);
  if (!rooms.data) return <QueryState label="rooms" query={rooms} />;
  return (
    <div className="flex flex-col gap-4">
      {roomList.length === 0 ? (
        <EmptyState title="No rooms on this level yet">Emitters sit in rooms: draw this level's rooms first (“Rooms” tab).</EmptyState>
      ) : (
        canEdit && editing === null && (
          <div>
            <Button onClick={() => setEditing('new')}>Add emitter</Button>
          </div>
        )
      )}
      {editing === 'new' && (
        <div className="rounded-xl border border-border bg-surface p-4">
          <EmitterForm organisationId={organisationId} siteId={siteId} rooms={roomList} onDone={() => setEditing(null)} />
        </div>
      )}
      {!emitters.data ? (
        <QueryState label="emitters" query={emitters} />
      ) : here.length === 0 ? (
        roomList.length > 0 && (
          <EmptyState title="No emitters on this level yet">
            {canEdit ? 'Use “Add emitter” for the discharge lamps, ion gauges and plasma tools of each room.' : 'An admin or reviewer adds the discharge lamps, ion gauges and plasma tools of each room.'}
          </EmptyState>
        )
      ) : (
        <ul className="grid grid-cols-1 gap-3 md:grid-cols-2" aria-label="Emitters on this level">
          {here.map((emitter) =>
            editing === emitter.id ? (
              <li key={emitter.id} className="rounded-xl border border-border bg-surface p-4 md:col-span-2">
                <EmitterForm organisationId={organisationId} siteId={siteId} rooms={roomList} emitter={emitter} onDone={() => setEditing(null)} />
              </li>
            ) : (
              <li key={emitter.id} className="rounded-xl border border-border bg-surface p-4" data-testid="emitter-card">
                <h4 className="text-lg font-bold">{emitter.name}</h4>
                <p className="text-sm">
                  {EMITTER_KIND_LABELS[emitter.kind]} in {emitter.roomName} · nₑ {emitter.electronDensityPerM3.toPrecision(3)} m⁻³ · {emitter.electronEnergyEv} eV (
                  {ENERGY_KIND_LABELS[emitter.energyKind].toLowerCase()}) · {emitter.volumeM3.toPrecision(3)} m³
                </p>
                <EmissionFigures emission={emitter.emission} note={emitter.emissionNote} />
                {canEdit && (
                  <div className="mt-2 flex flex-wrap gap-2">
                    <Button variant="secondary" onClick={() => setEditing(emitter.id)}>
                      Edit
                    </Button>
                    <ConfirmButton
                      title={`Delete ${emitter.name}?`}
                      body="The emitter is removed from its room; its emission is no longer predicted."
                      confirmLabel="Delete emitter"
                      busy={remove.isPending && remove.variables === emitter.id}
                      onConfirm={() => remove.mutate(emitter.id)}
                    >
                      Delete
                    </ConfirmButton>
                  </div>
                )}
              </li>
            ),
          )}
        </ul>
      )}
    </div>
  );
}
