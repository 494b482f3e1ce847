import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import {
  columnVisibilityFeature,
  createColumnHelper,
  type PaginationState,
  type RowSelectionState,
  rowPaginationFeature,
  rowSelectionFeature,
  rowSortingFeature,
  type SortingState,
  tableFeatures,
  useTable,
} from '@tanstack/react-table';
import { useDeferredValue, useId, useMemo, useState } from 'react';
import { Link } from 'react-router-dom';
import type { Lease } from '#shared/schemas/lease';
import { AnnualRatingCell, AnnualRatingExplainer } from '../../../components/ui/annual-rating';
import { Button } from '../../../components/ui/button';
import { RatingBadge } from '../../../components/ui/rating-badge';
import { Notice } from '../../../components/ui/notice';
import { Empty, LoadError, Loading } from '../../../components/ui/states';
import type { ShareResult } from '#shared/schemas/sharing';
import type { Scenario } from '#shared/schemas/river';
import { exposureKeys } from '../../../lib/exposure-api';
import { returnPeriodLabel, speciesName } from '../../../lib/format';
import { leaseKeys, updateLease } from '../api/leases-api';
import { ShareLeasesForm } from './share-leases-form';

const features = tableFeatures({ rowSortingFeature, rowPaginationFeature, columnVisibilityFeature, rowSelectionFeature });
const helper = createColumnHelper<typeof features, Lease>();
const emptyRows: Lease[] = [];

const baseColumns = helper.columns([
  helper.accessor('leaseId', {
    id: 'leaseId',
    header: 'Lease id',
    cell: (c) => (
      <Link className="font-semibold text-deep-700 underline" to={`/leases/${c.row.original.id}`}>
        {c.getValue()}
      </Link>
    ),
  }),
  helper.accessor('holder', { id: 'holder', header: 'Holder', cell: (c) => c.getValue() ?? '—' }),
  helper.accessor('species', { id: 'species', header: 'Species', cell: (c) => (c.getValue() ? speciesName(c.getValue()) : '—') }),
  helper.accessor('status', {
    id: 'status',
    header: 'Status',
    cell: (c) => (c.getValue() === 'held' ? 'Held' : 'Candidate'),
  }),
  helper.accessor('areaM2', {
    id: 'areaM2',
    header: 'Area (ha)',
    cell: (c) => (c.getValue() / 10_000).toLocaleString(undefined, { maximumFractionDigits: 2, minimumFractionDigits: 2 }),
  }),
  helper.accessor('annualRating', {
    id: 'annualRating',
    header: 'Yearly rating',
    cell: (c) => (
      <AnnualRatingCell
        rating={c.getValue()}
        closureDaysPerYear={c.row.original.closureDaysPerYear}
        harmfulSalinityChancePerYear={c.row.original.harmfulSalinityChancePerYear}
      />
    ),
  }),
  helper.accessor('worstRating', {
    id: 'worstRating',
    header: 'Worst rating, any flood',
    cell: (c) =>
      c.getValue() ? <RatingBadge rating={c.getValue()} size="sm" /> : <span className="text-shell-700">Not screened yet</span>,
  }),
  helper.accessor('expectedDaysPerYear', {
    id: 'expectedDaysPerYear',
    header: 'Days a year below tolerance',
    cell: (c) => {
      const days = c.getValue();
      const chance = c.row.original.probabilityAnyExposure;
      if (days === null || days === undefined) return '—';
      return `${days.toLocaleString(undefined, { maximumFractionDigits: 1 })}${chance ? ` (${Math.round(chance * 100)}% of years)` : ''}`;
    },
  }),
  helper.accessor('ownerName', { id: 'ownerName', header: 'Account', enableSorting: false, cell: (c) => c.getValue() ?? '—' }),
]);

function scenarioLabel(columnId: string, scenarios: Scenario[]): string {
  const sc = scenarios.find((s) => `scenario:${s.id}` === columnId);
  return sc ? `Rating, ${sc.name}` : columnId;
}

const COLUMN_LABELS: Record<string, string> = {
  leaseId: 'Lease id',
  holder: 'Holder',
  species: 'Species',
  status: 'Status',
  areaM2: 'Area',
  annualRating: 'Yearly rating',
  worstRating: 'Worst rating, any flood',
  expectedDaysPerYear: 'Days a year below tolerance',
  ownerName: 'Account',
};

/** One column per flood scenario of the chosen river: the lease's rating at that flood. */
function scenarioColumns(scenarios: Scenario[]) {
  return scenarios.map((sc) =>
    helper.display({
      id: `scenario:${sc.id}`,
      header: sc.kind === 'aep' && sc.aep ? returnPeriodLabel(sc.aep) : sc.name,
      cell: (c) => {
        const rating = c.row.original.scenarioRatings?.[sc.id];
        return rating ? <RatingBadge rating={rating} size="sm" /> : <span className="text-shell-700">—</span>;
      },
    }),
  );
}

/**
 * Leases you may see, sorted, filtered and paged on the server so thousands of rows stay quick; worst yearly
 * rating first until the reader picks another column.
 */
export function LeasesTable({ canEdit, showAccount = true }: { canEdit: boolean; showAccount?: boolean }) {
  const queryClient = useQueryClient();
  // Worst yearly rating first (then closure days, then the chance), as on the Overview and Compare.
  const [sorting, setSorting] = useState<SortingState>([{ id: 'annualRating', desc: true }]);
  const [pagination, setPagination] = useState<PaginationState>({ pageIndex: 0, pageSize: 50 });
  const [search, setSearch] = useState('');
  const [status, setStatus] = useState<'' | 'held' | 'candidate'>('');
  const [rowSelection, setRowSelection] = useState<RowSelectionState>({});
  const [columnVisibility, setColumnVisibility] = useState<Record<string, boolean>>(showAccount ? {} : { ownerName: false });
  const [lastShare, setLastShare] = useState<ShareResult | null>(null);
  const q = useDeferredValue(search);
  const searchId = useId();
  const statusId = useId();
  const riverSelectId = useId();
  const rivers = useQuery(exposureKeys.rivers());
  const [riverChoice, setRiverChoice] = useState<string>();
  const ratingsRiverId = riverChoice ?? rivers.data?.items.find((r) => r.hasFlowRecord)?.id ?? '';
  const scenarios = useQuery({ ...exposureKeys.scenarios(ratingsRiverId), enabled: Boolean(ratingsRiverId) });
  // Flood-frequency scenarios from the most frequent to the rarest, then seasonal and typed ones.
  const scenarioList = useMemo(
    () =>
      [...(scenarios.data?.items ?? [])].sort(
        (a, b) => (a.kind === 'aep' ? 0 : 1) - (b.kind === 'aep' ? 0 : 1) || (b.aep ?? 0) - (a.aep ?? 0) || a.discharge - b.discharge,
      ),
    [scenarios.data],
  );
  const columns = useMemo(() => [...baseColumns, ...scenarioColumns(scenarioList)], [scenarioList]);

  const params = {
    q: q || undefined,
    status: status || undefined,
    sort: sorting[0]?.id ?? 'annualRating',
    order: sorting[0]?.desc ? ('desc' as const) : ('asc' as const),
    limit: pagination.pageSize,
    offset: pagination.pageIndex * pagination.pageSize,
    ratingsRiverId: ratingsRiverId || undefined,
  };
  const result = useQuery(leaseKeys.list(params));

  const table = useTable({
    features,
    columns,
    data: result.data?.items ?? emptyRows,
    rowCount: result.data?.total,
    getRowId: (row) => row.id,
    manualSorting: true,
    manualPagination: true,
    state: { sorting, pagination, rowSelection, columnVisibility },
    onSortingChange: setSorting,
    onPaginationChange: setPagination,
    onRowSelectionChange: setRowSelection,
    onColumnVisibilityChange: setColumnVisibility,
  });

  const selectedIds = Object.keys(rowSelection);
  const bulkStatus = useMutation({
    mutationFn: async (next: 'held' | 'candidate') => {
      for (const id of selectedIds) await updateLease(id, { status: next });
    },
    onSuccess: () => {
      setRowSelection({});
      void queryClient.invalidateQueries({ queryKey: leaseKeys.all });
    },
  });

  const pageCount = result.data ? Math.max(1, Math.ceil(result.data.total / pagination.pageSize)) : 1;

  return (
    <div className="space-y-3">
      <div className="flex flex-wrap items-end gap-3">
        <div className="flex flex-col gap-1">
          <label htmlFor={searchId} className="text-sm font-semibold">
            Find a lease
          </label>
          <input
            id={searchId}
            type="search"
            placeholder="Lease id or holder"
            value={search}
            onChange={(e) => {
              setSearch(e.target.value);
              setPagination((p) => ({ ...p, pageIndex: 0 }));
            }}
            className="rounded-md border border-shell-300 px-3 py-2"
          />
        </div>
        <div className="flex flex-col gap-1">
          <label htmlFor={statusId} className="text-sm font-semibold">
            Status
          </label>
          <select
            id={statusId}
            value={status}
            onChange={(e) => {
              setStatus(e.target.value as typeof status);
              setPagination((p) => ({ ...p, pageIndex: 0 }));
            }}
            className="rounded-md border border-shell-300 bg-white px-3 py-2"
          >
            <option value="">Held and candidate</option>
            <option value="held">Held</option>
            <option value="candidate">Candidate</option>
          </select>
        </div>
        {(rivers.data?.items.length ?? 0) > 0 && (
          <div className="flex flex-col gap-1">
            <label htmlFor={riverSelectId} className="text-sm font-semibold">
              Ratings per flood of
            </label>
            <select
              id={riverSelectId}
              value={ratingsRiverId}
              onChange={(e) => setRiverChoice(e.target.value)}
              className="rounded-md border border-shell-300 bg-white px-3 py-2"
            >
              {rivers.data?.items.map((r) => (
                <option key={r.id} value={r.id}>
                  {r.name}
                </option>
              ))}
            </select>
          </div>
        )}
        <details className="relative">
          <summary className="cursor-pointer rounded-md border border-shell-300 bg-white px-3 py-2 text-sm">Columns</summary>
          <div className="absolute z-10 mt-1 space-y-1 rounded-md border border-shell-300 bg-white p-3 shadow">
            {table.getAllLeafColumns().map((col) => (
              <label key={col.id} className="flex items-center gap-2 text-sm">
                <input type="checkbox" checked={col.getIsVisible()} onChange={col.getToggleVisibilityHandler()} />
                {COLUMN_LABELS[col.id] ?? scenarioLabel(col.id, scenarioList)}
              </label>
            ))}
          </div>
        </details>
        <a
          className="rounded-md border border-deep-300 bg-white px-3 py-2 text-sm font-semibold text-deep-700"
          href="/api/v1/leases/export?format=csv"
          download
        >
          Export CSV
        </a>
        <a
          className="rounded-md border border-deep-300 bg-white px-3 py-2 text-sm font-semibold text-deep-700"
          href="/api/v1/leases/export?format=geojson"
          download
        >
          Export GeoJSON
        </a>
        <a
          className="rounded-md border border-deep-300 bg-white px-3 py-2 text-sm font-semibold text-deep-700"
          href="/api/v1/leases/export?format=gpkg"
          download
        >
          Export GeoPackage
        </a>
        <a
          className="rounded-md border border-deep-300 bg-white px-3 py-2 text-sm font-semibold text-deep-700"
          href="/api/v1/leases/export?format=kml"
          download
        >
          Export KML
        </a>
      </div>

      {canEdit && selectedIds.length > 0 && (
        <section className="flex flex-wrap items-center gap-2 rounded-md bg-deep-50 p-2 text-sm" aria-label="Bulk actions">
          <span>{selectedIds.length} selected:</span>
          <Button variant="secondary" onClick={() => bulkStatus.mutate('held')} disabled={bulkStatus.isPending}>
            Mark held
          </Button>
          <Button variant="secondary" onClick={() => bulkStatus.mutate('candidate')} disabled={bulkStatus.isPending}>
            Mark candidate
          </Button>
          {bulkStatus.isPending && <span role="status">Saving {selectedIds.length} leases…</span>}
          <ShareLeasesForm
            leaseIds={selectedIds}
            onShared={(r) => {
              setLastShare(r);
              setRowSelection({});
            }}
          />
        </section>
      )}
      {lastShare && (
        <Notice tone="done" title="Shared">
          {lastShare.shared} {lastShare.shared === 1 ? 'lease is' : 'leases are'} now shared with{' '}
          {lastShare.grantee.name ?? lastShare.grantee.email} ({lastShare.grantee.email}). They see {lastShare.shared === 1 ? 'it' : 'them'}{' '}
          in their leases table and can write notes.
        </Notice>
      )}
      {bulkStatus.isError && <Notice tone="problem">{(bulkStatus.error as Error).message}</Notice>}

      {result.isPending ? (
        <Loading what="Loading leases…" />
      ) : result.isError ? (
        <LoadError error={result.error} retry={() => result.refetch()} />
      ) : result.data.total === 0 ? (
        <Empty title={q || status ? 'No lease matches these filters' : 'No leases yet'}>
          {q || status
            ? 'Clear the search or the status filter.'
            : 'Upload a zipped shapefile or a GeoJSON file of your lease boundaries to start.'}
        </Empty>
      ) : (
        <>
          <div className="overflow-x-auto rounded-lg border border-sand-200 bg-white">
            <table className="w-full border-collapse text-sm" aria-label="Leases">
              <thead>
                {table.getHeaderGroups().map((group) => (
                  <tr key={group.id} className="border-b border-sand-200 text-left">
                    {canEdit && (
                      <th className="w-8 p-2">
                        <input
                          type="checkbox"
                          aria-label="Select every lease on this page"
                          checked={table.getIsAllPageRowsSelected()}
                          onChange={table.getToggleAllPageRowsSelectedHandler()}
                        />
                      </th>
                    )}
                    {group.headers.map((header) => {
                      const sorted = header.column.getIsSorted();
                      return (
                        <th
                          key={header.id}
                          className="p-2"
                          aria-sort={sorted === 'asc' ? 'ascending' : sorted === 'desc' ? 'descending' : 'none'}
                        >
                          {header.column.getCanSort() ? (
                            <button
                              type="button"
                              className="flex items-center gap-1 font-semibold"
                              onClick={header.column.getToggleSortingHandler()}
                            >
                              <table.FlexRender header={header} />
                              <span aria-hidden>{sorted === 'asc' ? '▲' : sorted === 'desc' ? '▼' : '↕'}</span>
                            </button>
                          ) : (
                            <table.FlexRender header={header} />
                          )}
                        </th>
                      );
                    })}
                  </tr>
                ))}
              </thead>
              <tbody>
                {table.getRowModel().rows.map((row) => (
                  <tr key={row.id} className="border-b border-shell-100 hover:bg-sand-50">
                    {canEdit && (
                      <td className="p-2">
                        <input
                          type="checkbox"
                          aria-label={`Select ${row.original.leaseId}`}
                          checked={row.getIsSelected()}
                          onChange={row.getToggleSelectedHandler()}
                        />
                      </td>
                    )}
                    {row.getVisibleCells().map((cell) => (
                      <td key={cell.id} className="p-2">
                        <table.FlexRender cell={cell} />
                      </td>
                    ))}
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
          <nav aria-label="Pages" className="flex items-center gap-3 text-sm">
            <Button variant="secondary" onClick={() => table.previousPage()} disabled={!table.getCanPreviousPage()}>
              Previous
            </Button>
            <span>
              Page {pagination.pageIndex + 1} of {pageCount} · {result.data.total} leases
            </span>
            <Button variant="secondary" onClick={() => table.nextPage()} disabled={!table.getCanNextPage()}>
              Next
            </Button>
          </nav>
          <AnnualRatingExplainer />
        </>
      )}
    </div>
  );
}
