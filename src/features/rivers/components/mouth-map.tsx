/**
 * Place a river mouth on the map: with "Place the mouth" pressed, press on the coast where the river
 * meets the sea and drag towards the sea; the arrow gives the outflow direction. The coast drawn is
 * the built-in world coastline around the place shown (or the user's own coasts). Loaded with the
 * rivers page only.
 */
import 'ol/ol.css';
import type { FeatureCollection, Geometry } from 'geojson';
import OlMap from 'ol/Map';
import View from 'ol/View';
import Feature from 'ol/Feature';
import GeoJSON from 'ol/format/GeoJSON';
import { LineString, Point } from 'ol/geom';
import PointerInteraction from 'ol/interaction/Pointer';
import VectorLayer from 'ol/layer/Vector';
import { fromLonLat, toLonLat } from 'ol/proj';
import VectorSource from 'ol/source/Vector';
import { Circle, Fill, RegularShape, Stroke, Style } from 'ol/style';
import { useEffect, useRef } from 'react';
import { initialBearingDeg } from '#shared/geometry/bearing';

const geojson = new GeoJSON({ dataProjection: 'EPSG:4326', featureProjection: 'EPSG:3857' });

export interface MouthMapProps {
  /** Where to look (the "Go to" place), at bay scale. */
  centre: [number, number] | null;
  /** Coastlines to draw (the built-in one around the centre, and the user's own). */
  coasts: Geometry[];
  mouth: [number, number] | null;
  azimuthDeg: number | null;
  placing: boolean;
  onPlace: (lonLat: [number, number]) => void;
  onAzimuth: (deg: number) => void;
  onPlacingDone: () => void;
}

export default function MouthMap({ centre, coasts, mouth, azimuthDeg, placing, onPlace, onAzimuth, onPlacingDone }: MouthMapProps) {
  const target = useRef<HTMLDivElement>(null);
  const mapRef = useRef<OlMap | null>(null);
  const coastSource = useRef(new VectorSource());
  const mouthSource = useRef(new VectorSource());
  const props = useRef({ placing, onPlace, onAzimuth, onPlacingDone });
  props.current = { placing, onPlace, onAzimuth, onPlacingDone };

  useEffect(() => {
    if (!target.current) return;
    const arrowStyle = (feature: Feature) => {
      const geometry = feature.getGeometry();
      if (geometry instanceof Point) {
        return new Style({ image: new Circle({ radius: 6, fill: new Fill({ color: '#0c2238' }), stroke: new Stroke({ color: '#fff', width: 2 }) }) });
      }
      const line = geometry as LineString;
      const [start, end] = [line.getFirstCoordinate(), line.getLastCoordinate()];
      const angle = Math.atan2(end[0] - start[0], end[1] - start[1]);
      return [
        new Style({ stroke: new Stroke({ color: '#b4501e', width: 3 }) }),
        new Style({
          geometry: new Point(end),
          image: new RegularShape({ points: 3, radius: 9, rotation: angle, fill: new Fill({ color: '#b4501e' }) }),
        }),
      ];
    };
    const map = new OlMap({
      target: target.current,
      view: new View({ center: fromLonLat([0, 20]), zoom: 2 }),
      layers: [
        new VectorLayer({ source: coastSource.current, style: new Style({ stroke: new Stroke({ color: '#4b4c48', width: 2 }) }) }),
        new VectorLayer({ source: mouthSource.current, style: (f) => arrowStyle(f as Feature) }),
      ],
    });
    mapRef.current = map;
    let start: number[] | null = null;
    const arrow = new Feature<LineString>();
    const interaction = new PointerInteraction({
      handleDownEvent: (e) => {
        if (!props.current.placing) return false;
        start = e.coordinate;
        props.current.onPlace(toLonLat(start) as [number, number]);
        return true;
      },
      handleDragEvent: (e) => {
        if (!start) return;
        arrow.setGeometry(new LineString([start, e.coordinate]));
        if (!mouthSource.current.hasFeature(arrow)) mouthSource.current.addFeature(arrow);
      },
      handleUpEvent: (e) => {
        if (start) {
          const moved = Math.hypot(e.coordinate[0] - start[0], e.coordinate[1] - start[1]) / (map.getView().getResolution() ?? 1);
          if (moved > 8) props.current.onAzimuth(Math.round(initialBearingDeg(toLonLat(start) as [number, number], toLonLat(e.coordinate) as [number, number])));
        }
        start = null;
        props.current.onPlacingDone();
        return false;
      },
    });
    map.addInteraction(interaction);
    return () => {
      map.setTarget(undefined);
      mapRef.current = null;
    };
  }, []);

  useEffect(() => {
    const map = mapRef.current;
    if (!map || !centre) return;
    map.getView().setCenter(fromLonLat(centre));
    map.getView().setZoom(11);
  }, [centre]);

  useEffect(() => {
    coastSource.current.clear();
    const fc: FeatureCollection = { type: 'FeatureCollection', features: coasts.map((g) => ({ type: 'Feature', properties: {}, geometry: g })) };
    coastSource.current.addFeatures(geojson.readFeatures(fc));
    if (target.current) target.current.dataset.coast = coasts.length ? 'drawn' : 'none';
  }, [coasts]);

  useEffect(() => {
    mouthSource.current.clear();
    if (!mouth) {
      if (target.current) delete target.current.dataset.mouth;
      return;
    }
    const at = fromLonLat(mouth);
    mouthSource.current.addFeature(new Feature(new Point(at)));
    if (azimuthDeg !== null && Number.isFinite(azimuthDeg)) {
      // The arrow is drawn 60 px long whatever the zoom.
      const length = 60 * (mapRef.current?.getView().getResolution() ?? 100);
      const rad = (azimuthDeg * Math.PI) / 180;
      mouthSource.current.addFeature(new Feature(new LineString([at, [at[0] + length * Math.sin(rad), at[1] + length * Math.cos(rad)]])));
    }
    if (target.current) target.current.dataset.mouth = 'placed';
  }, [mouth, azimuthDeg]);

  return (
    <div
      ref={target}
      role="application"
      aria-label="Map for placing the river mouth: press Place the mouth, then press on the coast and drag towards the sea"
      style={{ height: 360, cursor: placing ? 'crosshair' : undefined }}
      className="w-full rounded-md border border-shell-300 bg-deep-50"
    />
  );
}
