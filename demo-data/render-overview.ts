/**
 * Draws an overview of the generated demo region (land, island, leases coloured by grower,
 * candidates dashed, closure zones dashed, river mouths, stations) as SVG and converts it to PNG
 * with headless chromium: screenshots/demo-region.png (whole region) and
 * screenshots/demo-region-bay.png (the Amberlin mouth to beyond Gullstone Head) and
 * screenshots/demo-region-tolley.png (the coast south of the Amberlin). For checking by eye only.
 *
 * Run after generate.ts: cd /work/main && npx tsx demo-data/render-overview.ts
 */
import { execFileSync } from 'node:child_process';
import { mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import type { FeatureCollection, MultiLineString, MultiPolygon, Point, Polygon, LineString } from 'geojson';
import { GROWERS } from './lib/growers';
import { fromLonLat, type Xy } from './lib/local-frame';

const here = path.resolve(import.meta.dirname);
const shots = path.resolve(here, '..', 'screenshots');
const read = <T>(file: string): T => JSON.parse(readFileSync(path.join(here, file), 'utf8')) as T;

const land = read<FeatureCollection<MultiPolygon>>('coast/fennick-land.geojson');
const leases = read<FeatureCollection<Polygon>>('leases/fennick-leases.geojson');
const zones = read<FeatureCollection<Polygon>>('zones/fennick-zones.geojson');
const stations = read<FeatureCollection<Point>>('monitoring/stations.geojson');
const riverLines = read<FeatureCollection<LineString>>('rivers/river-lines.geojson');
const shore = read<FeatureCollection<MultiLineString>>('coast/fennick-shoreline.geojson');
const rivers = read<{ rivers: { name: string; mouth: [number, number] }[] }>('rivers/rivers.json').rivers;

const COLOURS: Record<string, string> = {
  'Saltreed Oysters': '#c8324a',
  'Carrick Mussel Lines': '#1d6fb8',
  'Skerrow Clam Company': '#e08a00',
  'Gullstone Shellfish': '#2e8b3e',
};

interface View {
  file: string;
  /** Local-frame window [m]. */
  minX: number;
  maxX: number;
  minY: number;
  maxY: number;
  /** Pixels per metre. */
  scale: number;
  labelLeases: boolean;
}

const views: View[] = [
  { file: 'demo-region', minX: -25_000, maxX: 12_000, minY: -56_000, maxY: 56_000, scale: 0.012, labelLeases: false },
  { file: 'demo-region-bay', minX: -12_000, maxX: 6_000, minY: -4_000, maxY: 50_000, scale: 0.03, labelLeases: true },
  { file: 'demo-region-tolley', minX: -12_000, maxX: 6_000, minY: -56_000, maxY: -4_000, scale: 0.03, labelLeases: true },
];

mkdirSync(shots, { recursive: true });
for (const v of views) {
  const width = Math.round((v.maxX - v.minX) * v.scale);
  const height = Math.round((v.maxY - v.minY) * v.scale);
  const px = (q: [number, number] | number[]): Xy => {
    const [x, y] = fromLonLat([q[0], q[1]]);
    return [(x - v.minX) * v.scale, (v.maxY - y) * v.scale];
  };
  const d = (ring: number[][]) =>
    `M${ring
      .map((q) =>
        px(q)
          .map((n) => n.toFixed(1))
          .join(','),
      )
      .join('L')}Z`;
  const line = (coords: number[][]) =>
    `M${coords
      .map((q) =>
        px(q)
          .map((n) => n.toFixed(1))
          .join(','),
      )
      .join('L')}`;
  const parts: string[] = [];
  parts.push(`<rect width="${width}" height="${height}" fill="#cfe6f2"/>`);
  for (const f of land.features)
    for (const poly of f.geometry.coordinates) parts.push(`<path d="${d(poly[0])}" fill="#efe4c8" stroke="none"/>`);
  for (const f of shore.features)
    for (const l of f.geometry.coordinates) parts.push(`<path d="${line(l)}" fill="none" stroke="#6b5a3a" stroke-width="1"/>`);
  for (const f of riverLines.features)
    parts.push(`<path d="${line(f.geometry.coordinates)}" fill="none" stroke="#3a86c8" stroke-width="3"/>`);
  for (const f of zones.features) {
    parts.push(
      `<path d="${d(f.geometry.coordinates[0])}" fill="#7b3fa0" fill-opacity="0.08" stroke="#7b3fa0" stroke-width="2" stroke-dasharray="8 5"/>`,
    );
  }
  for (const f of leases.features) {
    const p = f.properties as Record<string, string>;
    const colour = COLOURS[p.HOLDER] ?? '#000';
    const dash = p.STATUS === 'candidate' ? ' stroke-dasharray="3 2"' : '';
    parts.push(
      `<path d="${d(f.geometry.coordinates[0])}" fill="${colour}" fill-opacity="${p.STATUS === 'candidate' ? 0.35 : 0.8}" stroke="${colour}" stroke-width="1.5"${dash}/>`,
    );
    if (v.labelLeases) {
      const [x, y] = px(f.geometry.coordinates[0][0]);
      parts.push(
        `<text x="${(x + 4).toFixed(1)}" y="${(y - 3).toFixed(1)}" font-size="10" font-family="sans-serif" fill="#222">${p.LEASE_ID.slice(3)}</text>`,
      );
    }
  }
  for (const f of stations.features) {
    const [x, y] = px(f.geometry.coordinates);
    parts.push(`<path d="M${x},${y - 6}L${x + 5},${y + 4}L${x - 5},${y + 4}Z" fill="#111"/>`);
    parts.push(
      `<text x="${x + 7}" y="${y + 4}" font-size="11" font-family="sans-serif" fill="#111">${(f.properties as Record<string, string>).STATION_ID}</text>`,
    );
  }
  for (const r of rivers) {
    const [x, y] = px(r.mouth);
    parts.push(`<circle cx="${x}" cy="${y}" r="6" fill="#3a86c8" stroke="#fff" stroke-width="2"/>`);
    parts.push(
      `<text x="${x + 9}" y="${y - 14}" font-size="14" font-family="sans-serif" font-weight="bold" fill="#1f4f7a">${r.name}</text>`,
    );
  }
  const label = (text: string, at: Xy, size = 16, colour = '#333') => {
    const x = (at[0] - v.minX) * v.scale;
    const y = (v.maxY - at[1]) * v.scale;
    parts.push(
      `<text x="${x}" y="${y}" font-size="${size}" font-family="sans-serif" font-style="italic" fill="${colour}" text-anchor="middle">${text}</text>`,
    );
  };
  label('Fennick Bay', [-3500, 16000], 16, '#1f4f7a');
  label('Gullstone Head', [-9500, 30900], 14, '#5a4a2a');
  label('Skerrow Island', [-11500, 44500], 13, '#5a4a2a');
  label('open sea (invented region)', [-20_000, -2_000], 14, '#4a7a9a');
  // Legend, scale bar and north arrow.
  const lx = 12;
  let ly = 20;
  parts.push(`<rect x="4" y="4" width="225" height="${28 + GROWERS.length * 18 + 54}" fill="#fff" fill-opacity="0.85" stroke="#999"/>`);
  parts.push(`<text x="${lx}" y="${ly}" font-size="13" font-family="sans-serif" font-weight="bold">Fennick coast demo region</text>`);
  for (const g of GROWERS) {
    ly += 18;
    parts.push(`<rect x="${lx}" y="${ly - 10}" width="14" height="12" fill="${COLOURS[g.name]}"/>`);
    parts.push(`<text x="${lx + 20}" y="${ly}" font-size="12" font-family="sans-serif">${g.name}</text>`);
  }
  ly += 18;
  parts.push(`<text x="${lx}" y="${ly}" font-size="11" font-family="sans-serif">pale/dashed lease = candidate</text>`);
  ly += 16;
  parts.push(
    `<path d="M${lx},${ly - 4}h20" stroke="#7b3fa0" stroke-width="2" stroke-dasharray="6 3"/><text x="${lx + 26}" y="${ly}" font-size="11" font-family="sans-serif">closure zone</text>`,
  );
  ly += 16;
  parts.push(
    `<path d="M${lx + 7},${ly - 9}L${lx + 12},${ly + 1}L${lx + 2},${ly + 1}Z" fill="#111"/><text x="${lx + 26}" y="${ly}" font-size="11" font-family="sans-serif">monitoring station</text>`,
  );
  const bar = 5000 * v.scale;
  parts.push(
    `<path d="M12,${height - 20}h${bar}" stroke="#111" stroke-width="3"/><text x="12" y="${height - 26}" font-size="12" font-family="sans-serif">5 km</text>`,
  );
  parts.push(
    `<path d="M${width - 30},${height - 20}V${height - 60}l-6,12h12l-6,-12" stroke="#111" stroke-width="2" fill="#111"/><text x="${width - 35}" y="${height - 64}" font-size="13" font-family="sans-serif">N</text>`,
  );
  const svg = `<svg xmlns="http://www.w3.org/2000/svg" width="${width}" height="${height}" viewBox="0 0 ${width} ${height}">${parts.join('')}</svg>`;
  const svgFile = path.join(shots, `${v.file}.svg`);
  writeFileSync(svgFile, svg);
  execFileSync(
    'chromium',
    [
      '--headless',
      '--no-sandbox',
      '--disable-gpu',
      '--hide-scrollbars',
      `--screenshot=${path.join(shots, `${v.file}.png`)}`,
      `--window-size=${width},${height}`,
      `file://${svgFile}`,
    ],
    { stdio: 'ignore' },
  );
  process.stdout.write(`wrote ${path.join(shots, `${v.file}.png`)} (${width}×${height})\n`);
}
