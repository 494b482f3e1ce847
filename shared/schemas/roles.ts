/** The four roles of product.md §2. */
export const ROLES = ['grower', 'adviser', 'regulator', 'admin'] as const;
export type Role = (typeof ROLES)[number];
