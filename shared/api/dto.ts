import type { Role } from '../model/roles';

/** The signed-in user as the API returns it. */
export interface UserDto {
  id: string;
  email: string;
  displayName: string;
  /** The account proved it owns its address; needed to create or join a studio. */
  emailVerified: boolean;
}

/** A studio with the caller's role in it. */
export interface StudioDto {
  id: string;
  name: string;
  role: Role;
  createdAt: string;
}

export interface MemberDto {
  userId: string;
  email: string;
  displayName: string;
  role: Role;
  joinedAt: string;
}

export interface InviteDto {
  id: string;
  email: string;
  role: Role;
  expiresAt: string;
  createdAt: string;
}

/** What an invite link shows before it is accepted. */
/** What an invite link shows; once accepted it shows nothing but that fact. */
export type InvitePreviewDto = { accepted: true } | { accepted: false; studioName: string; role: Role; email: string; expired: boolean };

/** The error body every failing /api call answers with. */
export interface ApiErrorBody {
  error: { code: string; message: string; details?: unknown };
}

/** A saved drive timing with what follows from it. */
export interface SavedTimingDto {
  id: string;
  name: string;
  panelTypeId: string;
  source: import('./timing.schema').TimingSource;
  interface: import('../drive/interface').PanelInterface;
  timing: import('../drive/timing').Timing;
  figures: import('../drive/timing').TimingFigures;
  panel: import('../drive/interface').InterfaceFigures;
  warnings: string[];
  updatedAt: string;
}

/** An artwork in a studio's library. */
export interface ArtworkDto {
  id: string;
  name: string;
  type: 'png' | 'gif' | 'jpeg' | 'webp';
  width: number;
  height: number;
  frameCount: number;
  delaysMs: number[];
  bytes: number;
  sheet: import('../pipeline/sprite-sheet').SpriteSheet | null;
  createdAt: string;
  updatedAt: string;
  originalUrl: string;
  thumbnailUrl: string;
  framesUrl: string;
}

/** A studio preset at its current revision. */
export interface PresetDto {
  id: string;
  studioId: string;
  panelTypeId: string;
  name: string;
  parameters: import('../model/parameters').PanelParams;
  revision: number;
  isReference: boolean;
  updatedAt: string;
  updatedBy: string | null;
}

/** One saved revision of a preset. */
export interface PresetRevisionDto {
  revision: number;
  name: string;
  parameters: import('../model/parameters').PanelParams;
  changes: import('../model/param-diff').ParamChange[];
  message: string | null;
  author: string | null;
  createdAt: string;
}

/** A share link as its owners see it (the token only once, at creation). */
export interface ShareLinkDto {
  id: string;
  url?: string;
  artworkId: string | null;
  expiresAt: string | null;
  revokedAt: string | null;
  createdAt: string;
}

/** What a share link opens: the preset and its artwork, read-only. */
export interface SharedViewDto {
  preset: Pick<PresetDto, 'name' | 'panelTypeId' | 'parameters' | 'revision'>;
  studioName: string;
  artwork: Pick<ArtworkDto, 'name' | 'width' | 'height' | 'frameCount' | 'delaysMs'> | null;
  framesUrl: string | null;
}

export interface ActivityDto {
  id: number;
  kind: string;
  summary: string;
  actor: string | null;
  createdAt: string;
}

/** What a patch changed, kept with the patched image. */
export interface RomPatchRecord {
  entryIndex: number;
  entryOffset: number;
  timingId: string;
  timingName: string;
  mode: string;
  changes: import('../drive/vga-rom').PatchChange[];
  checksum: { at: number; old: number; new: number };
  notes: string[];
}

/** A stored video option ROM image. */
export interface VideoRomDto {
  id: string;
  name: string;
  /** Bytes in the file. */
  size: number;
  sha256: string;
  /** All bytes of the declared image sum to 0 mod 256. */
  checksumOk: boolean;
  patchedFromId: string | null;
  patch: RomPatchRecord | null;
  /** Images patched from this one. */
  patchedIds: string[];
  createdAt: string;
  imageUrl: string;
}

/** One image with what reading it found, or why it could not be read. */
export interface VideoRomDetailDto {
  rom: VideoRomDto;
  info: import('../drive/vga-rom').RomInfo | null;
  problem: { code: string; message: string } | null;
}
