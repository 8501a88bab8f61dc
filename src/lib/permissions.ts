import type { Me } from '@shared/schemas/auth.schema';

/**
 * What a role may do, as DEVELOPERS.md's route table grants it. The server enforces the same rules;
 * these only decide what a page offers.
 */
export const canEditRegister = (me: Me) => me.role === 'admin' || me.role === 'agronomist';

/** Planters: admin and agronomist for any grower; a farmer for their own grower only. */
export const canEditPlanter = (me: Me, growerId?: string | null) =>
  canEditRegister(me) ||
  (me.role === 'farmer' && !!me.growerId && (growerId == null || growerId === me.growerId));

export const canManagePeople = (me: Me) => me.role === 'admin';
