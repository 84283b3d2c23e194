import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
  type Transaction,
} from 'sequelize';

/** What happened in a studio, by whom. */
export class Activity extends Model<InferAttributes<Activity>, InferCreationAttributes<Activity>> {
  declare id: CreationOptional<number>;
  declare studioId: string;
  declare actorId: string | null;
  declare kind: string;
  declare summary: string;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export function initActivity(sequelize: Sequelize): void {
  Activity.init(
    {
      id: { type: DataTypes.BIGINT, primaryKey: true, autoIncrement: true },
      studioId: { type: DataTypes.UUID, allowNull: false },
      actorId: { type: DataTypes.UUID, allowNull: true },
      kind: { type: DataTypes.STRING(40), allowNull: false },
      summary: { type: DataTypes.STRING(300), allowNull: false },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'activities' },
  );
}

/** Records one event in the studio's feed (inside the caller's transaction when given). */
export function record(
  studioId: string,
  actorId: string | null,
  kind: string,
  summary: string,
  transaction?: Transaction,
): Promise<Activity> {
  return Activity.create({ studioId, actorId, kind, summary: summary.slice(0, 300) }, { transaction });
}
