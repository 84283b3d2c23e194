import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { TimingSource } from '@shared/api/timing.schema';
import type { PanelInterface } from '@shared/drive/interface';

/** A studio's saved drive timing for one panel type. */
export class SavedTiming extends Model<InferAttributes<SavedTiming>, InferCreationAttributes<SavedTiming>> {
  declare id: CreationOptional<string>;
  declare studioId: string;
  declare name: string;
  declare panelTypeId: string;
  declare source: TimingSource;
  declare interface: PanelInterface;
  declare createdById: string | null;
  declare updatedById: string | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export function initSavedTiming(sequelize: Sequelize): void {
  SavedTiming.init(
    {
      id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
      studioId: { type: DataTypes.UUID, allowNull: false },
      name: { type: DataTypes.STRING(80), allowNull: false },
      panelTypeId: { type: DataTypes.STRING(100), allowNull: false },
      source: { type: DataTypes.JSONB, allowNull: false },
      interface: { type: DataTypes.JSONB, allowNull: false },
      createdById: { type: DataTypes.UUID, allowNull: true },
      updatedById: { type: DataTypes.UUID, allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'timings' },
  );
}
