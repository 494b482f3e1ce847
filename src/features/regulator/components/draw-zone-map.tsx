/**
 * Draw a zone's outline on a vector map: click the corners, double-click (or click the first
 * corner) to finish. Existing zones are shown for reference. Loaded with the zones page only.
 */
import 'ol/ol.css';
import type { FeatureCollection, Polygon } from 'geojson';
import OlMap from 'ol/Map';
import View from 'ol/View';
import GeoJSON from 'ol/format/GeoJSON';
import Draw from 'ol/interaction/Draw';
import VectorLayer from 'ol/layer/Vector';
import VectorSource from 'ol/source/Vector';
import { Fill, Stroke, Style, Text } from 'ol/style';
import { useEffect, useRef } from 'react';

const geojson = new GeoJSON({ dataProjection: 'EPSG:4326', featureProjection: 'EPSG:3857' });

export default function DrawZoneMap({
  context,
  onDrawn,
  resetKey,
}: {
  context: FeatureCollection;
  onDrawn: (polygon: Polygon | null) => void;
  /** Changing it clears the drawing. */
  resetKey: number;
}) {
  const target = useRef<HTMLDivElement>(null);
  const drawnSource = useRef(new VectorSource());
  const onDrawnRef = useRef(onDrawn);
  onDrawnRef.current = onDrawn;

  useEffect(() => {
    if (!target.current) return;
    const contextSource = new VectorSource({ features: geojson.readFeatures(context) });
    const map = new OlMap({
      target: target.current,
      view: new View({ center: [0, 0], zoom: 2 }),
      layers: [
        new VectorLayer({
          source: contextSource,
          style: (f) =>
            new Style({
              fill: new Fill({ color: 'rgba(124,125,120,0.12)' }),
              stroke: new Stroke({ color: '#4b4c48', width: 1.5, lineDash: [4, 4] }),
              text: new Text({
                text: String(f.get('name') ?? ''),
                font: '12px "Merriweather Sans", sans-serif',
                fill: new Fill({ color: '#22231f' }),
                stroke: new Stroke({ color: '#fff', width: 3 }),
              }),
            }),
        }),
        new VectorLayer({
          source: drawnSource.current,
          style: new Style({ fill: new Fill({ color: 'rgba(23, 61, 97, 0.25)' }), stroke: new Stroke({ color: '#0c2238', width: 2.5 }) }),
        }),
      ],
    });
    const fitView = () => {
      const extent = contextSource.getExtent();
      if (extent && contextSource.getFeatures().length && Number.isFinite(extent[0]))
        map.getView().fit(extent, { padding: [40, 40, 40, 40], size: map.getSize() });
      else map.getView().setCenter([0, 0]);
    };
    map.updateSize();
    const size = map.getSize();
    if (size && size[0] > 0) fitView();
    else map.once('change:size', fitView);

    const draw = new Draw({ source: drawnSource.current, type: 'Polygon' });
    draw.on('drawstart', () => drawnSource.current.clear());
    draw.on('drawend', (e) => {
      const written = geojson.writeGeometryObject(e.feature.getGeometry()!) as Polygon;
      onDrawnRef.current(written);
      if (target.current) target.current.dataset.drawn = 'zone';
    });
    map.addInteraction(draw);
    return () => {
      map.setTarget(undefined);
    };
  }, [context]);

  useEffect(() => {
    void resetKey;
    drawnSource.current.clear();
    onDrawnRef.current(null);
    if (target.current) delete target.current.dataset.drawn;
  }, [resetKey]);

  return (
    <div
      ref={target}
      role="application"
      aria-label="Map for drawing the zone: click each corner, double-click to finish"
      style={{ height: 380 }}
      className="w-full rounded-md border border-shell-300 bg-deep-50"
    />
  );
}
