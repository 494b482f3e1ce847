/** A GeoJSON Polygon: the square of side `d` degrees whose south-west corner is (x, y), ring anticlockwise (RFC 7946 §3.1.6). */
export const squarePolygon = (x: number, y: number, d: number) => ({
  type: 'Polygon',
  coordinates: [
    [
      [x, y],
      [x + d, y],
      [x + d, y + d],
      [x, y + d],
      [x, y],
    ],
  ],
});
