/**
 * A small OpenLayers map of vector layers only (works with no internet). Loaded lazily by
 * LazyVectorMap so the map code stays out of the first page's JavaScript.
 */
import 'ol/ol.css';
import type { FeatureCollection } from 'geojson';
import OlMap from 'ol/Map';
import View from 'ol/View';
import GeoJSON from 'ol/format/GeoJSON';
import VectorLayer from 'ol/layer/Vector';
import VectorSource from 'ol/source/Vector';
import { Fill, Stroke, Style, Text } from 'ol/style';
import { useEffect, useRef } from 'react';

export interface MapLayerSpec {
  id: string;
  label: string;
  data: FeatureCollection;
  fill: string;
  stroke: string;
  strokeWidth?: number;
  /** Dashed outline as a second cue beside colour. */
  dashed?: boolean;
  /** Property shown as a label on each feature. */
  labelProperty?: string;
}

export interface VectorMapProps {
  layers: MapLayerSpec[];
  height?: number;
  ariaLabel: string;
}

const geojson = new GeoJSON({ dataProjection: 'EPSG:4326', featureProjection: 'EPSG:3857' });

export default function VectorMap({ layers, height = 320, ariaLabel }: VectorMapProps) {
  const target = useRef<HTMLDivElement>(null);
  const mapRef = useRef<OlMap | null>(null);

  useEffect(() => {
    if (!target.current) return;
    const map = new OlMap({ target: target.current, view: new View({ center: [0, 0], zoom: 2 }), controls: undefined });
    mapRef.current = map;
    return () => {
      map.setTarget(undefined);
      mapRef.current = null;
    };
  }, []);

  useEffect(() => {
    const map = mapRef.current;
    if (!map) return;
    for (const layer of map.getLayers().getArray().slice()) map.removeLayer(layer);
    const extentSource = new VectorSource();
    for (const spec of layers) {
      const source = new VectorSource({ features: geojson.readFeatures(spec.data) });
      extentSource.addFeatures(source.getFeatures());
      map.addLayer(
        new VectorLayer({
          source,
          properties: { id: spec.id },
          style: (feature) =>
            new Style({
              fill: new Fill({ color: spec.fill }),
              stroke: new Stroke({ color: spec.stroke, width: spec.strokeWidth ?? 2, lineDash: spec.dashed ? [6, 4] : undefined }),
              text: spec.labelProperty
                ? new Text({
                    text: String(feature.get(spec.labelProperty) ?? ''),
                    font: '12px "Merriweather Sans", sans-serif',
                    fill: new Fill({ color: '#0c2238' }),
                    stroke: new Stroke({ color: '#ffffff', width: 3 }),
                    overflow: false,
                  })
                : undefined,
            }),
        }),
      );
    }
    const extent = extentSource.getExtent();
    if (extent && extentSource.getFeatures().length && Number.isFinite(extent[0])) {
      map.getView().fit(extent, { padding: [24, 24, 24, 24], maxZoom: 16 });
    }
  }, [layers]);

  return (
    <figure className="m-0">
      <div ref={target} role="img" aria-label={ariaLabel} style={{ height }} className="w-full rounded-md border border-shell-300 bg-deep-50" />
      <figcaption className="mt-2 flex flex-wrap gap-4 text-xs text-shell-700">
        {layers.map((l) => (
          <span key={l.id} className="flex items-center gap-1">
            <span
              aria-hidden
              className="inline-block h-3 w-5"
              style={{ background: l.fill, border: `2px ${l.dashed ? 'dashed' : 'solid'} ${l.stroke}` }}
            />
            {l.label}
          </span>
        ))}
      </figcaption>
    </figure>
  );
}
