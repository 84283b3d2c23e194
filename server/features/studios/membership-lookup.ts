import { QueryTypes } from 'sequelize';
import type { Role } from '@shared/model/roles';
import { ReadCache } from '../../core/read-cache';
import { Membership } from './membership.model';

/**
 * Roles read by the policy on every studio request. Emptied by any write to memberships, studios
 * or users (server/db/models.ts), so a removal or a role change holds from the next request on.
 */
export const ROLE_CACHE_MS = 5_000;
export const roleCache = new ReadCache<Role | null>('roles', ROLE_CACHE_MS, { maxEntries: 20_000 });

/** A user's role in a studio, or null when not a member. */
export function roleIn(studioId: string, userId: string): Promise<Role | null> {
  return roleCache.read(`${studioId}/${userId}`, async () => {
    const rows = await Membership.sequelize!.query<{ role: Role }>('SELECT role FROM memberships WHERE studio_id = $1 AND user_id = $2', {
      bind: [studioId, userId],
      type: QueryTypes.SELECT,
    });
    return rows[0]?.role ?? null;
  });
}
