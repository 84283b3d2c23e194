import sharp from 'sharp';
import { newToken } from './tokens';
import { signDownload } from './signed-links';
import { POLICY } from './policy';
import { BUILT_IN_PRESETS } from '@shared/model/panel-types';
import { EmailVerification } from '../features/auth/email-verification.model';
import { PasswordReset } from '../features/auth/password-reset.model';
import { Invite } from '../features/studios/invite.model';
import { Export, ExportLink } from '../features/exports/export.model';
import { PanelMatch } from '../features/matches/match.model';
import { FileStore } from '../storage/file-store';
import { Membership } from '../features/studios/membership.model';
import { createHarness, TestClient, uniqueEmail, type Harness } from '../testing/harness';
import { pngOf } from '../testing/images';
import { syntheticRom } from '@shared/drive/sample-rom';
import { ACTORS, createStudioWorld, createUsers, TIMING_BODY, WORLD_PASSWORD, type Actor, type WorldUsers } from '../testing/world';

/**
 * Access control as a table (security items 8–10; ASVS 5.0 8.2.1, 8.2.2): every /api route ×
 * {owner, editor, viewer, other studio, anonymous} → the expected status.
 */
interface Cell {
  studioId: string;
  users: WorldUsers;
  actor: Actor;
  inviteId: string;
  inviteToken: string;
  timingId: string;
  romId: string;
  artworkId: string;
  presetId: string;
  linkId: string;
  shareToken: string;
  otherStudioId: string;
  /** A stored render of the world's artwork (made only for the rows that read one). */
  studioRenderKey: string;
  /** An export the editor asked for (made only for the rows that name one), in the row's state. */
  exportId: string;
  /** A share link to that export, and its token. */
  exportLinkId: string;
  exportToken: string;
  /** A panel match the editor made (only for the rows that name one), in the row's state. */
  matchId: string;
}
interface Row {
  method: 'get' | 'post' | 'put' | 'patch' | 'delete';
  path: string;
  url: (c: Cell) => string;
  body?: (c: Cell) => Promise<object> | object;
  /** Multipart upload instead of JSON: text fields plus a file. */
  upload?: () => { fields: Record<string, string>; file: { name: string; bytes: Buffer } };
  expect: [owner: number, editor: number, viewer: number, other: number, anonymous: number];
  /** For rows on one export: the state it is in (default: done, with its file). */
  exportStatus?: 'queued' | 'failed' | 'done';
  /** For rows on one panel match: the state it is in (default: done, with its result). */
  matchStatus?: 'marking' | 'done';
}

const S = (c: Cell) => `/api/studios/${c.studioId}`;
const actorEmail = (c: Cell) => (c.actor === 'anonymous' ? uniqueEmail('anon') : c.users[c.actor].email);

const ROWS: Row[] = [
  { method: 'get', path: '/api/health', url: () => '/api/health', expect: [200, 200, 200, 200, 200] },
  { method: 'get', path: '/api/docs', url: () => '/api/docs', expect: [200, 200, 200, 200, 200] },
  { method: 'get', path: '/api/auth/csrf', url: () => '/api/auth/csrf', expect: [200, 200, 200, 200, 200] },
  {
    method: 'post',
    path: '/api/auth/sign-up',
    url: () => '/api/auth/sign-up',
    body: () => ({ email: uniqueEmail('su'), displayName: 'New', password: WORLD_PASSWORD }),
    expect: [202, 202, 202, 202, 202],
  },
  {
    method: 'post',
    path: '/api/auth/verify-email',
    url: () => '/api/auth/verify-email',
    body: async () => {
      const { token, hash } = newToken();
      await EmailVerification.create({
        email: uniqueEmail('verify'),
        displayName: 'Pending',
        passwordHash: 'x',
        tokenHash: hash,
        expiresAt: new Date(Date.now() + 60_000),
      });
      return { token };
    },
    expect: [200, 200, 200, 200, 200],
  },
  { method: 'post', path: '/api/auth/verify-email/resend', url: () => '/api/auth/verify-email/resend', expect: [202, 202, 202, 202, 401] },
  {
    method: 'post',
    path: '/api/auth/password',
    url: () => '/api/auth/password',
    body: () => ({ currentPassword: WORLD_PASSWORD, newPassword: WORLD_PASSWORD }),
    expect: [200, 200, 200, 200, 401],
  },
  {
    method: 'post',
    path: '/api/auth/sign-in',
    url: () => '/api/auth/sign-in',
    body: (c) => ({ email: c.users.other.email, password: WORLD_PASSWORD }),
    expect: [200, 200, 200, 200, 200],
  },
  { method: 'post', path: '/api/auth/sign-out', url: () => '/api/auth/sign-out', expect: [204, 204, 204, 204, 204] },
  { method: 'get', path: '/api/auth/me', url: () => '/api/auth/me', expect: [200, 200, 200, 200, 200] },
  {
    method: 'patch',
    path: '/api/auth/me',
    url: () => '/api/auth/me',
    body: () => ({ displayName: 'Renamed In Matrix' }),
    expect: [200, 200, 200, 200, 401],
  },
  {
    method: 'post',
    path: '/api/auth/password-reset',
    url: () => '/api/auth/password-reset',
    body: (c) => ({ email: c.users.target.email }),
    expect: [202, 202, 202, 202, 202],
  },
  {
    method: 'get',
    path: '/api/auth/password-reset/:token',
    url: () => `/api/auth/password-reset/${'x'.repeat(43)}`,
    expect: [410, 410, 410, 410, 410],
  },
  {
    method: 'post',
    path: '/api/auth/password-reset/confirm',
    url: () => '/api/auth/password-reset/confirm',
    body: async (c) => {
      const { token, hash } = newToken();
      await PasswordReset.create({ userId: c.users.target.id, tokenHash: hash, expiresAt: new Date(Date.now() + 60_000) });
      return { token, password: WORLD_PASSWORD };
    },
    expect: [200, 200, 200, 200, 200],
  },
  { method: 'get', path: '/api/studios', url: () => '/api/studios', expect: [200, 200, 200, 200, 401] },
  {
    method: 'post',
    path: '/api/studios',
    url: () => '/api/studios',
    body: () => ({ name: 'Matrix new' }),
    expect: [201, 201, 201, 201, 401],
  },
  { method: 'get', path: '/api/studios/:studioId', url: S, expect: [200, 200, 200, 404, 401] },
  { method: 'patch', path: '/api/studios/:studioId', url: S, body: () => ({ name: 'Renamed' }), expect: [200, 403, 403, 404, 401] },
  { method: 'delete', path: '/api/studios/:studioId', url: S, expect: [204, 403, 403, 404, 401] },
  { method: 'get', path: '/api/studios/:studioId/members', url: (c) => `${S(c)}/members`, expect: [200, 200, 200, 404, 401] },
  {
    method: 'patch',
    path: '/api/studios/:studioId/members/:userId',
    url: (c) => `${S(c)}/members/${c.users.target.id}`,
    body: () => ({ role: 'editor' }),
    expect: [200, 403, 403, 404, 401],
  },
  {
    method: 'delete',
    path: '/api/studios/:studioId/members/:userId',
    url: (c) => `${S(c)}/members/${c.users.target.id}`,
    expect: [204, 403, 403, 404, 401],
  },
  { method: 'get', path: '/api/studios/:studioId/invites', url: (c) => `${S(c)}/invites`, expect: [200, 403, 403, 404, 401] },
  {
    method: 'post',
    path: '/api/studios/:studioId/invites',
    url: (c) => `${S(c)}/invites`,
    body: () => ({ email: uniqueEmail('inv'), role: 'viewer' }),
    expect: [201, 403, 403, 404, 401],
  },
  {
    method: 'delete',
    path: '/api/studios/:studioId/invites/:inviteId',
    url: (c) => `${S(c)}/invites/${c.inviteId}`,
    expect: [204, 403, 403, 404, 401],
  },
  { method: 'get', path: '/api/invites/:token', url: (c) => `/api/invites/${c.inviteToken}`, expect: [200, 200, 200, 200, 200] },
  { method: 'get', path: '/api/studios/:studioId/timings', url: (c) => `${S(c)}/timings`, expect: [200, 200, 200, 404, 401] },
  {
    method: 'post',
    path: '/api/studios/:studioId/timings',
    url: (c) => `${S(c)}/timings`,
    body: () => TIMING_BODY,
    expect: [201, 201, 403, 404, 401],
  },
  {
    method: 'get',
    path: '/api/studios/:studioId/timings/:timingId',
    url: (c) => `${S(c)}/timings/${c.timingId}`,
    expect: [200, 200, 200, 404, 401],
  },
  {
    method: 'patch',
    path: '/api/studios/:studioId/timings/:timingId',
    url: (c) => `${S(c)}/timings/${c.timingId}`,
    body: () => ({ name: 'Renamed timing' }),
    expect: [200, 200, 403, 404, 401],
  },
  {
    method: 'delete',
    path: '/api/studios/:studioId/timings/:timingId',
    url: (c) => `${S(c)}/timings/${c.timingId}`,
    expect: [204, 204, 403, 404, 401],
  },
  // Video BIOS images: editors and owners only (a card's firmware; a bad patch can stop a card).
  { method: 'get', path: '/api/studios/:studioId/roms', url: (c) => `${S(c)}/roms`, expect: [200, 200, 403, 404, 401] },
  {
    method: 'post',
    path: '/api/studios/:studioId/roms',
    url: (c) => `${S(c)}/roms`,
    upload: () => ({ fields: {}, file: { name: 'card.rom', bytes: Buffer.from(syntheticRom()) } }),
    expect: [201, 201, 403, 404, 401],
  },
  { method: 'get', path: '/api/studios/:studioId/roms/:romId', url: (c) => `${S(c)}/roms/${c.romId}`, expect: [200, 200, 403, 404, 401] },
  {
    method: 'get',
    path: '/api/studios/:studioId/roms/:romId/image',
    url: (c) => `${S(c)}/roms/${c.romId}/image`,
    expect: [200, 200, 403, 404, 401],
  },
  {
    method: 'post',
    path: '/api/studios/:studioId/roms/:romId/patch',
    url: (c) => `${S(c)}/roms/${c.romId}/patch`,
    body: (c) => ({ entryIndex: 0x1b, timingId: c.timingId }),
    expect: [201, 201, 403, 404, 401],
  },
  {
    method: 'patch',
    path: '/api/studios/:studioId/roms/:romId',
    url: (c) => `${S(c)}/roms/${c.romId}`,
    body: () => ({ name: 'Renamed card' }),
    expect: [200, 200, 403, 404, 401],
  },
  {
    method: 'delete',
    path: '/api/studios/:studioId/roms/:romId',
    url: (c) => `${S(c)}/roms/${c.romId}`,
    expect: [204, 204, 403, 404, 401],
  },
  { method: 'get', path: '/api/studios/:studioId/artworks', url: (c) => `${S(c)}/artworks`, expect: [200, 200, 200, 404, 401] },
  {
    method: 'post',
    path: '/api/studios/:studioId/artworks',
    url: (c) => `${S(c)}/artworks`,
    upload: () => ({ fields: { name: 'Matrix upload' }, file: { name: 'a.png', bytes: pngOf(4, 4, () => [200, 100, 0, 255]) } }),
    expect: [201, 201, 403, 404, 401],
  },
  {
    method: 'get',
    path: '/api/studios/:studioId/artworks/:artworkId',
    url: (c) => `${S(c)}/artworks/${c.artworkId}`,
    expect: [200, 200, 200, 404, 401],
  },
  {
    method: 'patch',
    path: '/api/studios/:studioId/artworks/:artworkId',
    url: (c) => `${S(c)}/artworks/${c.artworkId}`,
    body: () => ({ name: 'Renamed' }),
    expect: [200, 200, 403, 404, 401],
  },
  {
    method: 'delete',
    path: '/api/studios/:studioId/artworks/:artworkId',
    url: (c) => `${S(c)}/artworks/${c.artworkId}`,
    expect: [204, 204, 403, 404, 401],
  },
  {
    method: 'get',
    path: '/api/studios/:studioId/artworks/:artworkId/links',
    url: (c) => `${S(c)}/artworks/${c.artworkId}/links`,
    expect: [200, 200, 403, 404, 401],
  },
  {
    method: 'get',
    path: '/api/studios/:studioId/artworks/:artworkId/original',
    url: (c) => `${S(c)}/artworks/${c.artworkId}/original`,
    expect: [200, 200, 200, 404, 401],
  },
  {
    method: 'get',
    path: '/api/studios/:studioId/artworks/:artworkId/thumbnail',
    url: (c) => `${S(c)}/artworks/${c.artworkId}/thumbnail`,
    expect: [200, 200, 200, 404, 401],
  },
  {
    method: 'get',
    path: '/api/studios/:studioId/artworks/:artworkId/frames',
    url: (c) => `${S(c)}/artworks/${c.artworkId}/frames`,
    expect: [200, 200, 200, 404, 401],
  },
  {
    method: 'post',
    path: '/api/studios/:studioId/renders',
    url: (c) => `${S(c)}/renders`,
    body: (c) => ({
      artworkId: c.artworkId,
      presetId: 'el-amber-640x480.standard',
      patch: { cell: { cols: 8, rows: 8 }, viewing: { exposureEv: Math.random() * 3 } },
      scale: 1,
    }),
    expect: [201, 201, 201, 404, 401],
  },
  { method: 'get', path: '/api/studios/:studioId/presets', url: (c) => `${S(c)}/presets`, expect: [200, 200, 200, 404, 401] },
  {
    method: 'post',
    path: '/api/studios/:studioId/presets',
    url: (c) => `${S(c)}/presets`,
    body: () => ({ name: 'New look', panelTypeId: 'crt-green-p1' }),
    expect: [201, 201, 403, 404, 401],
  },
  {
    method: 'post',
    path: '/api/studios/:studioId/presets/import',
    url: (c) => `${S(c)}/presets/import`,
    body: () => ({
      format: 'emberline.preset',
      version: 1,
      name: 'Imported',
      panelTypeId: 'el-amber-640x480',
      parameters: BUILT_IN_PRESETS[0].parameters,
    }),
    expect: [201, 201, 403, 404, 401],
  },
  {
    method: 'get',
    path: '/api/studios/:studioId/presets/:presetId',
    url: (c) => `${S(c)}/presets/${c.presetId}`,
    expect: [200, 200, 200, 404, 401],
  },
  {
    method: 'get',
    path: '/api/studios/:studioId/presets/:presetId/thumbnail',
    url: (c) => `${S(c)}/presets/${c.presetId}/thumbnail?artworkId=${c.artworkId}`,
    expect: [200, 200, 200, 404, 401],
  },
  {
    method: 'patch',
    path: '/api/studios/:studioId/presets/:presetId',
    url: (c) => `${S(c)}/presets/${c.presetId}`,
    body: () => ({ baseRevision: 1, name: 'Renamed look' }),
    expect: [200, 200, 403, 404, 401],
  },
  {
    method: 'delete',
    path: '/api/studios/:studioId/presets/:presetId',
    url: (c) => `${S(c)}/presets/${c.presetId}`,
    expect: [204, 204, 403, 404, 401],
  },
  {
    method: 'get',
    path: '/api/studios/:studioId/presets/:presetId/revisions',
    url: (c) => `${S(c)}/presets/${c.presetId}/revisions`,
    expect: [200, 200, 200, 404, 401],
  },
  {
    method: 'post',
    path: '/api/studios/:studioId/presets/:presetId/revisions/:n/restore',
    url: (c) => `${S(c)}/presets/${c.presetId}/revisions/1/restore`,
    expect: [200, 200, 403, 404, 401],
  },
  // Duplicating into the same studio: editors and owners may; a viewer is refused by the target's role.
  {
    method: 'post',
    path: '/api/studios/:studioId/presets/:presetId/duplicate',
    url: (c) => `${S(c)}/presets/${c.presetId}/duplicate`,
    body: (c) => ({ studioId: c.studioId }),
    expect: [201, 201, 403, 404, 401],
  },
  {
    method: 'post',
    path: '/api/studios/:studioId/presets/:presetId/reference',
    url: (c) => `${S(c)}/presets/${c.presetId}/reference`,
    body: () => ({ isReference: true }),
    expect: [200, 403, 403, 404, 401],
  },
  {
    method: 'get',
    path: '/api/studios/:studioId/presets/:presetId/export',
    url: (c) => `${S(c)}/presets/${c.presetId}/export`,
    expect: [200, 200, 200, 404, 401],
  },
  {
    method: 'get',
    path: '/api/studios/:studioId/presets/:presetId/links',
    url: (c) => `${S(c)}/presets/${c.presetId}/links`,
    expect: [200, 403, 403, 404, 401],
  },
  {
    method: 'post',
    path: '/api/studios/:studioId/presets/:presetId/links',
    url: (c) => `${S(c)}/presets/${c.presetId}/links`,
    body: () => ({ expiresInDays: 7 }),
    expect: [201, 403, 403, 404, 401],
  },
  {
    method: 'delete',
    path: '/api/studios/:studioId/presets/:presetId/links/:linkId',
    url: (c) => `${S(c)}/presets/${c.presetId}/links/${c.linkId}`,
    expect: [204, 403, 403, 404, 401],
  },
  { method: 'get', path: '/api/share/:token', url: (c) => `/api/share/${c.shareToken}`, expect: [200, 200, 200, 200, 200] },
  { method: 'get', path: '/api/share/:token/frames', url: (c) => `/api/share/${c.shareToken}/frames`, expect: [200, 200, 200, 200, 200] },
  { method: 'get', path: '/api/studios/:studioId/activity', url: (c) => `${S(c)}/activity`, expect: [200, 200, 200, 404, 401] },
  { method: 'get', path: '/api/studios/:studioId/exports', url: (c) => `${S(c)}/exports`, expect: [200, 200, 200, 404, 401] },
  {
    method: 'post',
    path: '/api/studios/:studioId/exports',
    url: (c) => `${S(c)}/exports`,
    body: (c) => ({ layout: 'grid', artworkIds: [c.artworkId], looks: ['vfd-bluegreen-256x64.standard'], scale: 1 }),
    expect: [202, 202, 403, 404, 401],
  },
  {
    method: 'post',
    path: '/api/studios/:studioId/exports/animations',
    url: (c) => `${S(c)}/exports/animations`,
    // An animation of the world's studio, uploaded for this row.
    body: async (c) => ({
      artworkId: (await h.app.artworks.upload(c.studioId, c.users.owner.id, await twoFrameGif(), 'blink.gif', {})).id,
      look: 'vfd-bluegreen-256x64.standard',
      scale: 1,
    }),
    expect: [202, 202, 403, 404, 401],
  },
  {
    method: 'get',
    path: '/api/studios/:studioId/exports/:exportId',
    url: (c) => `${S(c)}/exports/${c.exportId}`,
    expect: [200, 200, 200, 404, 401],
  },
  // A member is sent on to a signed download link (303); the link itself needs no session.
  {
    method: 'get',
    path: '/api/studios/:studioId/exports/:exportId/file',
    url: (c) => `${S(c)}/exports/${c.exportId}/file`,
    expect: [303, 303, 303, 404, 401],
  },
  {
    method: 'get',
    path: '/api/studios/:studioId/exports/:exportId/links',
    url: (c) => `${S(c)}/exports/${c.exportId}/links`,
    expect: [200, 200, 403, 404, 401],
  },
  {
    method: 'post',
    path: '/api/studios/:studioId/exports/:exportId/links',
    url: (c) => `${S(c)}/exports/${c.exportId}/links`,
    body: () => ({ expiresInDays: 3 }),
    expect: [201, 201, 403, 404, 401],
  },
  {
    method: 'delete',
    path: '/api/studios/:studioId/exports/:exportId/links/:linkId',
    url: (c) => `${S(c)}/exports/${c.exportId}/links/${c.exportLinkId}`,
    expect: [204, 204, 403, 404, 401],
  },
  {
    method: 'get',
    path: '/api/shared-exports/:token',
    url: (c) => `/api/shared-exports/${c.exportToken}`,
    expect: [200, 200, 200, 200, 200],
  },
  {
    method: 'get',
    path: '/api/shared-exports/:token/preview',
    url: (c) => `/api/shared-exports/${c.exportToken}/preview`,
    expect: [200, 200, 200, 200, 200],
  },
  {
    method: 'get',
    path: '/api/shared-exports/:token/file',
    url: (c) => `/api/shared-exports/${c.exportToken}/file`,
    expect: [303, 303, 303, 303, 303],
  },
  {
    method: 'get',
    path: '/api/downloads/:token',
    url: (c) =>
      `/api/downloads/${signDownload(h.config.sessionSecret, { key: `exports/${c.exportId}/sheet.png`, fileName: 'World sheet.png', contentType: 'image/png', expiresAt: Date.now() + 60_000 })}`,
    exportStatus: 'done',
    expect: [200, 200, 200, 200, 200],
  },
  // The editor asked for the export: the editor and owners may change it, a viewer may not.
  {
    method: 'post',
    path: '/api/studios/:studioId/exports/:exportId/cancel',
    url: (c) => `${S(c)}/exports/${c.exportId}/cancel`,
    exportStatus: 'queued',
    expect: [200, 200, 403, 404, 401],
  },
  {
    method: 'post',
    path: '/api/studios/:studioId/exports/:exportId/retry',
    url: (c) => `${S(c)}/exports/${c.exportId}/retry`,
    exportStatus: 'failed',
    expect: [200, 200, 403, 404, 401],
  },
  {
    method: 'delete',
    path: '/api/studios/:studioId/exports/:exportId',
    url: (c) => `${S(c)}/exports/${c.exportId}`,
    expect: [204, 204, 403, 404, 401],
  },
  // Panel matches: viewers look, editors upload, place marks, fit and save; owners delete anyone's.
  {
    method: 'get',
    path: '/api/studios/:studioId/matches/pattern',
    url: (c) => `${S(c)}/matches/pattern?look=vfd-bluegreen-256x64.standard`,
    expect: [200, 200, 200, 404, 401],
  },
  { method: 'get', path: '/api/studios/:studioId/matches', url: (c) => `${S(c)}/matches`, expect: [200, 200, 200, 404, 401] },
  {
    method: 'post',
    path: '/api/studios/:studioId/matches',
    url: (c) => `${S(c)}/matches`,
    upload: () => ({
      fields: { look: 'vfd-bluegreen-256x64.standard' },
      file: { name: 'photo.png', bytes: pngOf(640, 480, () => [10, 10, 10, 255]) },
    }),
    expect: [201, 201, 403, 404, 401],
  },
  {
    method: 'get',
    path: '/api/studios/:studioId/matches/:matchId',
    url: (c) => `${S(c)}/matches/${c.matchId}`,
    expect: [200, 200, 200, 404, 401],
  },
  {
    method: 'get',
    path: '/api/studios/:studioId/matches/:matchId/photo',
    url: (c) => `${S(c)}/matches/${c.matchId}/photo`,
    expect: [200, 200, 200, 404, 401],
  },
  {
    method: 'get',
    path: '/api/studios/:studioId/matches/:matchId/rectified',
    url: (c) => `${S(c)}/matches/${c.matchId}/rectified`,
    expect: [200, 200, 200, 404, 401],
  },
  {
    method: 'get',
    path: '/api/studios/:studioId/matches/:matchId/simulated',
    url: (c) => `${S(c)}/matches/${c.matchId}/simulated`,
    expect: [200, 200, 200, 404, 401],
  },
  {
    method: 'get',
    path: '/api/studios/:studioId/matches/:matchId/residual',
    url: (c) => `${S(c)}/matches/${c.matchId}/residual`,
    expect: [200, 200, 200, 404, 401],
  },
  {
    method: 'put',
    path: '/api/studios/:studioId/matches/:matchId/marks',
    url: (c) => `${S(c)}/matches/${c.matchId}/marks`,
    body: () => ({
      marks: [
        [50, 50],
        [590, 60],
        [580, 430],
        [60, 420],
      ],
    }),
    matchStatus: 'marking',
    expect: [200, 200, 403, 404, 401],
  },
  {
    method: 'post',
    path: '/api/studios/:studioId/matches/:matchId/fit',
    url: (c) => `${S(c)}/matches/${c.matchId}/fit`,
    matchStatus: 'marking',
    expect: [202, 202, 403, 404, 401],
  },
  {
    method: 'post',
    path: '/api/studios/:studioId/matches/:matchId/save',
    url: (c) => `${S(c)}/matches/${c.matchId}/save`,
    body: () => ({ name: `Fitted ${Math.random()}` }),
    expect: [201, 201, 403, 404, 401],
  },
  {
    method: 'delete',
    path: '/api/studios/:studioId/matches/:matchId',
    url: (c) => `${S(c)}/matches/${c.matchId}`,
    expect: [204, 204, 403, 404, 401],
  },
  { method: 'get', path: '/api/panel-types', url: () => '/api/panel-types', expect: [200, 200, 200, 200, 200] },
  {
    method: 'post',
    path: '/api/renders',
    url: () => '/api/renders',
    // A fresh image each time, so every allowed call renders (201) rather than hitting the cache.
    upload: () => ({
      fields: { presetId: 'el-amber-640x480.standard', patch: JSON.stringify({ cell: { cols: 8, rows: 8 } }), scale: '1' },
      file: { name: 'a.png', bytes: pngOf(4, 4, () => [Math.floor(Math.random() * 256), 0, 0, 255]) },
    }),
    expect: [201, 201, 201, 201, 401],
  },
  // A render of an uploaded file belongs to whoever asked for it (here: "other"); everyone else sees 404.
  { method: 'get', path: '/api/renders/:key', url: () => `/api/renders/${renderKey}`, expect: [404, 404, 404, 200, 401] },
  {
    method: 'get',
    path: '/api/studios/:studioId/renders/:key',
    url: (c) => `${S(c)}/renders/${c.studioRenderKey}`,
    expect: [200, 200, 200, 404, 401],
  },
  {
    method: 'post',
    path: '/api/invites/:token/accept',
    url: (c) => `/api/invites/${c.inviteToken}/accept`,
    body: async (c) => {
      await Invite.update({ email: actorEmail(c) }, { where: { id: c.inviteId } });
      return {};
    },
    expect: [200, 200, 200, 200, 401],
  },
];

let h: Harness;
let users: WorldUsers;
let renderKey: string;

/** A two-frame 8 × 8 GIF (dark, then light). */
const twoFrameGif = () =>
  sharp(Buffer.from([...Array(64).fill([20, 20, 20, 255]).flat(), ...Array(64).fill([220, 220, 220, 255]).flat()]), {
    raw: { width: 8, height: 16, channels: 4, pageHeight: 8 },
  })
    .gif({ delay: [200, 200] })
    .toBuffer();

/** An export of the world's artwork that the editor asked for, in the given state (a done one with its file). */
async function worldExport(studioId: string, artworkId: string, status: 'queued' | 'failed' | 'done'): Promise<string> {
  const look = BUILT_IN_PRESETS[0];
  const row = await Export.create({
    studioId,
    createdById: users.editor.id,
    title: 'World sheet',
    kind: 'sheet',
    layout: 'grid',
    status,
    files: status === 'done' ? { png: 1 } : null,
    spec: {
      studioName: 'World',
      layout: 'grid',
      scale: 1,
      frame: 0,
      report: false,
      artworks: [{ id: artworkId, name: 'tile' }],
      looks: [
        {
          id: look.id,
          name: look.name,
          revision: null,
          panelTypeId: look.panelTypeId,
          panelTypeName: 'Amber EL',
          parameters: look.parameters,
        },
      ],
    },
  });
  if (status === 'done')
    await new FileStore(h.app.blobs).write(
      'exports',
      row.id,
      'sheet.png',
      pngOf(4, 4, () => [1, 2, 3, 255]),
    );
  return row.id;
}

/** A panel match of the world's studio that the editor made, with its photo (and, when done, a result and its image). */
async function worldMatch(studioId: string, status: 'marking' | 'done'): Promise<string> {
  const look = BUILT_IN_PRESETS[0];
  const marks: [number, number][] = [
    [50, 50],
    [590, 60],
    [580, 430],
    [60, 420],
  ];
  const row = await PanelMatch.create({
    studioId,
    createdById: users.editor.id,
    look: {
      id: look.id,
      name: look.name,
      revision: null,
      panelTypeId: look.panelTypeId,
      panelTypeName: 'Amber EL',
      parameters: look.parameters,
    },
    photoName: 'photo.png',
    photoWidth: 640,
    photoHeight: 480,
    activeWidthMm: 192,
    activeHeightMm: 144,
    cameraGamma: null,
    marks,
    status,
    result:
      status === 'done'
        ? {
            parameters: look.parameters,
            fitted: [],
            levels: [],
            quality: {
              agreement: 1,
              rmsResidual: 0,
              pixelsPerCell: 1,
              clippedShare: 0,
              crushedShare: 0,
              marksMovedPx: [0, 0, 0, 0],
              periodCells: [2, 2],
              iterations: 1,
            },
            cameraBlurMm: 0,
            notDetermined: [],
            marks,
          }
        : null,
  });
  await h.app.blobs.put(
    `matches/${row.id}/photo`,
    pngOf(640, 480, () => [10, 10, 10, 255]),
  );
  if (status === 'done')
    await h.app.blobs.put(
      `matches/${row.id}/residual.png`,
      pngOf(4, 4, () => [1, 2, 3, 255]),
    );
  return row.id;
}

beforeAll(async () => {
  h = await createHarness();
  users = await createUsers();
  const maker = new TestClient(h.app);
  await maker.post('/api/auth/sign-in', { email: users.other.email, password: WORLD_PASSWORD });
  const made = await maker.upload(
    '/api/renders',
    { presetId: 'el-amber-640x480.standard', patch: JSON.stringify({ cell: { cols: 8, rows: 8 } }), scale: '1' },
    { name: 'a.png', bytes: pngOf(4, 4, () => [9, 9, 9, 255]) },
  );
  renderKey = made.body.render.key;
});
afterAll(() => h.close());

test('the table has exactly one row per registered /api route', () => {
  const registered = h.app.apiSpecs.map((s) => `${s.method.toUpperCase()} ${s.path}`).sort();
  const table = ROWS.map((r) => `${r.method.toUpperCase()} ${r.path}`).sort();
  expect(table).toEqual(registered);
});

test('deny by default: every route in the Express router starts with a policy middleware', () => {
  type Layer = { route?: { path: string; stack: { handle: unknown }[] }; handle: { stack?: Layer[] } };
  const walk = (stack: Layer[], depth: number): { path: string; depth: number; hasPolicy: boolean }[] =>
    stack.flatMap((layer) =>
      layer.route
        ? [{ path: layer.route.path, depth, hasPolicy: POLICY in (layer.route.stack[0].handle as object) }]
        : layer.handle?.stack
          ? walk(layer.handle.stack, depth + 1)
          : [],
    );
  // The only top-level routes are the single-page app's index fallbacks; /api routes are mounted routers.
  const spaPaths = ['/{*splat}', '/'];
  const routes = walk((h.app as unknown as { router: { stack: Layer[] } }).router.stack, 0).filter(
    (r) => !(r.depth === 0 && spaPaths.includes(r.path)),
  );
  expect(routes).toHaveLength(h.app.apiSpecs.length);
  expect(routes.filter((r) => !r.hasPolicy)).toEqual([]);
});

describe.each(ROWS)('$method $path', (row) => {
  test.each(ACTORS.map((actor, i) => [actor, row.expect[i]] as const))('%s → %i', async (actor, expected) => {
    const world = await createStudioWorld(users, h.app.artworks);
    const studioRenderKey =
      row.path.endsWith('/renders/:key') && row.path.startsWith('/api/studios')
        ? (
            await h.app.renders.render(
              { studioId: world.studio.id, artworkId: world.artworkId, userId: users.owner.id },
              { input: await h.app.artworks.original(world.artworkId), parameters: BUILT_IN_PRESETS[0].parameters, scale: 1, frame: 0 },
            )
          ).key
        : '';
    const exportId =
      row.path.includes(':exportId') || row.path.includes('/downloads/') || row.path.includes('/shared-exports/')
        ? await worldExport(world.studio.id, world.artworkId, row.exportStatus ?? 'done')
        : '';
    const { token: exportToken, hash } = newToken();
    const exportLinkId = exportId
      ? (await ExportLink.create({ exportId, tokenHash: hash, createdById: users.editor.id, expiresAt: null })).id
      : '';
    const matchId = row.path.includes(':matchId') ? await worldMatch(world.studio.id, row.matchStatus ?? 'done') : '';
    const cell: Cell = {
      matchId,
      studioId: world.studio.id,
      users,
      actor,
      inviteId: world.invite.id,
      inviteToken: world.inviteToken,
      timingId: world.timing.id,
      romId: world.romId,
      artworkId: world.artworkId,
      presetId: world.presetId,
      linkId: world.linkId,
      shareToken: world.shareToken,
      otherStudioId: world.studio.id,
      studioRenderKey,
      exportId,
      exportLinkId,
      exportToken,
    };
    const client = new TestClient(h.app);
    if (actor !== 'anonymous') {
      const signIn = await client.post('/api/auth/sign-in', { email: users[actor].email, password: WORLD_PASSWORD });
      expect(signIn.status).toBe(200);
    }
    const body = row.body ? await row.body(cell) : undefined;
    const upload = row.upload?.();
    const res = upload
      ? await client.upload(row.url(cell), upload.fields, upload.file)
      : await client.send(row.method, row.url(cell), body);
    expect({ status: res.status, body: res.status >= 400 ? res.body : undefined }).toMatchObject({ status: expected });
    if (res.status >= 400) expect(res.body.error.code).toEqual(expect.any(String));
  });
});

test('a cross-studio id changes nothing (ASVS 5.0 8.2.2)', async () => {
  const world = await createStudioWorld(users);
  const client = new TestClient(h.app);
  await client.post('/api/auth/sign-in', { email: users.other.email, password: WORLD_PASSWORD });
  expect((await client.patch(`/api/studios/${world.studio.id}/members/${users.target.id}`, { role: 'owner' })).status).toBe(404);
  expect((await client.delete(`/api/studios/${world.studio.id}`)).status).toBe(404);
  const target = await Membership.findOne({ where: { studioId: world.studio.id, userId: users.target.id } });
  expect(target?.role).toBe('viewer');
});
