/**
 * The version of the whole model chain (physics, fields, band geometry, scoring). Stored with
 * every footprint and screening; bump it when any of them changes so stored results are rebuilt.
 */
export const MODEL_VERSION = 'brackline-model-1.0.0';
