import type { Role } from '@shared/model/roles';
import { newToken } from '../core/tokens';
import { hashPassword } from '../features/auth/password';
import { User } from '../features/auth/user.model';
import { Invite } from '../features/studios/invite.model';
import { Membership } from '../features/studios/membership.model';
import { Studio } from '../features/studios/studio.model';
import { SavedTiming } from '../features/timings/timing.model';
import { VideoRom } from '../features/roms/rom.model';
import { syntheticRom } from '@shared/drive/sample-rom';
import { PresetsService } from '../features/presets/presets.service';
import os from 'node:os';
import path from 'node:path';
import { ArtworksService } from '../features/artworks/artworks.service';
import { FileStore } from '../storage/file-store';
import { DiskBlobStore } from '../storage/blob-store';
import { uniqueEmail } from './harness';
import { pngOf } from './images';

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
  const make = (tag: string) =>
    User.create({ email: uniqueEmail(tag), displayName: `World ${tag}`, passwordHash, emailVerifiedAt: new Date() });
  const [owner, editor, viewer, other, target] = await Promise.all(['owner', 'editor', 'viewer', 'other', 'target'].map(make));
  const otherStudio = await Studio.create({ name: 'Elsewhere' });
  await Membership.create({ studioId: otherStudio.id, userId: other.id, role: 'owner' });
  return { owner, editor, viewer, other, target };
}

/** A fresh studio where owner/editor/viewer have those roles and `target` is a viewer, plus one pending invite. */
/** A valid saved-timing body (DMT 640×480@60, dual-scan, 4 px per clock, amber EL 640×480). */
export const TIMING_BODY = {
  name: 'Handheld EL, 60 Hz',
  panelTypeId: 'el-amber-640x480',
  source: { kind: 'standard' as const, standard: 'dmt' as const, mode: '640x480@60' },
  interface: { dualScan: true, pixelsPerClock: 4 as const },
};

export async function createStudioWorld(
  users: WorldUsers,
  artworks?: ArtworksService,
): Promise<{
  studio: Studio;
  invite: Invite;
  inviteToken: string;
  timing: SavedTiming;
  romId: string;
  artworkId: string;
  presetId: string;
  linkId: string;
  shareToken: string;
}> {
  const studio = await Studio.create({ name: `Matrix ${Math.random().toString(36).slice(2, 7)}` });
  const roles: [User, Role][] = [
    [users.owner, 'owner'],
    [users.editor, 'editor'],
    [users.viewer, 'viewer'],
    [users.target, 'viewer'],
  ];
  await Membership.bulkCreate(roles.map(([u, role]) => ({ studioId: studio.id, userId: u.id, role })));
  const { token, hash } = newToken();
  const invite = await Invite.create({
    studioId: studio.id,
    email: uniqueEmail('invitee'),
    role: 'viewer',
    tokenHash: hash,
    invitedById: users.owner.id,
    expiresAt: new Date(Date.now() + 86_400_000),
  });
  const timing = await SavedTiming.create({
    studioId: studio.id,
    ...TIMING_BODY,
    createdById: users.owner.id,
    updatedById: users.owner.id,
  });
  const rom = Buffer.from(syntheticRom());
  const romId = (
    await VideoRom.create({
      studioId: studio.id,
      name: 'World card',
      bytes: rom,
      size: rom.length,
      sha256: '0'.repeat(64),
      patchedFromId: null,
      patch: null,
      createdById: users.owner.id,
    })
  ).id;
  // Every world has an artwork: a share link always shows one.
  const library =
    artworks ?? new ArtworksService(new FileStore(new DiskBlobStore(path.join(os.tmpdir(), `emberline-world-${process.pid}`))));
  const artworkId = (
    await library.upload(
      studio.id,
      users.owner.id,
      pngOf(8, 8, (x, y) => [x * 30, y * 30, 0, 255]),
      'tile.png',
      {},
    )
  ).id;
  const presets = new PresetsService(library);
  const actor = { studioId: studio.id, userId: users.owner.id, role: 'owner' as const };
  const preset = await presets.create(actor, { name: 'World look', panelTypeId: 'el-amber-640x480' });
  const link = await presets.createLink(actor, preset.id, { artworkId }, 'http://app.test');
  const shareToken = link.url!.split('/share/')[1];
  return { studio, invite, inviteToken: token, timing, romId, artworkId, presetId: preset.id, linkId: link.id, shareToken };
}
