import { lazy, Suspense } from 'react';
import { Loading } from '../ui/states';
import type { VectorMapProps } from './vector-map';

const VectorMap = lazy(() => import('./vector-map'));

export type { MapLayerSpec, MapSelection, VectorMapProps } from './vector-map';

/** The vector map, with its OpenLayers code fetched only when a map is shown. */
export function LazyVectorMap(props: VectorMapProps) {
  return (
    <Suspense fallback={<Loading what="Drawing the map…" />}>
      <VectorMap {...props} />
    </Suspense>
  );
}

/** The drawn map inside `container` as a PNG (loads the map module only when asked). */
export async function mapImageOf(container: HTMLElement | null) {
  const mod = await import('./vector-map');
  return mod.mapImage(container);
}
