import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

/** A stored reference render, keyed by the hash of everything that determines its pixels. */
export class Render extends Model<InferAttributes<Render>, InferCreationAttributes<Render>> {
  declare key: string;
  declare width: number;
  declare height: number;
  declare bytes: number;
  declare createdById: string | null;
  /** The studio whose artwork was rendered; null for a render of an uploaded file (its creator's). */
  declare studioId: CreationOptional<string | null>;
  declare artworkId: CreationOptional<string | null>;
  declare lastUsedAt: CreationOptional<Date>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export function initRender(sequelize: Sequelize): void {
  Render.init(
    {
      key: { type: DataTypes.CHAR(64), primaryKey: true },
      width: { type: DataTypes.INTEGER, allowNull: false },
      height: { type: DataTypes.INTEGER, allowNull: false },
      bytes: { type: DataTypes.INTEGER, allowNull: false },
      createdById: { type: DataTypes.UUID, allowNull: true },
      studioId: { type: DataTypes.UUID, allowNull: true },
      artworkId: { type: DataTypes.UUID, allowNull: true },
      lastUsedAt: { type: DataTypes.DATE, allowNull: false, defaultValue: DataTypes.NOW },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'renders' },
  );
}
