/**
 * A small OpenLayers map of vector layers only (works with no internet). Loaded lazily by
 * LazyVectorMap so the map code stays out of the first page's JavaScript.
 */
import 'ol/ol.css';
import type { FeatureCollection } from 'geojson';
import OlMap from 'ol/Map';
import View from 'ol/View';
import type { FeatureLike } from 'ol/Feature';
import GeoJSON from 'ol/format/GeoJSON';
import MVT from 'ol/format/MVT';
import { MultiPolygon, Point, Polygon } from 'ol/geom';
import TileLayer from 'ol/layer/Tile';
import VectorLayer from 'ol/layer/Vector';
import VectorTileLayer from 'ol/layer/VectorTile';
import VectorSource from 'ol/source/Vector';
import VectorTileSource from 'ol/source/VectorTile';
import XYZ from 'ol/source/XYZ';
import { Circle, Fill, Stroke, Style, Text } from 'ol/style';
import { useEffect, useRef } from 'react';

export interface MapLayerSpec {
  id: string;
  label: string;
  /** The features, or (with `tileUrl`) an empty collection. */
  data: FeatureCollection;
  /**
   * Mapbox Vector Tiles instead of `data`, e.g. "/api/v1/tiles/leases/{z}/{x}/{y}?riverId=…": for
   * jurisdictions with more features than a browser should hold at once.
   */
  tileUrl?: string;
  /** With `tileUrl`: a function of the tile feature's properties giving its fill and outline colours. */
  tileColours?: (properties: Record<string, unknown>) => { fill: string; stroke: string };
  /** Radius in pixels of point features (river mouths, stations), drawn as circles. */
  pointRadius?: number;
  /** Below this zoom, polygons are drawn as dots at their interior point, so small leases stay visible. */
  dotsBelowZoom?: number;
  fill: string;
  stroke: string;
  strokeWidth?: number;
  /** Dashed outline as a second cue beside colour. */
  dashed?: boolean;
  /** Property shown as a label on each feature. */
  labelProperty?: string;
  /** Property holding a per-feature fill colour (overrides `fill`). */
  fillProperty?: string;
  /** Property holding a per-feature outline colour (overrides `stroke`). */
  strokeProperty?: string;
  /** Left out of the map's own legend (the page draws its own). */
  hideInLegend?: boolean;
}

export interface MapSelection {
  layerId: string;
  properties: Record<string, unknown>;
  /** Pixel of the click inside the map. */
  pixel: [number, number];
}

export interface VectorMapProps {
  layers: MapLayerSpec[];
  height?: number | string;
  ariaLabel: string;
  /** Fit the view to these layers only (default: all). */
  fitTo?: string[];
  /** 'always' re-fits whenever the layers change; 'once' only the first time there is something to show. */
  fit?: 'always' | 'once';
  maxZoom?: number;
  /** Called with the top-most clicked feature of a clickable layer, or null for a click on empty water. */
  onSelect?: (selection: MapSelection | null) => void;
  clickableLayers?: string[];
  /** Written to the map's data-drawn attribute once these layers are on the map (for tests and printing). */
  drawnKey?: string;
  showLegend?: boolean;
  /** An XYZ raster basemap drawn beneath the vector layers (off unless given; needs internet). */
  basemap?: { url: string; attribution: string } | null;
}

const geojson = new GeoJSON({ dataProjection: 'EPSG:4326', featureProjection: 'EPSG:3857' });

/** The map's canvases flattened into one PNG data URL, or null if there is no map in `container`. */
export function mapImage(container: HTMLElement | null): { dataUrl: string; width: number; height: number } | null {
  const canvases = container ? [...container.querySelectorAll<HTMLCanvasElement>('.ol-layer canvas, canvas.ol-layer')] : [];
  if (!canvases.length) return null;
  const width = canvases[0].width;
  const height = canvases[0].height;
  const out = document.createElement('canvas');
  out.width = width;
  out.height = height;
  const ctx = out.getContext('2d');
  if (!ctx) return null;
  ctx.fillStyle = '#eef3f8';
  ctx.fillRect(0, 0, width, height);
  for (const c of canvases) if (c.width > 0) ctx.drawImage(c, 0, 0, width, height);
  return { dataUrl: out.toDataURL('image/png'), width, height };
}

export default function VectorMap({
  layers,
  height = 320,
  ariaLabel,
  fitTo,
  fit = 'always',
  maxZoom = 16,
  onSelect,
  clickableLayers,
  drawnKey,
  showLegend = true,
  basemap = null,
}: VectorMapProps) {
  const target = useRef<HTMLElement>(null);
  const mapRef = useRef<OlMap | null>(null);
  const fitted = useRef(false);
  const selectRef = useRef(onSelect);
  selectRef.current = onSelect;
  const clickableRef = useRef(clickableLayers);
  clickableRef.current = clickableLayers;

  useEffect(() => {
    if (!target.current) return;
    const map = new OlMap({ target: target.current, view: new View({ center: [0, 0], zoom: 2 }), controls: undefined });
    mapRef.current = map;
    map.on('singleclick', (event) => {
      const handler = selectRef.current;
      if (!handler) return;
      let found: MapSelection | null = null;
      map.forEachFeatureAtPixel(
        event.pixel,
        (feature, layer) => {
          const layerId = String(layer?.get('id') ?? '');
          if (clickableRef.current && !clickableRef.current.includes(layerId)) return undefined;
          const { geometry: _g, ...properties } = feature.getProperties();
          found = { layerId, properties, pixel: [event.pixel[0], event.pixel[1]] };
          return true;
        },
        { hitTolerance: 3 },
      );
      handler(found);
    });
    return () => {
      map.setTarget(undefined);
      mapRef.current = null;
    };
  }, []);

  useEffect(() => {
    const map = mapRef.current;
    if (!map) return;
    for (const layer of map.getLayers().getArray().slice()) map.removeLayer(layer);
    if (basemap) {
      map.addLayer(
        new TileLayer({
          source: new XYZ({ url: basemap.url, attributions: basemap.attribution || undefined, crossOrigin: 'anonymous' }),
          properties: { id: 'basemap' },
        }),
      );
    }
    const extentSource = new VectorSource();
    for (const spec of layers) {
      const styleFor = (feature: FeatureLike, resolution: number) => {
        const props = feature.getProperties();
        const tinted = spec.tileColours?.(props);
        const fill = new Fill({ color: tinted?.fill ?? ((spec.fillProperty && (props[spec.fillProperty] as string)) || spec.fill) });
        const stroke = new Stroke({
          color: tinted?.stroke ?? ((spec.strokeProperty && (props[spec.strokeProperty] as string)) || spec.stroke),
          width: spec.strokeWidth ?? 2,
          lineDash: spec.dashed ? [6, 4] : undefined,
        });
        const zoom = map.getView().getZoomForResolution(resolution) ?? 99;
        const geometry = feature.getGeometry();
        const asDot = geometry?.getType() === 'Point' || (spec.dotsBelowZoom !== undefined && zoom < spec.dotsBelowZoom);
        const showLabel = spec.labelProperty && (!asDot || geometry?.getType() === 'Point' || zoom >= (spec.dotsBelowZoom ?? 0) - 1);
        const text = showLabel
          ? new Text({
              text: String(props[spec.labelProperty as string] ?? ''),
              font: '12px "Merriweather Sans", sans-serif',
              fill: new Fill({ color: '#0c2238' }),
              stroke: new Stroke({ color: '#ffffff', width: 3 }),
              offsetY: asDot ? -14 : 0,
              overflow: true,
            })
          : undefined;
        if (asDot) {
          let dot: Point | undefined;
          if (geometry instanceof Point) dot = geometry;
          else if (geometry instanceof Polygon) dot = geometry.getInteriorPoint();
          else if (geometry instanceof MultiPolygon) dot = new Point(geometry.getInteriorPoints().getFirstCoordinate());
          return new Style({
            geometry: dot,
            image: new Circle({
              radius: spec.pointRadius ?? 5,
              fill,
              stroke: new Stroke({ color: stroke.getColor() ?? undefined, width: 2 }),
              // Dots always draw; only their labels give way to each other.
              declutterMode: 'none',
            }),
            text,
          });
        }
        return new Style({ fill, stroke, text });
      };
      if (spec.tileUrl) {
        map.addLayer(
          new VectorTileLayer({
            source: new VectorTileSource({ format: new MVT(), url: spec.tileUrl, maxZoom: 16 }),
            properties: { id: spec.id },
            style: styleFor,
            declutter: Boolean(spec.labelProperty),
          }),
        );
        continue;
      }
      const source = new VectorSource({ features: geojson.readFeatures(spec.data) });
      if (!fitTo || fitTo.includes(spec.id)) extentSource.addFeatures(source.getFeatures());
      map.addLayer(new VectorLayer({ source, properties: { id: spec.id }, style: styleFor, declutter: Boolean(spec.labelProperty) }));
    }
    const extent = extentSource.getExtent();
    if ((fit === 'always' || !fitted.current) && extent && extentSource.getFeatures().length && Number.isFinite(extent[0])) {
      // A map mounted by a lazy chunk may not be laid out yet; fitting a zero-size map zooms
      // in to maxZoom, so measure first and fit again once the map has a size.
      const fitExtent = () => map.getView().fit(extent, { padding: [24, 24, 24, 24], maxZoom, size: map.getSize() });
      map.updateSize();
      const size = map.getSize();
      if (size && size[0] > 0 && size[1] > 0) fitExtent();
      else map.once('change:size', fitExtent);
      fitted.current = true;
    }
    if (target.current) {
      if (drawnKey) target.current.dataset.drawn = drawnKey;
      else delete target.current.dataset.drawn;
    }
  }, [layers, fitTo, fit, maxZoom, drawnKey, basemap]);

  const legend = layers.filter((l) => !l.hideInLegend);
  return (
    <figure className="m-0">
      {/* A labelled section (a region), not an image: it holds the zoom buttons, which stay reachable by keyboard. */}
      <section
        ref={target}
        aria-roledescription="map"
        data-map=""
        aria-label={ariaLabel}
        style={{ height }}
        className="w-full rounded-md border border-shell-300 bg-deep-50"
      />
      {showLegend && legend.length > 0 && (
        <figcaption className="mt-2 flex flex-wrap gap-x-4 gap-y-1 text-xs text-shell-700">
          {legend.map((l) => (
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
      )}
    </figure>
  );
}
