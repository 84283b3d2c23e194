import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { PanelParams } from '@shared/model/parameters';
import type { ParamChange } from '@shared/model/param-diff';

/** A studio's named look for a panel type; `revision` counts its saves. */
export class Preset extends Model<InferAttributes<Preset>, InferCreationAttributes<Preset>> {
  declare id: CreationOptional<string>;
  declare studioId: string;
  declare panelTypeId: string;
  declare name: string;
  declare parameters: PanelParams;
  declare revision: number;
  declare isReference: CreationOptional<boolean>;
  declare updatedById: string | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

/** One immutable save of a preset: who, when, what changed. */
export class PresetRevision extends Model<InferAttributes<PresetRevision>, InferCreationAttributes<PresetRevision>> {
  declare id: CreationOptional<string>;
  declare presetId: string;
  declare revision: number;
  declare name: string;
  declare parameters: PanelParams;
  declare changes: ParamChange[];
  declare message: string | null;
  declare authorId: string | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

/** A read-only link to a preset (and an artwork to show it on). */
export class ShareLink extends Model<InferAttributes<ShareLink>, InferCreationAttributes<ShareLink>> {
  declare id: CreationOptional<string>;
  declare presetId: string;
  declare artworkId: string | null;
  declare tokenHash: string;
  declare createdById: string | null;
  declare expiresAt: Date | null;
  declare revokedAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export function initPresets(sequelize: Sequelize): void {
  const id = { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 };
  const stamps = { createdAt: DataTypes.DATE, updatedAt: DataTypes.DATE };
  Preset.init(
    {
      id,
      studioId: { type: DataTypes.UUID, allowNull: false },
      panelTypeId: { type: DataTypes.STRING(100), allowNull: false },
      name: { type: DataTypes.STRING(80), allowNull: false },
      parameters: { type: DataTypes.JSONB, allowNull: false },
      revision: { type: DataTypes.INTEGER, allowNull: false },
      isReference: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
      updatedById: { type: DataTypes.UUID, allowNull: true },
      ...stamps,
    },
    { sequelize, tableName: 'presets' },
  );
  PresetRevision.init(
    {
      id,
      presetId: { type: DataTypes.UUID, allowNull: false },
      revision: { type: DataTypes.INTEGER, allowNull: false },
      name: { type: DataTypes.STRING(80), allowNull: false },
      parameters: { type: DataTypes.JSONB, allowNull: false },
      changes: { type: DataTypes.JSONB, allowNull: false },
      message: { type: DataTypes.STRING(500), allowNull: true },
      authorId: { type: DataTypes.UUID, allowNull: true },
      ...stamps,
    },
    { sequelize, tableName: 'preset_revisions' },
  );
  ShareLink.init(
    {
      id,
      presetId: { type: DataTypes.UUID, allowNull: false },
      artworkId: { type: DataTypes.UUID, allowNull: true },
      tokenHash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
      createdById: { type: DataTypes.UUID, allowNull: true },
      expiresAt: { type: DataTypes.DATE, allowNull: true },
      revokedAt: { type: DataTypes.DATE, allowNull: true },
      ...stamps,
    },
    { sequelize, tableName: 'share_links' },
  );
}
