import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { MatchResultDto, MatchStatus } from '@shared/api/match.schema';
import type { LookSpec } from '../exports/export.model';

/** A photo of the match pattern on a real panel, its marks, and the fit's state and result. */
export class PanelMatch extends Model<InferAttributes<PanelMatch>, InferCreationAttributes<PanelMatch>> {
  declare id: CreationOptional<string>;
  declare studioId: string;
  declare createdById: string | null;
  /** The look the fit starts from, frozen when the photo was uploaded. */
  declare look: LookSpec;
  declare photoName: string;
  declare photoWidth: number;
  declare photoHeight: number;
  declare activeWidthMm: number;
  declare activeHeightMm: number;
  declare cameraGamma: number | null;
  declare marks: CreationOptional<[number, number][] | null>;
  declare status: CreationOptional<MatchStatus>;
  declare progress: CreationOptional<number>;
  declare step: CreationOptional<string>;
  declare error: CreationOptional<string | null>;
  declare result: CreationOptional<MatchResultDto | null>;
  declare savedPresetId: CreationOptional<string | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export function initPanelMatch(sequelize: Sequelize): void {
  PanelMatch.init(
    {
      id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
      studioId: { type: DataTypes.UUID, allowNull: false },
      createdById: { type: DataTypes.UUID, allowNull: true },
      look: { type: DataTypes.JSONB, allowNull: false },
      photoName: { type: DataTypes.STRING(255), allowNull: false },
      photoWidth: { type: DataTypes.INTEGER, allowNull: false },
      photoHeight: { type: DataTypes.INTEGER, allowNull: false },
      activeWidthMm: { type: DataTypes.REAL, allowNull: false },
      activeHeightMm: { type: DataTypes.REAL, allowNull: false },
      cameraGamma: { type: DataTypes.REAL, allowNull: true },
      marks: { type: DataTypes.JSONB, allowNull: true },
      status: { type: DataTypes.STRING(12), allowNull: false, defaultValue: 'marking' },
      progress: { type: DataTypes.REAL, allowNull: false, defaultValue: 0 },
      step: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
      error: { type: DataTypes.TEXT, allowNull: true },
      result: { type: DataTypes.JSONB, allowNull: true },
      savedPresetId: { type: DataTypes.UUID, allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'panel_matches' },
  );
}
