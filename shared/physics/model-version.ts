/**
 * The version of the whole model chain (physics, fields, band geometry, scoring). Stored with
 * every footprint and screening; bump it when any of them changes so stored results are rebuilt.
 */
export const MODEL_VERSION = 'brackline-model-2.0.0';
// 2.0.0 (2026-12-02): signed alongshore position (both sides of the mouth), bulge lens with nothing
// up-coast beyond it, flow-dependent dilution length from the entrainment coefficient, worst point
// of a lease, flood durations from the record's own hydrographs (science.md §1.11).
