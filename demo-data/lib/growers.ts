/**
 * @module demo-data/lib/growers
 * The invented jurisdiction and grower organisations of the demo region.
 */

/** The invented shellfish control authority of the region. */
export const JURISDICTION = { name: 'Fennick Coast Shellfish Authority', slug: 'fennick-coast', region: 'Fennick Coast' } as const;

/** A grower organisation and its demo sign-in. */
export interface Grower {
  name: string;
  slug: string;
  email: string;
}

/** The four invented grower organisations; the first is the main demo account. */
export const GROWERS: readonly Grower[] = [
  { name: 'Saltreed Oysters', slug: 'saltreed-oysters', email: 'grower@brackline.test' },
  { name: 'Carrick Mussel Lines', slug: 'carrick-mussel-lines', email: 'grower2@brackline.test' },
  { name: 'Skerrow Clam Company', slug: 'skerrow-clam-company', email: 'grower3@brackline.test' },
  { name: 'Gullstone Shellfish', slug: 'gullstone-shellfish', email: 'grower4@brackline.test' },
];

/** Grower names, for typing lease holders. */
export type GrowerName = 'Saltreed Oysters' | 'Carrick Mussel Lines' | 'Skerrow Clam Company' | 'Gullstone Shellfish';
