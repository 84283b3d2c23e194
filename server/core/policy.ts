import type { Request, RequestHandler } from 'express';
import { roleAtLeast, type Role } from '@shared/model/roles';
import { forbidden, notFound, unauthenticated } from './app-error';

/** Who may call a route. Every /api route declares one; a route without one is a test failure. */
export type Policy = { kind: 'public' } | { kind: 'signedIn' } | { kind: 'studio'; role: Role };

/** What a studio policy sets on the request: the caller's membership in req.params.studioId. */
export interface Member {
  studioId: string;
  userId: string;
  role: Role;
}

export const POLICY = Symbol('emberline.policy');

// Each policy keeps its own kind as its type, so a route's handler knows what the policy guarantees (api-router.ts).
export const publicAccess = { kind: 'public' } as const satisfies Policy;
export const signedIn = { kind: 'signedIn' } as const satisfies Policy;
export const studioRole = (role: Role) => ({ kind: 'studio', role }) as const satisfies Policy;

/** How the studio policy reads a user's role in a studio (null: not a member). */
export type RoleLookup = (studioId: string, userId: string) => Promise<Role | null>;
let roleOf: RoleLookup | null = null;

/** Gives the policy its role lookup (the studios feature's cached one); createApp does this before any route runs. */
export function useRoleLookup(lookup: RoleLookup): void {
  roleOf = lookup;
}

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/** A route parameter that must be a UUID; anything else is answered as not found. */
export function idParam(req: Pick<Request, 'params'>, name: string, what: string): string {
  const value = String(req.params[name] ?? '');
  if (!UUID.test(value)) throw notFound(what);
  return value;
}

/** The middleware that enforces a policy; tagged so the router walk can find it. */
export function enforce(policy: Policy): RequestHandler {
  const handler: RequestHandler = async (req, _res, next) => {
    if (policy.kind === 'public') return next();
    if (!req.user) throw unauthenticated();
    if (policy.kind === 'signedIn') return next();
    const studioId = String(req.params.studioId ?? '');
    // Another studio's id and a malformed id look the same as a missing one (no IDOR oracle).
    if (!UUID.test(studioId)) throw notFound('The studio');
    if (!roleOf) throw new Error('the studio policy has no role lookup: createApp sets one with useRoleLookup');
    const role = await roleOf(studioId, req.user.id);
    if (!role) throw notFound('The studio');
    if (!roleAtLeast(role, policy.role)) throw forbidden();
    req.membership = { studioId, userId: req.user.id, role };
    next();
  };
  return Object.assign(handler, { [POLICY]: policy });
}
