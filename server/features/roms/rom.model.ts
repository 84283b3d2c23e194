import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { RomPatchRecord } from '@shared/api/dto';

/** A video option ROM image uploaded to a studio, or patched from one. */
export class VideoRom extends Model<InferAttributes<VideoRom>, InferCreationAttributes<VideoRom>> {
  declare id: CreationOptional<string>;
  declare studioId: string;
  declare name: string;
  declare bytes: Buffer;
  declare size: number;
  declare sha256: string;
  declare patchedFromId: string | null;
  declare patch: RomPatchRecord | null;
  declare createdById: string | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export function initVideoRom(sequelize: Sequelize): void {
  VideoRom.init(
    {
      id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
      studioId: { type: DataTypes.UUID, allowNull: false },
      name: { type: DataTypes.STRING(120), allowNull: false },
      bytes: { type: DataTypes.BLOB, allowNull: false },
      size: { type: DataTypes.INTEGER, allowNull: false },
      sha256: { type: DataTypes.CHAR(64), allowNull: false },
      patchedFromId: { type: DataTypes.UUID, allowNull: true },
      patch: { type: DataTypes.JSONB, allowNull: true },
      createdById: { type: DataTypes.UUID, allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'video_roms' },
  );
}
