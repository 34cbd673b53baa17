/**
 * Emitters and their cyclotron emission (shared/physics/emission.ts: P/V = C·nₑ·B²·⟨W⊥⟩ with
 * C = e⁵/(3πε₀mₑ³c³), optically thin and non-relativistic; total = P/V · V). The field B is the caller's
 * ?fieldT=, else the highest |B| read at a station in the emitter's room, else 1 T as a reference
 * (P ∝ B², so the figure scales by B² to any other field). An electron energy given as 'total' is the
 * mean total kinetic energy of an isotropic plasma, ⟨W⊥⟩ = ⅔⟨W⟩; 'perpendicular' is ⟨W⊥⟩ itself.
 */
import { ELECTRON_VOLT_J } from '../../../shared/physics/constants';
import { PhysicsInputError } from '../../../shared/physics/errors';
import { perVolumeEmissionWPerM3 } from '../../../shared/physics/emission';
import type { Emission, Emitter, EmitterCreate, EmitterUpdate } from '../../../shared/schemas/emitter';
import type { AuditContext } from '../../lib/audit-context';
import { AppError, notFound } from '../../lib/errors';
import type { EmitterPlace, EmitterRow, EmittersRepository } from './emitters.repository';

const REFERENCE_FIELD_T = 1;
const UNITS = { fieldT: 'T', perVolumeWPerM3: 'W/m³', totalW: 'W' } as const;
const CAUTION = 'Optically thin, non-relativistic estimate (dense plasmas reabsorb their own emission).';

function emissionOf(row: Pick<EmitterRow, 'electronDensityPerM3' | 'electronEnergyEv' | 'energyKind' | 'volumeM3'>, fieldT: number, fieldBasis: Emission['fieldBasis']): Emission {
  const { powerPerVolumeWPerM3 } = perVolumeEmissionWPerM3({
    densityPerM3: row.electronDensityPerM3,
    fieldTesla: fieldT,
    energyJ: row.electronEnergyEv * ELECTRON_VOLT_J,
    energyKind: row.energyKind === 'total' ? 'totalIsotropic' : 'perpendicular',
  });
  return { fieldT, fieldBasis, perVolumeWPerM3: powerPerVolumeWPerM3, totalW: powerPerVolumeWPerM3 * row.volumeM3, units: UNITS };
}

function view(row: EmitterRow, place: EmitterPlace, field: { fieldT: number; basis: Emission['fieldBasis'] }): Emitter {
  let emission: Emission | null = null;
  let emissionNote = CAUTION;
  try {
    emission = emissionOf(row, field.fieldT, field.basis);
    if (field.basis === 'reference_1T') emissionNote = `No field reading in this room yet: figures are at 1 T and scale with B². ${CAUTION}`;
  } catch (error) {
    if (!(error instanceof PhysicsInputError)) throw error;
    emissionNote = error.message;
  }
  return {
    id: row.id,
    siteId: place.siteId,
    levelId: place.levelId,
    roomId: row.roomId,
    roomName: place.roomName,
    name: row.name,
    kind: row.kind,
    electronDensityPerM3: row.electronDensityPerM3,
    electronEnergyEv: row.electronEnergyEv,
    energyKind: row.energyKind,
    volumeM3: row.volumeM3,
    xM: row.xM,
    yM: row.yM,
    zM: row.zM,
    notes: row.notes,
    emission,
    emissionNote,
    revision: row.revision,
    changeSeq: row.changeSeq,
    updatedAt: row.updatedAt.toISOString(),
  };
}

/** Refuses inputs the emission law cannot take (above 5 % of mₑc², where it stops being non-relativistic). */
function checkPhysics(values: Pick<EmitterRow, 'electronDensityPerM3' | 'electronEnergyEv' | 'energyKind' | 'volumeM3'>): void {
  try {
    emissionOf(values, REFERENCE_FIELD_T, 'reference_1T');
  } catch (error) {
    if (error instanceof PhysicsInputError) throw new AppError('VALIDATION_FAILED', error.message, { issues: [{ in: 'body', path: 'electronEnergyEv', message: error.message }] });
    throw error;
  }
}

export function createEmittersService(repo: EmittersRepository) {
  async function fieldsFor(organisationId: string, roomIds: string[], queryFieldT: number | undefined) {
    const measured = queryFieldT === undefined ? await repo.maxFieldByRoom(organisationId, roomIds) : new Map<string, number>();
    return (roomId: string): { fieldT: number; basis: Emission['fieldBasis'] } => {
      if (queryFieldT !== undefined) return { fieldT: queryFieldT, basis: 'query' };
      const m = measured.get(roomId);
      return m !== undefined && m > 0 ? { fieldT: m, basis: 'room_readings' } : { fieldT: REFERENCE_FIELD_T, basis: 'reference_1T' };
    };
  }
  async function one(organisationId: string, row: EmitterRow, place: EmitterPlace): Promise<Emitter> {
    const field = await fieldsFor(organisationId, [row.roomId], undefined);
    return view(row, place, field(row.roomId));
  }
  const invalidRoom = () => new AppError('VALIDATION_FAILED', 'That room is not on this site.', { issues: [{ in: 'body', path: 'roomId', message: 'That room is not on this site.' }] });

  return {
    async list(organisationId: string, siteId: string, queryFieldT?: number): Promise<Emitter[]> {
      if (!(await repo.siteExists(organisationId, siteId))) throw notFound('That site');
      const rows = await repo.list(organisationId, siteId);
      const field = await fieldsFor(organisationId, [...new Set(rows.map((r) => r.row.roomId))], queryFieldT);
      return rows.map(({ row, place }) => view(row, place, field(row.roomId)));
    },
    async create(organisationId: string, siteId: string, input: EmitterCreate, ctx: AuditContext): Promise<Emitter> {
      if (!(await repo.siteExists(organisationId, siteId))) throw notFound('That site');
      const place = await repo.roomPlace(organisationId, input.roomId);
      if (!place || place.siteId !== siteId) throw invalidRoom();
      if ((input.xM == null) !== (input.yM == null)) throw new AppError('VALIDATION_FAILED', 'Give both x and y, or neither.', { issues: [{ in: 'body', path: 'xM', message: 'Give both x and y, or neither.' }] });
      checkPhysics(input);
      const row = await repo.create(organisationId, { ...input, xM: input.xM ?? null, yM: input.yM ?? null, zM: input.zM ?? null, notes: input.notes ?? null }, ctx);
      return one(organisationId, row, place);
    },
    async update(organisationId: string, emitterId: string, patch: EmitterUpdate, ctx: AuditContext): Promise<Emitter> {
      const found = await repo.find(organisationId, emitterId);
      if (!found) throw notFound('That emitter');
      let place = found.place;
      if (patch.roomId !== undefined && patch.roomId !== found.row.roomId) {
        const next = await repo.roomPlace(organisationId, patch.roomId);
        if (!next || next.siteId !== found.place.siteId) throw invalidRoom();
        place = next;
      }
      const merged = { ...found.row, ...patch };
      if ((merged.xM == null) !== (merged.yM == null)) throw new AppError('VALIDATION_FAILED', 'Give both x and y, or neither.', { issues: [{ in: 'body', path: 'xM', message: 'Give both x and y, or neither.' }] });
      checkPhysics(merged);
      const row = await repo.update(found.row, patch, ctx);
      return one(organisationId, row, place);
    },
    async remove(organisationId: string, emitterId: string, ctx: AuditContext): Promise<void> {
      const found = await repo.find(organisationId, emitterId);
      if (!found) throw notFound('That emitter');
      await repo.remove(found.row, ctx);
    },
  };
}
export type EmittersService = ReturnType<typeof createEmittersService>;
