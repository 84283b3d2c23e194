import type { Role } from '../../shared/model/roles';
import { newToken } from '../core/tokens';
import { hashPassword } from '../features/auth/password';
import { User } from '../features/auth/user.model';
import { Invite } from '../features/studios/invite.model';
import { Membership } from '../features/studios/membership.model';
import { Studio } from '../features/studios/studio.model';
import { uniqueEmail } from './harness';

export const WORLD_PASSWORD = 'a long test passphrase';

/** The actors of the role-matrix and access tests. */
export type Actor = 'owner' | 'editor' | 'viewer' | 'other' | 'anonymous';
export const ACTORS: Actor[] = ['owner', 'editor', 'viewer', 'other', 'anonymous'];

export interface WorldUsers {
  owner: User;
  editor: User;
  viewer: User;
  /** Owner of another studio, member of nothing here. */
  other: User;
  target: User;
}

/** Creates the five accounts once (one argon2 hash for all). */
export async function createUsers(): Promise<WorldUsers> {
  const passwordHash = await hashPassword(WORLD_PASSWORD);
  const make = (tag: string) => User.create({ email: uniqueEmail(tag), displayName: `World ${tag}`, passwordHash });
  const [owner, editor, viewer, other, target] = await Promise.all(['owner', 'editor', 'viewer', 'other', 'target'].map(make));
  const otherStudio = await Studio.create({ name: 'Elsewhere' });
  await Membership.create({ studioId: otherStudio.id, userId: other.id, role: 'owner' });
  return { owner, editor, viewer, other, target };
}

/** A fresh studio where owner/editor/viewer have those roles and `target` is a viewer, plus one pending invite. */
export async function createStudioWorld(users: WorldUsers): Promise<{ studio: Studio; invite: Invite; inviteToken: string }> {
  const studio = await Studio.create({ name: `Matrix ${Math.random().toString(36).slice(2, 7)}` });
  const roles: [User, Role][] = [
    [users.owner, 'owner'],
    [users.editor, 'editor'],
    [users.viewer, 'viewer'],
    [users.target, 'viewer'],
  ];
  await Membership.bulkCreate(roles.map(([u, role]) => ({ studioId: studio.id, userId: u.id, role })));
  const { token, hash } = newToken();
  const invite = await Invite.create({ studioId: studio.id, email: uniqueEmail('invitee'), role: 'viewer', tokenHash: hash, invitedById: users.owner.id, expiresAt: new Date(Date.now() + 86_400_000) });
  return { studio, invite, inviteToken: token };
}
