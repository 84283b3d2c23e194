import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

/** A stored reference render, keyed by the hash of everything that determines its pixels. */
export class Render extends Model<InferAttributes<Render>, InferCreationAttributes<Render>> {
  declare key: string;
  declare width: number;
  declare height: number;
  declare bytes: number;
  declare createdById: string | null;
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
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'renders' },
  );
}
