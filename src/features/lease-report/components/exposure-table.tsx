import {
  columnVisibilityFeature,
  createColumnHelper,
  createSortedRowModel,
  rowSortingFeature,
  type SortingState,
  sortFn_basic,
  tableFeatures,
  useTable,
} from '@tanstack/react-table';
import { useState } from 'react';
import { RatingBadge, ratingRank } from '../../../components/ui/rating-badge';
import type { ScreeningRow } from '../../../lib/exposure-api';
import { fmtDays, fmtFlow, fmtIndicator, fmtNumber, fmtPercent, fmtSalinity } from '../../../lib/format';
import { speciesBandId } from '../api/use-lease-report';

const features = tableFeatures({
  rowSortingFeature,
  columnVisibilityFeature,
  sortedRowModel: createSortedRowModel(),
  sortFns: { basic: sortFn_basic },
});
const helper = createColumnHelper<typeof features, ScreeningRow & { order: number }>();

const columns = helper.columns([
  helper.accessor('order', {
    id: 'scenario',
    header: 'Flood',
    sortFn: sortFn_basic,
    cell: (c) => (
      <span>
        <span className="font-semibold">{c.row.original.scenarioName}</span>
        <span className="block text-xs text-shell-700">
          {fmtFlow(c.row.original.discharge)} for {fmtNumber(c.row.original.durationHours / 24, 1)} days
        </span>
      </span>
    ),
  }),
  helper.accessor((r) => ratingRank(r.rating), {
    id: 'rating',
    header: 'Rating',
    sortFn: sortFn_basic,
    cell: (c) => <RatingBadge rating={c.row.original.rating} />,
  }),
  helper.accessor((r) => r.bandFractions[speciesBandId(r) ?? ''] ?? 0, {
    id: 'speciesBand',
    header: 'Lease under the species’ limit',
    sortFn: sortFn_basic,
    cell: (c) => fmtPercent(c.getValue()),
  }),
  helper.accessor((r) => r.bandFractions['plume-edge'] ?? 0, {
    id: 'plume',
    header: 'Lease in the plume',
    sortFn: sortFn_basic,
    cell: (c) => fmtPercent(c.getValue()),
  }),
  helper.accessor((r) => r.lowestSalinity ?? 99, {
    id: 'lowestSalinity',
    header: 'Lowest salinity',
    sortFn: sortFn_basic,
    cell: (c) => fmtSalinity(c.row.original.lowestSalinity),
  }),
  helper.accessor((r) => r.highestIndicator ?? -1, {
    id: 'highestIndicator',
    header: 'Highest faecal indicator',
    sortFn: sortFn_basic,
    cell: (c) => fmtIndicator(c.row.original.highestIndicator),
  }),
  helper.accessor((r) => r.daysBelowTolerance ?? 0, {
    id: 'days',
    header: 'Days below tolerance',
    sortFn: sortFn_basic,
    cell: (c) => fmtDays(c.row.original.daysBelowTolerance),
  }),
]);

/** Exposure per flood scenario of one river: sortable; a row's button shows that flood on the map. */
export function ExposureTable({
  rows,
  selectedId,
  onSelect,
}: {
  rows: ScreeningRow[];
  selectedId?: string;
  onSelect: (scenarioId: string) => void;
}) {
  const [sorting, setSorting] = useState<SortingState>([]);
  const data = rows.map((r, i) => ({ ...r, order: i }));
  const table = useTable({ features, columns, data, getRowId: (r) => r.scenarioId, state: { sorting }, onSortingChange: setSorting });
  return (
    <div className="overflow-x-auto rounded-lg border border-sand-200 bg-white">
      <table className="w-full border-collapse text-sm" aria-label="Exposure per flood">
        <thead>
          {table.getHeaderGroups().map((group) => (
            <tr key={group.id} className="border-b border-sand-200 text-left align-bottom">
              {group.headers.map((header) => {
                const sorted = header.column.getIsSorted();
                return (
                  <th
                    key={header.id}
                    className="p-2"
                    aria-sort={sorted === 'asc' ? 'ascending' : sorted === 'desc' ? 'descending' : 'none'}
                  >
                    <button
                      type="button"
                      className="flex items-center gap-1 text-left font-semibold"
                      onClick={header.column.getToggleSortingHandler()}
                    >
                      <table.FlexRender header={header} />
                      <span aria-hidden className="no-print">
                        {sorted === 'asc' ? '▲' : sorted === 'desc' ? '▼' : '↕'}
                      </span>
                    </button>
                  </th>
                );
              })}
              <th className="no-print p-2">
                <span className="sr-only">Map</span>
              </th>
            </tr>
          ))}
        </thead>
        <tbody>
          {table.getRowModel().rows.map((row) => {
            const selected = row.id === selectedId;
            return (
              <tr
                key={row.id}
                className={`border-b border-shell-100 ${selected ? 'bg-deep-50' : 'hover:bg-sand-50'}`}
                aria-selected={selected}
              >
                {row.getVisibleCells().map((cell) => (
                  <td key={cell.id} className="p-2 align-top">
                    <table.FlexRender cell={cell} />
                  </td>
                ))}
                <td className="no-print p-2 align-top">
                  {selected ? (
                    <span className="text-xs font-semibold text-deep-700">On the map</span>
                  ) : (
                    <button type="button" className="text-xs font-semibold text-deep-700 underline" onClick={() => onSelect(row.id)}>
                      Show on map
                    </button>
                  )}
                </td>
              </tr>
            );
          })}
        </tbody>
      </table>
    </div>
  );
}
