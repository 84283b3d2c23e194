import type { Sequelize } from 'sequelize';
import { initEmailVerification } from '../features/auth/email-verification.model';
import { initPasswordReset, PasswordReset } from '../features/auth/password-reset.model';
import { initUser, User } from '../features/auth/user.model';
import { initActivity } from '../features/activity/activity.model';
import { Artwork, initArtwork } from '../features/artworks/artwork.model';
import { initPresets, Preset } from '../features/presets/preset.model';
import { presetListCache } from '../features/presets/presets.service';
import { initRender } from '../features/renders/render.model';
import { initSavedTiming } from '../features/timings/timing.model';
import { initVideoRom } from '../features/roms/rom.model';
import { initExport } from '../features/exports/export.model';
import { initPanelMatch } from '../features/matches/match.model';
import { initInvite, Invite } from '../features/studios/invite.model';
import { initMembership, Membership } from '../features/studios/membership.model';
import { roleCache } from '../features/studios/membership-lookup';
import { artworkCache, libraryCache, thumbnailCache } from '../features/artworks/artworks.service';
import { initStudio, Studio } from '../features/studios/studio.model';

/** Registers every model and association on one Sequelize instance. */
export function initModels(sequelize: Sequelize): void {
  initUser(sequelize);
  initPasswordReset(sequelize);
  initEmailVerification(sequelize);
  initStudio(sequelize);
  initMembership(sequelize);
  initInvite(sequelize);
  initRender(sequelize);
  initArtwork(sequelize);
  initPresets(sequelize);
  initActivity(sequelize);
  initSavedTiming(sequelize);
  initVideoRom(sequelize);
  initExport(sequelize);
  initPanelMatch(sequelize);
  Membership.belongsTo(User, { foreignKey: 'userId', as: 'user' });
  Membership.belongsTo(Studio, { foreignKey: 'studioId', as: 'studio' });
  Invite.belongsTo(Studio, { foreignKey: 'studioId', as: 'studio' });
  PasswordReset.belongsTo(User, { foreignKey: 'userId' });
  // What each read cache depends on: a write to any of these models empties it.
  roleCache.watch(Membership, Studio, User);
  for (const cache of [libraryCache, artworkCache, thumbnailCache]) cache.watch(Artwork, Studio);
  presetListCache.watch(Preset, Studio, User);
}
