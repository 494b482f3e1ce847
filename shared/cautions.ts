/**
 * The cautions of product.md §7, in one place for the screens, the PDF report, the e-mails and
 * the public status page. The wording never calls a site safe: the tool predicts; the
 * shellfish authority decides.
 */
export const CAUTION_TEXT = [
  "Brackline gives screening-level estimates from simplified physics. It does not replace the shellfish control authority's classification, closures or sampling, nor a site-specific hydrodynamic study.",
  'Wind, tides, ambient currents, stratification and other rivers change where a plume goes.',
  "Follow local regulations and the authority's notices before harvesting.",
] as const;
