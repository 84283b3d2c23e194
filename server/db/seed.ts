import type { Role } from '../../shared/model/roles';
import { hashPassword } from '../features/auth/password';
import { User } from '../features/auth/user.model';
import { Membership } from '../features/studios/membership.model';
import { Studio } from '../features/studios/studio.model';
import { Artwork } from '../features/artworks/artwork.model';
import type { ArtworksService } from '../features/artworks/artworks.service';
import { SavedTiming } from '../features/timings/timing.model';
import { demoArtworks } from './demo-art';

/** The fictional demo studio and its accounts (README lists them). One password for all. */
export const DEMO_PASSWORD = 'amber-glow-demo';
export const DEMO_STUDIO = 'Kiln & Quartz';
export const DEMO_ACCOUNTS: { email: string; displayName: string; role: Role }[] = [
  { email: 'owner@kilnquartz.example', displayName: 'Ottilie Brand', role: 'owner' },
  { email: 'editor@kilnquartz.example', displayName: 'Emeric Vale', role: 'editor' },
  { email: 'viewer@kilnquartz.example', displayName: 'Vesna Roe', role: 'viewer' },
];

/** Creates what is missing of the demo scenario; running it twice changes nothing. */
export async function seedDemo(artworks?: ArtworksService): Promise<void> {
  const [studio] = await Studio.findOrCreate({ where: { name: DEMO_STUDIO }, defaults: { name: DEMO_STUDIO } });
  for (const account of DEMO_ACCOUNTS) {
    let user = await User.findOne({ where: { email: account.email } });
    user ??= await User.create({ email: account.email, displayName: account.displayName, passwordHash: await hashPassword(DEMO_PASSWORD) });
    await Membership.findOrCreate({ where: { studioId: studio.id, userId: user.id }, defaults: { studioId: studio.id, userId: user.id, role: account.role } });
  }
  const owner = (await User.findOne({ where: { email: DEMO_ACCOUNTS[0].email } }))!;
  if (artworks && (await Artwork.count({ where: { studioId: studio.id } })) === 0) {
    for (const art of await demoArtworks()) await artworks.upload(studio.id, owner.id, art.bytes, art.file, { name: art.name, ...art.sheet });
  }
  await SavedTiming.findOrCreate({
    where: { studioId: studio.id, name: 'Handheld EL, 60 Hz' },
    defaults: {
      studioId: studio.id,
      name: 'Handheld EL, 60 Hz',
      panelTypeId: 'el-amber-640x480',
      source: { kind: 'standard', standard: 'dmt', mode: '640x480@60' },
      interface: { dualScan: true, pixelsPerClock: 4 },
      createdById: owner.id,
      updatedById: owner.id,
    },
  });
}
