import { createColumnHelper } from '@tanstack/react-table';
import { Link } from 'react-router-dom';
import type { SiteSummary } from '@shared/schemas/home';
import { DataTable } from '@/components/data-table';

const column = createColumnHelper<SiteSummary>();
const columns = [
  column.accessor('name', {
    header: 'Site',
    cell: (info) => (
      <Link to={`/sites/${info.row.original.id}`} className="inline-flex min-h-touch items-center font-bold">
        {info.getValue()}
      </Link>
    ),
  }),
  column.accessor((site) => site.address ?? '', { id: 'address', header: 'Address' }),
  column.accessor('levelCount', { header: 'Levels' }),
  column.accessor('sourceCount', { header: 'Magnets' }),
  column.accessor((site) => (site.archived ? 'Archived' : 'Active'), {
    id: 'state',
    header: 'State',
    cell: (info) =>
      info.getValue() === 'Archived' ? (
        <span className="rounded-full bg-surface-sunken px-3 py-1 text-sm font-bold text-fg-muted">Archived</span>
      ) : (
        <span className="rounded-full bg-ok-soft px-3 py-1 text-sm font-bold text-ok">Active</span>
      ),
  }),
];

export function SitesTable({ sites }: { sites: SiteSummary[] }) {
  return <DataTable label="Sites" data={sites} columns={columns} getRowId={(site) => site.id} initialSorting={[{ id: 'name', desc: false }]} />;
}
