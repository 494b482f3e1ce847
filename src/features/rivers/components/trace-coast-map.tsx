/**
 * Trace a coast on the map: click along the shore, double-click to finish. The built-in coastline
 * and the river mouth are drawn for reference. Loaded with the river page only.
 */
import 'ol/ol.css';
import type { Geometry, LineString as GeoLine } from 'geojson';
import OlMap from 'ol/Map';
import View from 'ol/View';
import Feature from 'ol/Feature';
import GeoJSON from 'ol/format/GeoJSON';
import { Point } from 'ol/geom';
import Draw from 'ol/interaction/Draw';
import VectorLayer from 'ol/layer/Vector';
import { fromLonLat } from 'ol/proj';
import VectorSource from 'ol/source/Vector';
import { Circle, Fill, Stroke, Style } from 'ol/style';
import { useEffect, useRef } from 'react';

const geojson = new GeoJSON({ dataProjection: 'EPSG:4326', featureProjection: 'EPSG:3857' });

export default function TraceCoastMap({ mouth, reference, onTraced }: { mouth: [number, number]; reference: Geometry | null; onTraced: (line: GeoLine) => void }) {
  const target = useRef<HTMLDivElement>(null);
  const onTracedRef = useRef(onTraced);
  onTracedRef.current = onTraced;
  useEffect(() => {
    if (!target.current) return;
    const context = new VectorSource();
    if (reference) context.addFeatures(geojson.readFeatures({ type: 'Feature', properties: {}, geometry: reference }));
    context.addFeature(new Feature(new Point(fromLonLat(mouth))));
    const traced = new VectorSource();
    const map = new OlMap({
      target: target.current,
      view: new View({ center: fromLonLat(mouth), zoom: 12 }),
      layers: [
        new VectorLayer({
          source: context,
          style: new Style({
            stroke: new Stroke({ color: '#7c7d78', width: 1.5, lineDash: [4, 4] }),
            image: new Circle({ radius: 5, fill: new Fill({ color: '#0c2238' }) }),
          }),
        }),
        new VectorLayer({ source: traced, style: new Style({ stroke: new Stroke({ color: '#b4501e', width: 3 }) }) }),
      ],
    });
    const draw = new Draw({ source: traced, type: 'LineString' });
    draw.on('drawstart', () => traced.clear());
    draw.on('drawend', (e) => {
      onTracedRef.current(geojson.writeGeometryObject(e.feature.getGeometry()!) as GeoLine);
      if (target.current) target.current.dataset.traced = 'yes';
    });
    map.addInteraction(draw);
    return () => map.setTarget(undefined);
  }, [mouth, reference]);
  return (
    <div
      ref={target}
      role="application"
      aria-label="Map for tracing the coast: click along the shore, double-click to finish"
      style={{ height: 320 }}
      className="w-full rounded-md border border-shell-300 bg-deep-50"
    />
  );
}
