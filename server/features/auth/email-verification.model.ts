import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';

/** A sign-up waiting for its mailed link: the account is created only when the link is opened. */
export class EmailVerification extends Model<InferAttributes<EmailVerification>, InferCreationAttributes<EmailVerification>> {
  declare id: CreationOptional<string>;
  declare email: string;
  declare displayName: string;
  /** argon2id hash of the password chosen at sign-up; becomes the account's on verification. */
  declare passwordHash: string;
  declare tokenHash: string;
  declare expiresAt: Date;
  declare usedAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export function initEmailVerification(sequelize: Sequelize): void {
  EmailVerification.init(
    {
      id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
      email: { type: DataTypes.STRING(254), allowNull: false },
      displayName: { type: DataTypes.STRING(80), allowNull: false },
      passwordHash: { type: DataTypes.TEXT, allowNull: false },
      tokenHash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
      expiresAt: { type: DataTypes.DATE, allowNull: false },
      usedAt: { type: DataTypes.DATE, allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'email_verifications' },
  );
}
