/**
 * How plume bands are drawn: one sequential scale of our own (pale estuary to deep water) for
 * how fresh the water gets, the faecal indicator band as a plum dashed outline on top, and the
 * coast path as a line. Every band also has a dash pattern and a name in the legend.
 */
import type { FeatureCollection } from 'geojson';

export interface BandStyle {
  label: string;
  fill: string;
  stroke: string;
  dashed: boolean;
  order: number;
}

const FIXED: Record<string, BandStyle> = {
  'plume-edge': { label: 'Plume edge (any river water)', fill: 'rgba(190, 221, 214, 0.45)', stroke: '#5d9c8b', dashed: true, order: 1 },
  'brackish-margin': { label: 'Brackish margin', fill: 'rgba(120, 176, 190, 0.45)', stroke: '#2f7a86', dashed: true, order: 2 },
  'fresh-core': { label: 'Fresh core', fill: 'rgba(23, 61, 97, 0.55)', stroke: '#0c2238', dashed: false, order: 4 },
  bulge: { label: 'Bulge near the mouth', fill: 'rgba(46, 91, 134, 0.18)', stroke: '#173d61', dashed: false, order: 1.5 },
  'indicator-over-standard': {
    label: 'Indicator above the approved-area standard',
    fill: 'rgba(79, 26, 63, 0.08)',
    stroke: '#4f1a3f',
    dashed: true,
    order: 6,
  },
  path: { label: 'Coast followed by the plume', fill: 'rgba(0,0,0,0)', stroke: '#9c7a3f', dashed: true, order: 7 },
};

const SPECIES_BAND: BandStyle = {
  label: 'Under the species’ salinity limit',
  fill: 'rgba(46, 91, 134, 0.45)',
  stroke: '#173d61',
  dashed: false,
  order: 3,
};

export function bandStyle(bandId: string, name?: string): BandStyle {
  if (FIXED[bandId]) return { ...FIXED[bandId], label: name && bandId !== 'path' ? name : FIXED[bandId].label };
  if (bandId.startsWith('salinity-under-')) return { ...SPECIES_BAND, label: name ?? `Salinity under ${bandId.slice(15)}` };
  return { label: name ?? bandId, fill: 'rgba(124,125,120,0.2)', stroke: '#4b4c48', dashed: true, order: 0 };
}

/** Bands drawn by default: the named bands, plus one salinity band if asked (a species' limit). */
export function bandsToDraw(fc: FeatureCollection, speciesBandId?: string) {
  const wanted = new Set([...Object.keys(FIXED), ...(speciesBandId ? [speciesBandId] : [])]);
  return fc.features
    .filter((f) => wanted.has(String(f.properties?.bandId ?? f.id)))
    .map((f) => {
      const id = String(f.properties?.bandId ?? f.id);
      return { id, style: bandStyle(id, f.properties?.name as string | undefined), feature: f };
    })
    .sort((a, b) => a.style.order - b.style.order);
}
