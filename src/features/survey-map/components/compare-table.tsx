import { useMemo, useState } from 'react';
import type { CompareLevel, CompareRay } from '@shared/schemas/survey-map';
import { formatLength } from '@shared/units';
import { fieldLabel, type MapFieldUnit } from '../lib/units';

type SortKey = 'sourceName' | 'levelT' | 'bearingDeg' | 'currentM' | 'earlierM' | 'movedM';
const COLUMNS: { key: SortKey; label: string; numeric: boolean }[] = [
  { key: 'sourceName', label: 'Magnet', numeric: false },
  { key: 'levelT', label: 'Line', numeric: true },
  { key: 'bearingDeg', label: 'Direction', numeric: true },
  { key: 'currentM', label: 'This survey', numeric: true },
  { key: 'earlierM', label: 'Earlier survey', numeric: true },
  { key: 'movedM', label: 'Moved', numeric: true },
];

const metres = (m: number | null, atEdge: boolean) => (m === null ? 'not reached' : `${atEdge ? '≥ ' : ''}${formatLength(m, { significantDigits: 3 })}`);

/** How far each line moved along each ray from each magnet: sortable, filterable by line. */
export function CompareTable({ level, unit, earlierName }: { level: CompareLevel; unit: MapFieldUnit; earlierName: string }) {
  const [sort, setSort] = useState<{ key: SortKey; dir: 1 | -1 }>({ key: 'movedM', dir: -1 });
  const [lineFilter, setLineFilter] = useState<string>('all');
  const lines = [...new Set(level.rays.map((r) => r.levelT))].sort((a, b) => a - b);
  const rows = useMemo(() => {
    const shown = level.rays.filter((r) => lineFilter === 'all' || String(r.levelT) === lineFilter);
    const value = (r: CompareRay) => {
      const v = r[sort.key];
      return sort.key === 'movedM' && v !== null ? Math.abs(v as number) : v;
    };
    return [...shown].sort((a, b) => {
      const va = value(a);
      const vb = value(b);
      if (va === null && vb === null) return 0;
      if (va === null) return 1; // blanks last, whichever way
      if (vb === null) return -1;
      return (typeof va === 'string' ? va.localeCompare(vb as string) : (va as number) - (vb as number)) * sort.dir;
    });
  }, [level.rays, sort, lineFilter]);

  if (level.note) return <p className="text-fg-muted">{level.note}</p>;
  return (
    <div className="flex flex-col gap-2">
      <label className="flex items-center gap-2 self-start">
        <span className="font-bold">Line</span>
        <select className="min-h-touch rounded-lg border-2 border-field-border bg-bg px-3" value={lineFilter} onChange={(e) => setLineFilter(e.target.value)}>
          <option value="all">All lines</option>
          {lines.map((l) => (
            <option key={l} value={String(l)}>
              {fieldLabel(l, unit)}
            </option>
          ))}
        </select>
      </label>
      <div className="overflow-x-auto">
        <table className="w-full border-collapse text-left" data-testid="compare-table">
          <caption className="sr-only">Distance from each magnet to each line along each direction, in this survey and in {earlierName}</caption>
          <thead>
            <tr>
              {COLUMNS.map((c) => (
                <th key={c.key} scope="col" aria-sort={sort.key === c.key ? (sort.dir === 1 ? 'ascending' : 'descending') : 'none'} className={`border-b-2 border-border p-1 ${c.numeric ? 'text-right' : ''}`}>
                  <button
                    type="button"
                    className="min-h-touch font-bold"
                    onClick={() => setSort((s) => ({ key: c.key, dir: s.key === c.key ? ((-s.dir) as 1 | -1) : c.key === 'movedM' ? -1 : 1 }))}
                  >
                    {c.label}
                    {sort.key === c.key ? (sort.dir === 1 ? ' ▲' : ' ▼') : ''}
                  </button>
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {rows.map((r) => (
              <tr key={`${r.sourceId}-${r.levelT}-${r.bearingDeg}`} className="border-b border-border">
                <td className="p-1">{r.sourceName}</td>
                <td className="p-1 text-right">{fieldLabel(r.levelT, unit)}</td>
                <td className="p-1 text-right">{r.bearingDeg}°</td>
                <td className="p-1 text-right">{metres(r.currentM, r.currentAtEdge)}</td>
                <td className="p-1 text-right">{metres(r.earlierM, r.earlierAtEdge)}</td>
                <td className="p-1 text-right font-bold">
                  {r.movedM === null ? '—' : `${r.movedM > 0 ? 'out ' : r.movedM < 0 ? 'in ' : ''}${formatLength(Math.abs(r.movedM), { significantDigits: 2 })}`}
                  {(r.currentAtEdge || r.earlierAtEdge) && r.movedM !== null ? ' *' : ''}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <p className="text-sm text-fg-muted">
        Directions are degrees clockwise from up the plan, from each magnet’s centre. “≥” and * mark a line that closes along the edge of the surveyed area: the
        true line lies at least that far out. “Not reached”: the ray meets no part of that line.
      </p>
    </div>
  );
}
