/**
 * The cautions of product.md §7, in one place for the screens, the PDF report, the e-mails and
 * the public status page. The wording never calls a site safe: the tool predicts; the
 * shellfish authority decides.
 */
export const CAUTION_TEXT = [
  "Brackline gives screening-level estimates from simplified physics. It does not replace the shellfish control authority's classification, closures or sampling, nor a site-specific hydrodynamic study.",
  // Up-coast spreading by wind (science.md §1.8, a: upwelling-favourable wind spreads the plume; §1.11) is
  // outside the no-wind model, which puts river water up-coast of a mouth only in the bulge beside it.
  'Wind, tides, ambient currents, stratification and other rivers change where a plume goes. Wind can push a plume up-coast of the mouth, where the model puts river water only in the bulge next to the mouth.',
  "Follow local regulations and the authority's notices before harvesting.",
] as const;

/**
 * Where a plume walks the built-in world coastline (issue #15). Vertex spacing near coasts measured
 * on six windows of the package's data with PostGIS on the ellipsoid: medians 435 to 1 044 m.
 */
export const BUILTIN_COAST_CAUTION =
  'This plume walks the built-in world coastline (OpenStreetMap data; its vertices lie about 0.4 to 1 km apart near coasts, a median of about 650 m), so its shore can be off by a few hundred metres: harbours, river mouths, marshes and small islands may be missing or cut straight. Upload or trace your own coast for a closer answer.';

/** The licence and attribution shown wherever the built-in coast is drawn or used. */
export const BUILTIN_COAST_ATTRIBUTION = 'Coast © OpenStreetMap contributors (ODbL 1.0), via the @geo-maps/earth-seas-10m package';
