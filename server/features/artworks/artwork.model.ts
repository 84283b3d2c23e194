import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { SpriteSheet } from '@shared/pipeline/sprite-sheet';

/** An uploaded artwork (still, animation or sprite sheet). */
export class Artwork extends Model<InferAttributes<Artwork>, InferCreationAttributes<Artwork>> {
  declare id: CreationOptional<string>;
  declare studioId: string;
  declare name: string;
  declare type: 'png' | 'gif' | 'jpeg' | 'webp';
  /** Size of one frame. */
  declare width: number;
  declare height: number;
  declare frameCount: number;
  declare delaysMs: number[];
  declare bytes: number;
  declare sheet: SpriteSheet | null;
  declare createdById: string | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export function initArtwork(sequelize: Sequelize): void {
  Artwork.init(
    {
      id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
      studioId: { type: DataTypes.UUID, allowNull: false },
      name: { type: DataTypes.STRING(120), allowNull: false },
      type: { type: DataTypes.STRING(8), allowNull: false },
      width: { type: DataTypes.INTEGER, allowNull: false },
      height: { type: DataTypes.INTEGER, allowNull: false },
      frameCount: { type: DataTypes.INTEGER, allowNull: false },
      delaysMs: { type: DataTypes.JSONB, allowNull: false },
      bytes: { type: DataTypes.INTEGER, allowNull: false },
      sheet: { type: DataTypes.JSONB, allowNull: true },
      createdById: { type: DataTypes.UUID, allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'artworks' },
  );
}
