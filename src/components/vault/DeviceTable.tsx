/** The device table: server-side sorting, filtering and paging, with a choice of columns. */
import { useEffect, useMemo, useState } from 'react';
import { keepPreviousData, useQuery } from '@tanstack/react-query';
import { createColumnHelper, flexRender, getCoreRowModel, useReactTable, type SortingState, type VisibilityState } from '@tanstack/react-table';
import { api } from '../../lib/client/api';
import { vaultKeys } from '../../lib/client/keys';
import { QueryProvider } from '../QueryProvider';
import { DEVICE_ROLES, DEVICE_ROLE_LABELS } from '../../lib/schemas/vault';
import { CursorPager, ErrorNotice } from './shared';

interface Row {
  id: string; tag: string; name: string; role: (typeof DEVICE_ROLES)[number]; maker: string; model: string; serialNumber: string;
  machineName: string; siteName: string; updatedAt: string; ports: { id: string; name: string; shorthand: string }[];
}
/** A page of the device list: `total` stops at the cap (`totalCapped`), `next` is the cursor of the page after it. */
interface PageOf<T> { items: T[]; total: number; totalCapped: boolean; next: string | null; pageSize: number }

const col = createColumnHelper<Row>();
const columns = [
  col.accessor('tag', { header: 'Tag', cell: (c) => <a href={`/vault/devices/${c.row.original.id}`} className="font-semibold whitespace-nowrap">{c.getValue()}</a> }),
  col.accessor('name', { header: 'Name' }),
  col.accessor('role', { header: 'Role', cell: (c) => DEVICE_ROLE_LABELS[c.getValue()] }),
  col.accessor('maker', { header: 'Maker' }),
  col.accessor('model', { header: 'Model' }),
  col.accessor('serialNumber', { header: 'Serial number' }),
  col.display({
    id: 'ports', header: 'Ports',
    cell: (c) => c.row.original.ports.length === 0 ? <span className="text-muted">none</span> : (
      <ul>{c.row.original.ports.map((p) => <li key={p.id} className="whitespace-nowrap"><span className="text-muted text-xs">{p.name}</span> <span className="mono text-sm">{p.shorthand}</span></li>)}</ul>
    ),
  }),
  col.accessor('machineName', { header: 'Machine' }),
  col.accessor('siteName', { header: 'Site' }),
  col.accessor('updatedAt', { header: 'Changed', cell: (c) => new Date(c.getValue()).toISOString().slice(0, 10) }),
];

interface Props { machineId?: string; siteId?: string; hide?: string[] }

function useDebounced<T>(value: T, ms = 250): T {
  const [v, setV] = useState(value);
  useEffect(() => {
    const t = setTimeout(() => setV(value), ms);
    return () => clearTimeout(t);
  }, [value, ms]);
  return v;
}

function Table({ machineId, siteId, hide = [] }: Props) {
  const [sorting, setSorting] = useState<SortingState>([{ id: 'tag', desc: false }]);
  const [visibility, setVisibility] = useState<VisibilityState>(() => Object.fromEntries(['serialNumber', 'updatedAt', ...hide].map((h) => [h, false])));
  const [filter, setFilter] = useState('');
  const [role, setRole] = useState('');
  // Pages are read by cursor: cursors[i] is the `next` of page i (page 1 has none), kept for going back.
  const [cursors, setCursors] = useState<string[]>([]);
  const page = cursors.length + 1;
  const [pageSize, setPageSize] = useState(25);
  const q = useDebounced(filter.trim());
  useEffect(() => setCursors([]), [q, role, pageSize, sorting]);

  const params = useMemo(() => {
    const p = new URLSearchParams({ pageSize: String(pageSize), sort: sorting[0]?.id ?? 'tag', dir: sorting[0]?.desc ? 'desc' : 'asc' });
    const after = cursors[cursors.length - 1];
    if (after) p.set('after', after);
    if (machineId) p.set('machineId', machineId);
    if (siteId) p.set('siteId', siteId);
    if (role) p.set('role', role);
    if (/[\p{L}\p{N}]/u.test(q)) p.set('q', q);
    return p.toString();
  }, [cursors, pageSize, sorting, machineId, siteId, role, q]);
  const query = useQuery({ queryKey: vaultKeys.list('devices', { params }), queryFn: () => api<PageOf<Row>>(`/api/devices?${params}`), placeholderData: keepPreviousData });

  const table = useReactTable({
    data: query.data?.items ?? [],
    columns,
    state: { sorting, columnVisibility: visibility },
    onSortingChange: (u) => setSorting((old) => (typeof u === 'function' ? u(old) : u).slice(0, 1)),
    onColumnVisibilityChange: setVisibility,
    manualSorting: true,
    manualPagination: true,
    manualFiltering: true,
    enableSortingRemoval: false,
    getCoreRowModel: getCoreRowModel(),
  });

  return (
    <div>
      <div className="flex flex-wrap items-end gap-3 mb-3">
        <label className="grow min-w-48"><span className="label">Filter devices</span>
          <input className="input" type="search" value={filter} onChange={(e) => setFilter(e.target.value)} placeholder="Tag, name, maker, model, serial…" aria-label="Filter devices" />
        </label>
        <label><span className="label">Role</span>
          <select className="input" value={role} onChange={(e) => setRole(e.target.value)} aria-label="Filter by role">
            <option value="">All roles</option>
            {DEVICE_ROLES.map((r) => <option key={r} value={r}>{DEVICE_ROLE_LABELS[r]}</option>)}
          </select>
        </label>
        <label><span className="label">Rows</span>
          <select className="input" value={pageSize} onChange={(e) => setPageSize(Number(e.target.value))}>
            {[25, 50, 100, 200].map((n) => <option key={n} value={n}>{n}</option>)}
          </select>
        </label>
        <details className="relative">
          <summary className="btn btn-quiet btn-sm cursor-pointer">Columns</summary>
          <fieldset className="absolute right-0 z-10 mt-1 card shadow grid gap-1 min-w-44">
            <legend className="sr-only">Columns shown</legend>
            {table.getAllLeafColumns().filter((c) => c.id !== 'tag').map((c) => (
              <label key={c.id} className="flex items-center gap-2 text-sm">
                <input type="checkbox" checked={c.getIsVisible()} onChange={c.getToggleVisibilityHandler()} /> {String(c.columnDef.header)}
              </label>
            ))}
          </fieldset>
        </details>
      </div>
      <ErrorNotice error={query.error} />
      <div className="overflow-x-auto">
        <table className="table table-cards" data-testid="device-table" aria-busy={query.isFetching}>
          <thead>
            {table.getHeaderGroups().map((hg) => (
              <tr key={hg.id}>
                {hg.headers.map((h) => {
                  const sorted = h.column.getIsSorted();
                  return (
                    <th key={h.id} aria-sort={sorted ? (sorted === 'asc' ? 'ascending' : 'descending') : undefined}>
                      {h.column.getCanSort() && h.column.id !== 'ports' ? (
                        <button type="button" className="font-semibold hover:underline" onClick={h.column.getToggleSortingHandler()}>
                          {flexRender(h.column.columnDef.header, h.getContext())}{sorted === 'asc' ? ' ▲' : sorted === 'desc' ? ' ▼' : ''}
                        </button>
                      ) : flexRender(h.column.columnDef.header, h.getContext())}
                    </th>
                  );
                })}
              </tr>
            ))}
          </thead>
          <tbody>
            {table.getRowModel().rows.map((r) => (
              <tr key={r.id}>{r.getVisibleCells().map((c) => <td key={c.id} data-label={c.column.id === 'tag' ? undefined : String(c.column.columnDef.header)}>{flexRender(c.column.columnDef.cell, c.getContext())}</td>)}</tr>
            ))}
            {query.data && query.data.items.length === 0 && (
              <tr><td colSpan={columns.length} className="text-muted">No devices match.</td></tr>
            )}
          </tbody>
        </table>
      </div>
      {query.data && (
        <CursorPager
          page={page} pageSize={pageSize} total={query.data.total} capped={query.data.totalCapped}
          onPrevious={() => setCursors((c) => c.slice(0, -1))}
          onNext={query.data.next ? () => setCursors((c) => [...c, query.data!.next!]) : undefined}
        />
      )}
    </div>
  );
}

export default function DeviceTable(props: Props) {
  return (
    <QueryProvider>
      <Table {...props} />
    </QueryProvider>
  );
}
