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
