/**
 * Pick a region from a list and a small map of their areas, or none. Used at sign-up and in the
 * account settings.
 */
import { useQuery } from '@tanstack/react-query';
import type { FeatureCollection } from 'geojson';
import { useId, useMemo } from 'react';
import { regionKeys } from '../lib/regions-api';
import { LazyVectorMap } from './map/lazy-vector-map';

export function RegionPicker({ value, onChange }: { value: string | null; onChange: (regionId: string | null) => void }) {
  const id = useId();
  const regions = useQuery(regionKeys.list());
  const areas = useMemo<FeatureCollection>(
    () => ({
      type: 'FeatureCollection',
      features: (regions.data?.items ?? [])
        .filter((r) => r.area)
        .map((r) => ({ type: 'Feature', id: r.id, properties: { id: r.id, name: r.name, chosen: r.id === value ? 'yes' : 'no' }, geometry: r.area! })),
    }),
    [regions.data, value],
  );
  return (
    <div className="flex flex-col gap-2">
      <label htmlFor={id} className="text-sm font-semibold text-shell-900">
        Region (optional)
      </label>
      <select
        id={id}
        className="rounded-md border border-shell-300 bg-white px-3 py-2 text-base"
        value={value ?? ''}
        onChange={(e) => onChange(e.target.value === '' ? null : e.target.value)}
      >
        <option value="">None — I will set up my own rivers</option>
        {(regions.data?.items ?? []).map((r) => (
          <option key={r.id} value={r.id}>
            {r.name}
          </option>
        ))}
      </select>
      <p className="text-xs text-shell-700">
        A region’s rivers and flow records screen your leases at once. Saving a lease inside a region’s area also joins you to it.
      </p>
      {areas.features.length > 0 && (
        <LazyVectorMap
          ariaLabel="Map of the regions' areas: click one to choose it"
          height={200}
          layers={[{ id: 'regions', label: 'Regions', data: areas, fill: 'rgba(23,61,97,0.15)', stroke: '#173d61', labelProperty: 'name' }]}
          clickableLayers={['regions']}
          onSelect={(s) => s && onChange(String(s.properties.id))}
          showLegend={false}
        />
      )}
    </div>
  );
}
