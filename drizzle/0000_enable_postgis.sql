-- PostGIS first: later migrations use its geometry types (stack.md gotcha 9).
CREATE EXTENSION IF NOT EXISTS postgis;
