import type { Sequelize, Transaction } from 'sequelize';
import type { Role } from '@shared/model/roles';
import { hashPassword } from '../features/auth/password';
import { User } from '../features/auth/user.model';
import { Membership } from '../features/studios/membership.model';
import { Studio } from '../features/studios/studio.model';
import type { ArtworksService } from '../features/artworks/artworks.service';
import { createHash } from 'node:crypto';
import { syntheticRom } from '@shared/drive/sample-rom';
import { VideoRom } from '../features/roms/rom.model';
import { SavedTiming } from '../features/timings/timing.model';
import { demoArtworks } from './demo-art';

type DemoArt = Awaited<ReturnType<typeof demoArtworks>>[number];

/** The fictional demo studio and its accounts (README lists them). One password for all. */
export const DEMO_PASSWORD = 'amber-glow-demo';
export const DEMO_STUDIO = 'Kiln & Quartz';
/** Stable ids: the seed never looks anything up by a name a user could also type. */
export const DEMO_STUDIO_ID = 'e0b1a5e5-0000-4000-8000-00000000d301';
export const DEMO_ACCOUNTS: { id: string; email: string; displayName: string; role: Role }[] = [
  { id: 'e0b1a5e5-0000-4000-8000-00000000a001', email: 'owner@kilnquartz.example', displayName: 'Ottilie Brand', role: 'owner' },
  { id: 'e0b1a5e5-0000-4000-8000-00000000a002', email: 'editor@kilnquartz.example', displayName: 'Emeric Vale', role: 'editor' },
  { id: 'e0b1a5e5-0000-4000-8000-00000000a003', email: 'viewer@kilnquartz.example', displayName: 'Vesna Roe', role: 'viewer' },
];
/** The marker row that says the demo scenario was seeded (security item 34). */
export const DEMO_MARKER = 'demo-kiln-and-quartz-v1';

/**
 * Seeds the demo scenario once: when the marker row exists nothing is touched, so a member the
 * owner removed stays removed and no other studio is ever changed. All rows and the marker are
 * written in one transaction (the artworks' files just before it; start-up reconciliation
 * removes them should the transaction fail).
 */
export async function seedDemo(sequelize: Sequelize, artworks?: ArtworksService): Promise<boolean> {
  const seeded = await seedDemoStudio(sequelize, artworks);
  await seedDemoRom(sequelize);
  return seeded;
}

/** The sample ROM image (built from the published VGA tables, no vendor's firmware) is a later addition: its own marker, once. */
export const DEMO_ROM_MARKER = 'demo-kiln-and-quartz-rom-v1';
export const DEMO_ROM_ID = 'e0b1a5e5-0000-4000-8000-00000000b001';

async function seedDemoRom(sequelize: Sequelize): Promise<void> {
  await sequelize.transaction(async (transaction) => {
    await sequelize.query('SELECT pg_advisory_xact_lock(424243)', { transaction });
    const [[done]] = (await sequelize.query('SELECT 1 AS seeded FROM seed_markers WHERE name = $1', {
      bind: [DEMO_ROM_MARKER],
      transaction,
    })) as [unknown[], unknown];
    if (done) return;
    if ((await Studio.findByPk(DEMO_STUDIO_ID, { transaction })) && !(await VideoRom.findByPk(DEMO_ROM_ID, { transaction }))) {
      const bytes = Buffer.from(syntheticRom());
      await VideoRom.create(
        {
          id: DEMO_ROM_ID,
          studioId: DEMO_STUDIO_ID,
          name: 'Sample VGA card (demo)',
          bytes,
          size: bytes.length,
          sha256: createHash('sha256').update(bytes).digest('hex'),
          patchedFromId: null,
          patch: null,
          createdById: DEMO_ACCOUNTS[0].id,
        },
        { transaction },
      );
    }
    await sequelize.query('INSERT INTO seed_markers (name) VALUES ($1)', { bind: [DEMO_ROM_MARKER], transaction });
  });
}

async function seedDemoStudio(sequelize: Sequelize, artworks?: ArtworksService): Promise<boolean> {
  const [[done]] = (await sequelize.query('SELECT 1 AS seeded FROM seed_markers WHERE name = $1', { bind: [DEMO_MARKER] })) as [
    unknown[],
    unknown,
  ];
  if (done) return false;
  const passwordHash = await hashPassword(DEMO_PASSWORD);
  const art = artworks ? await demoArtworks() : [];
  await sequelize.transaction(async (transaction) => {
    await sequelize.query('SELECT pg_advisory_xact_lock(424243)', { transaction });
    const [[again]] = (await sequelize.query('SELECT 1 AS seeded FROM seed_markers WHERE name = $1', {
      bind: [DEMO_MARKER],
      transaction,
    })) as [unknown[], unknown];
    if (again) return;
    // A database from before the marker existed already has its demo rows: record it and touch nothing.
    const earlier =
      (await Studio.findByPk(DEMO_STUDIO_ID, { transaction })) ??
      (await User.findOne({ where: { email: DEMO_ACCOUNTS.map((a) => a.email) }, transaction }));
    if (earlier) {
      console.log('[seed] demo accounts exist from an earlier version; leaving them as they are');
    } else {
      await seedRows(transaction, passwordHash, art, artworks);
    }
    await sequelize.query('INSERT INTO seed_markers (name) VALUES ($1)', { bind: [DEMO_MARKER], transaction });
  });
  return true;
}

async function seedRows(transaction: Transaction, passwordHash: string, art: DemoArt[], artworks?: ArtworksService): Promise<void> {
  await Studio.create({ id: DEMO_STUDIO_ID, name: DEMO_STUDIO }, { transaction });
  for (const account of DEMO_ACCOUNTS) {
    await User.create(
      { id: account.id, email: account.email, displayName: account.displayName, passwordHash, emailVerifiedAt: new Date() },
      { transaction },
    );
    await Membership.create({ studioId: DEMO_STUDIO_ID, userId: account.id, role: account.role }, { transaction });
  }
  const ownerId = DEMO_ACCOUNTS[0].id;
  for (const a of art) await artworks!.upload(DEMO_STUDIO_ID, ownerId, a.bytes, a.file, { name: a.name, ...a.sheet }, transaction);
  await SavedTiming.create(
    {
      studioId: DEMO_STUDIO_ID,
      name: 'Handheld EL, 60 Hz',
      panelTypeId: 'el-amber-640x480',
      source: { kind: 'standard', standard: 'dmt', mode: '640x480@60' },
      interface: { dualScan: true, pixelsPerClock: 4 },
      createdById: ownerId,
      updatedById: ownerId,
    },
    { transaction },
  );
}
