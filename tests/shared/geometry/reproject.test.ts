import type { Feature, Polygon } from 'geojson';
import { describe, expect, it } from 'vitest';
import { crsDefinition, identifyCrs, searchCrs } from '../../../shared/geometry/crs-catalogue';
import { loadCrsCatalogue } from '../../../shared/geometry/load-crs-catalogue';
import { layerReprojector, reprojectLayer, toWgs84 } from '../../../shared/geometry/reproject';
import { UploadError } from '../../../shared/geometry/upload-error';
import { squarePolygon } from './square-polygon';

const catalogue = loadCrsCatalogue();
const utm30nWkt = catalogue['32630'].wkt!;

const square = (x: number, y: number, d: number): Feature<Polygon> => ({
  type: 'Feature',
  properties: { LEASE_ID: 'FB-014' },
  geometry: squarePolygon(x, y, d) as Polygon,
});

describe('toWgs84 against PROJ 9.1.1 cs2cs', () => {
  // Reference values: `echo "E N" | cs2cs -f %.10f EPSG:src EPSG:4326` with PROJ 9.1.1 (Debian 12), axis order swapped back to lon, lat.
  it.each([
    ['EPSG:32630 via its WKT', { wkt: utm30nWkt }, [500000, 5270000], [-3.0, 47.5834130206]],
    ['EPSG:32759 via the catalogue', { epsg: 32759 }, [435000, 5445000], [170.2254430131, -41.1437143521]],
    ['EPSG:2193 via the catalogue', { epsg: 2193 }, [1600000, 5440000], [173.0, -41.1913582797]],
    ['EPSG:2154 via the catalogue', { epsg: 2154 }, [250000, 6750000], [-3.0052332164, 47.6963102241]],
    [
      'EPSG:3857 via a proj4 string',
      { proj4: '+proj=merc +a=6378137 +b=6378137 +lat_ts=0 +lon_0=0 +x_0=0 +y_0=0 +k=1 +units=m +nadgrids=@null +no_defs' },
      [-330000, 6000000],
      [-2.9644404376, 47.3537047024],
    ],
  ])('%s', (_label, source, xy, lonLat) => {
    const out = toWgs84(source, catalogue)(xy);
    expect(out[0]).toBeCloseTo(lonLat[0], 8);
    expect(out[1]).toBeCloseTo(lonLat[1], 8);
  });

  it('knows EPSG:3857 without a catalogue (proj4 defines it; cs2cs reference as above)', () => {
    const out = toWgs84({ epsg: 3857 })([-330000, 6000000]);
    expect(out[0]).toBeCloseTo(-2.9644404376, 8);
    expect(out[1]).toBeCloseTo(47.3537047024, 8);
  });

  it('ignores a WKT axis-order declaration: shapefile coordinates are always easting first (ESRI shapefile technical description, X then Y)', () => {
    const northFirst = utm30nWkt.replace('AXIS["Easting",EAST],AXIS["Northing",NORTH]', 'AXIS["Northing",NORTH],AXIS["Easting",EAST]');
    expect(northFirst).not.toBe(utm30nWkt);
    expect(toWgs84({ wkt: northFirst })([500000, 5270000])).toEqual(toWgs84({ wkt: utm30nWkt })([500000, 5270000]));
  });
});

describe('reprojectLayer', () => {
  it('returns exactly the same numbers for EPSG:4326 input (identity, no degree-radian round trip)', () => {
    const f = square(-2.951000000000001, 47.58100000000003, 0.0045);
    const [out] = reprojectLayer({ name: 'leases', features: [f] }, { epsg: 4326, wkt: catalogue['4326'].wkt! });
    expect(out.geometry).toEqual(f.geometry);
    expect(out.geometry).not.toBe(f.geometry);
    expect(out.properties).toEqual({ LEASE_ID: 'FB-014' });
  });

  it('does not modify its input', () => {
    const f = square(500000, 5270000, 100);
    const before = JSON.stringify(f);
    reprojectLayer({ name: 'leases', features: [Object.freeze(f)] }, { wkt: utm30nWkt });
    expect(JSON.stringify(f)).toBe(before);
  });

  it('refuses an unknown CRS with crs_required (422)', () => {
    const call = () => reprojectLayer({ name: 'leases', features: [square(1, 2, 1)] }, { epsg: 999_999 }, catalogue);
    expect(call).toThrow(UploadError);
    expect(call).toThrow(/EPSG:999999 is not a coordinate system this server knows/);
    expect(() => reprojectLayer({ name: 'leases', features: [] }, {})).toThrow(/its coordinate system is unknown/);
  });

  it('refuses a position the CRS cannot convert with coordinates_out_of_range', () => {
    // A transverse Mercator easting of 1e12 m lies far outside the projection's domain: proj4 returns Infinity for it.
    const call = () => reprojectLayer({ name: 'leases', features: [square(500000, 5270000, 10), square(1e12, 0, 10)] }, { wkt: utm30nWkt });
    expect(call).toThrow(UploadError);
    expect(call).toThrow(/Feature 1 of layer “leases” has the position \(1000000000000, 0\), which the layer’s \.prj cannot convert/);
  });
  it('a chunk of a layer (layerReprojector) gives the same positions and names features by their index in the layer', () => {
    const layer = { name: 'leases', features: [square(500000, 5270000, 10), square(500100, 5270100, 10), square(500200, 5270200, 10)] };
    const convert = layerReprojector('leases', { wkt: utm30nWkt });
    expect([...convert(layer.features.slice(0, 2), 0), ...convert(layer.features.slice(2), 2)]).toEqual(reprojectLayer(layer, { wkt: utm30nWkt }));
    expect(() => convert([square(500000, 5270000, 10), square(1e12, 0, 10)], 4000)).toThrow(/^Feature 4001 of layer “leases” has the position \(1000000000000, 0\)/);
  });
});

describe('crs catalogue', () => {
  it('gives a code’s definition from epsg-index, or null', () => {
    const def = crsDefinition(catalogue, 2193)!;
    expect(def.name).toBe('NZGD2000 / New Zealand Transverse Mercator 2000');
    expect(def.proj4).toMatch(/\+proj=tmerc .*\+lon_0=173 /);
    expect(def.wkt).toMatch(/^PROJCS\["NZGD2000/);
    expect(crsDefinition(catalogue, 1)).toBeNull();
    expect(crsDefinition(catalogue, 2193.5)).toBeNull();
  });

  it('searches by code, words and word starts (projected and geographic only)', () => {
    expect(searchCrs(catalogue, '2193')[0]).toMatchObject({ code: 2193, kind: 'projected' });
    expect(
      searchCrs(catalogue, 'utm 33')
        .slice(0, 2)
        .map((r) => r.code),
    ).toEqual([32633, 32733]);
    const lambert = searchCrs(catalogue, 'lambert', 50);
    expect(lambert).toHaveLength(50);
    expect(lambert.every((r) => /lambert/i.test(r.name))).toBe(true);
    expect(searchCrs(catalogue, 'Lambert-93')[0].code).toBe(2154);
    expect(searchCrs(catalogue, 'nzgd2000').map((r) => r.code)).toContain(4167);
    expect(searchCrs(catalogue, 'crève coeur fennick')).toEqual([]);
    expect(searchCrs(catalogue, '  ')).toEqual([]);
    // No vertical, compound or 3-D CRSs: EPSG:5703 is 'NAVD88 height', EPSG:4979 'WGS 84' 3-D.
    expect(searchCrs(catalogue, '5703')).toEqual([]);
    expect(searchCrs(catalogue, '4979').some((r) => r.code === 4979)).toBe(false);
    expect(searchCrs(catalogue, 'utm', 500)).toHaveLength(200);
  });

  it('returns the area of use in GeoJSON bbox order', () => {
    const [hit] = searchCrs(catalogue, '2193');
    // epsg-index stores [north, west, south, east] = [-34.1, 166.37, -47.33, 178.63] for EPSG:2193.
    expect(hit.bbox).toEqual([166.37, -47.33, 178.63, -34.1]);
  });

  it.each([
    [
      'WGS_1984_UTM_Zone_30N (name match)',
      'PROJCS["WGS_1984_UTM_Zone_30N",GEOGCS["GCS_WGS_1984",DATUM["D_WGS_1984",SPHEROID["WGS_1984",6378137.0,298.257223563]],PRIMEM["Greenwich",0.0],UNIT["Degree",0.0174532925199433]],PROJECTION["Transverse_Mercator"],PARAMETER["False_Easting",500000.0],PARAMETER["False_Northing",0.0],PARAMETER["Central_Meridian",-3.0],PARAMETER["Scale_Factor",0.9996],PARAMETER["Latitude_Of_Origin",0.0],UNIT["Meter",1.0]]',
      32630,
    ],
    ['an EPSG WKT (AUTHORITY)', utm30nWkt, 32630],
    [
      'NZ Transverse Mercator (by parameters)',
      'PROJCS["NZGD_2000_New_Zealand_Transverse_Mercator",GEOGCS["GCS_NZGD_2000",DATUM["D_NZGD_2000",SPHEROID["GRS_1980",6378137.0,298.257222101]],PRIMEM["Greenwich",0.0],UNIT["Degree",0.0174532925199433]],PROJECTION["Transverse_Mercator"],PARAMETER["False_Easting",1600000.0],PARAMETER["False_Northing",10000000.0],PARAMETER["Central_Meridian",173.0],PARAMETER["Scale_Factor",0.9996],PARAMETER["Latitude_Of_Origin",0.0],UNIT["Meter",1.0]]',
      2193,
    ],
    [
      'GCS_WGS_1984 (name match)',
      'GEOGCS["GCS_WGS_1984",DATUM["D_WGS_1984",SPHEROID["WGS_1984",6378137.0,298.257223563]],PRIMEM["Greenwich",0.0],UNIT["Degree",0.0174532925199433]]',
      4326,
    ],
  ])('identifies %s', (_label, wkt, code) => {
    // Reference: the EPSG registry entries these .prj texts were written for (GDAL writes the same ESRI WKT for them).
    expect(identifyCrs(catalogue, wkt)).toBe(code);
  });

  it('identifies nothing for an invented grid', () => {
    const wkt =
      'PROJCS["Fennick_Local_Grid",GEOGCS["GCS_Fennick",DATUM["D_Fennick",SPHEROID["GRS_1980",6378137.0,298.257222101]],PRIMEM["Greenwich",0.0],UNIT["Degree",0.0174532925199433]],PROJECTION["Transverse_Mercator"],PARAMETER["False_Easting",123456.0],PARAMETER["False_Northing",7.0],PARAMETER["Central_Meridian",-2.95],PARAMETER["Scale_Factor",1.0],PARAMETER["Latitude_Of_Origin",47.5],UNIT["Meter",1.0]]';
    expect(identifyCrs(catalogue, wkt)).toBeUndefined();
  });
});
