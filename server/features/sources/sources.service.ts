/** Magnets on a site. A position needs its level (a plan of the same site) and both x and y. */
import type { Source, SourceCreate, SourceUpdate } from '../../../shared/schemas/source';
import type { AuditContext } from '../../lib/audit-context';
import { AppError, notFound } from '../../lib/errors';
import type { SourcesRepository, SourceValues } from './sources.repository';

function invalid(path: string, message: string): AppError {
  return new AppError('VALIDATION_FAILED', message, { issues: [{ in: 'body', path, message }] });
}

export function createSourcesService(repo: SourcesRepository) {
  async function checkPlacement(organisationId: string, siteId: string, v: { levelId: string | null; xM: number | null; yM: number | null }) {
    if ((v.xM === null) !== (v.yM === null)) throw invalid(v.xM === null ? 'xM' : 'yM', 'Give both x and y, or neither.');
    if (v.xM !== null && v.levelId === null) throw invalid('levelId', 'A position on a plan needs its level.');
    if (v.levelId !== null && (await repo.levelSite(organisationId, v.levelId)) !== siteId) throw invalid('levelId', 'That level is not on this site.');
  }

  function toValues(input: SourceUpdate): Partial<SourceValues> {
    const { axis, ...rest } = input;
    const out: Partial<SourceValues> = { ...rest };
    if (axis !== undefined) Object.assign(out, axis === null ? { axisX: null, axisY: null, axisZ: null } : { axisX: axis.x, axisY: axis.y, axisZ: axis.z });
    return out;
  }

  return {
    async list(organisationId: string, siteId: string): Promise<Source[]> {
      if (!(await repo.siteExists(organisationId, siteId))) throw notFound('That site');
      return repo.list(organisationId, siteId);
    },
    async create(organisationId: string, siteId: string, input: SourceCreate, ctx: AuditContext): Promise<Source> {
      if (!(await repo.siteExists(organisationId, siteId))) throw notFound('That site');
      await checkPlacement(organisationId, siteId, { levelId: input.levelId ?? null, xM: input.xM ?? null, yM: input.yM ?? null });
      return repo.create(organisationId, siteId, toValues(input) as SourceValues, ctx);
    },
    async update(organisationId: string, sourceId: string, patch: SourceUpdate, ctx: AuditContext): Promise<Source> {
      const before = await repo.findRow(organisationId, sourceId);
      if (!before) throw notFound('That magnet');
      const merged = {
        levelId: patch.levelId !== undefined ? patch.levelId : before.levelId,
        xM: patch.xM !== undefined ? patch.xM : before.xM,
        yM: patch.yM !== undefined ? patch.yM : before.yM,
      };
      await checkPlacement(organisationId, before.siteId, merged);
      return repo.update(before, toValues(patch), ctx);
    },
    async remove(organisationId: string, sourceId: string, ctx: AuditContext): Promise<void> {
      const before = await repo.findRow(organisationId, sourceId);
      if (!before) throw notFound('That magnet');
      await repo.remove(before, ctx);
    },
  };
}
export type SourcesService = ReturnType<typeof createSourcesService>;
