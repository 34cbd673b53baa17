import { useEmitters } from '../data/list-emitters';
import { EmissionFigures } from './emission-figures';
import { EMITTER_KIND_LABELS } from './labels';
import { QueryState } from './query-state';
import { EmptyState } from '@/components/empty-state';

/** Every emitter on the site with its emitted power; they are added per room on the level screens. */
export function SiteEmittersSection({ organisationId, siteId }: { organisationId: string; siteId: string }) {
  const emitters = useEmitters(organisationId, siteId);
  return (
    <section aria-labelledby="emitters-heading" className="flex flex-col gap-3">
      <h2 id="emitters-heading" className="text-2xl font-bold">
        Emitters
      </h2>
      {!emitters.data ? (
        <QueryState label="emitters" query={emitters} />
      ) : emitters.data.emitters.length === 0 ? (
        <EmptyState title="No emitters yet">Open a level, draw its rooms, then add the lamps, gauges and plasma tools in each room.</EmptyState>
      ) : (
        <ul className="grid grid-cols-1 gap-3 md:grid-cols-2" aria-label="Emitters">
          {emitters.data.emitters.map((emitter) => (
            <li key={emitter.id} className="rounded-xl border border-border bg-surface p-4">
              <h3 className="text-lg font-bold">{emitter.name}</h3>
              <p>
                {EMITTER_KIND_LABELS[emitter.kind]} in {emitter.roomName}
              </p>
              <EmissionFigures emission={emitter.emission} note={emitter.emissionNote} />
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}
