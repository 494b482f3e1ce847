/**
 * @module shared/geometry/write-kml
 * An export layer → a KML 2.2 document (OGC 07-147r2): one Document whose description carries the readme
 * (model version, cautions), a Schema declaring every field (so GDAL's KML driver and globe viewers read the
 * attributes with their names), and one Placemark per feature with its fields as SchemaData. KML is WGS 84
 * longitude/latitude by definition (§6.2), which is the export's CRS.
 */
import type { Geometry, Position } from 'geojson';
import { type ExportLayer, fieldType } from './export-layer';

const esc = (s: string) => s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');
/** A KML-safe id from a name (NCName: letters, digits, '_', '-', '.'). */
const idOf = (s: string) => `s_${s.replace(/[^A-Za-z0-9_.-]/g, '_')}`;

function coords(line: Position[]): string {
  return line.map((p) => `${round(p[0])},${round(p[1])}`).join(' ');
}
/** 1e-9 degree is ~0.1 mm: no visible rounding, shorter files. */
const round = (v: number) => String(Math.round(v * 1e9) / 1e9);

function geometryKml(g: Geometry): string {
  switch (g.type) {
    case 'Point':
      return `<Point><coordinates>${coords([g.coordinates])}</coordinates></Point>`;
    case 'LineString':
      return `<LineString><coordinates>${coords(g.coordinates)}</coordinates></LineString>`;
    case 'Polygon':
      return `<Polygon>${g.coordinates
        .map((ring, i) => `<${i ? 'innerBoundaryIs' : 'outerBoundaryIs'}><LinearRing><coordinates>${coords(ring)}</coordinates></LinearRing></${i ? 'innerBoundaryIs' : 'outerBoundaryIs'}>`)
        .join('')}</Polygon>`;
    case 'MultiPoint':
      return `<MultiGeometry>${g.coordinates.map((c) => geometryKml({ type: 'Point', coordinates: c })).join('')}</MultiGeometry>`;
    case 'MultiLineString':
      return `<MultiGeometry>${g.coordinates.map((c) => geometryKml({ type: 'LineString', coordinates: c })).join('')}</MultiGeometry>`;
    case 'MultiPolygon':
      return `<MultiGeometry>${g.coordinates.map((c) => geometryKml({ type: 'Polygon', coordinates: c })).join('')}</MultiGeometry>`;
    case 'GeometryCollection':
      return `<MultiGeometry>${g.geometries.map(geometryKml).join('')}</MultiGeometry>`;
  }
}

/**
 * Writes a layer as KML text.
 *
 * @param layer - the layer (EPSG:4326).
 * @param nameField - the field shown as each placemark's name (e.g. 'Lease id'); also kept as data.
 * @returns the KML document (UTF-8 text).
 * @example
 * writeKml({ name: 'zones', title: 'Closure zones', fields: ['Name'], features: [...], readme: [['Model version', 'brackline-model-1.0.0']] }, 'Name')
 */
export function writeKml(layer: ExportLayer, nameField?: string): string {
  const schemaId = idOf(layer.name);
  const types = new Map(layer.fields.map((f) => [f, fieldType(layer.features.map((x) => x.properties[f] ?? null))]));
  const kmlType = (t: string) => (t === 'INTEGER' ? 'int' : t === 'REAL' ? 'double' : 'string');
  const description = layer.readme.map(([k, v]) => `${k}: ${v}`).join('\n\n');
  const out: string[] = [
    '<?xml version="1.0" encoding="UTF-8"?>',
    '<kml xmlns="http://www.opengis.net/kml/2.2">',
    '<Document>',
    `<name>${esc(layer.title)}</name>`,
    `<description>${esc(description)}</description>`,
    `<Schema name="${esc(layer.name)}" id="${schemaId}">`,
    ...layer.fields.map((f) => `<SimpleField name="${esc(f)}" type="${kmlType(types.get(f)!)}"><displayName>${esc(f)}</displayName></SimpleField>`),
    '</Schema>',
    `<Folder><name>${esc(layer.name)}</name>`,
  ];
  for (const f of layer.features) {
    const name = nameField ? f.properties[nameField] : null;
    out.push(
      '<Placemark>',
      ...(name !== null && name !== undefined ? [`<name>${esc(String(name))}</name>`] : []),
      `<ExtendedData><SchemaData schemaUrl="#${schemaId}">`,
      ...layer.fields
        .filter((k) => f.properties[k] !== null && f.properties[k] !== undefined)
        .map((k) => {
          const v = f.properties[k];
          return `<SimpleData name="${esc(k)}">${esc(typeof v === 'boolean' ? (v ? '1' : '0') : String(v))}</SimpleData>`;
        }),
      '</SchemaData></ExtendedData>',
      geometryKml(f.geometry),
      '</Placemark>',
    );
  }
  out.push('</Folder>', '</Document>', '</kml>', '');
  return out.join('\n');
}
