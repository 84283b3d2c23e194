import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { ExportDto, ExportFlash, ExportKind, ExportStatus } from '@shared/api/export.schema';
import type { SheetLayout } from '@shared/export/sheet';
import type { PanelParams } from '@shared/model/parameters';

/** A look as a request froze it: a preset's parameters at its revision then. */
export interface LookSpec {
  id: string;
  name: string;
  revision: number | null;
  panelTypeId: string;
  panelTypeName: string;
  parameters: PanelParams;
}

/** A sheet request frozen when it was made. */
export interface SheetSpec {
  studioName: string;
  layout: SheetLayout;
  scale: number;
  frame: number;
  artworks: { id: string; name: string }[];
  looks: LookSpec[];
  /** Each render's analysis under its label and in the manifest. */
  report: boolean;
}

/** An animation request frozen when it was made. */
export interface AnimationSpec {
  studioName: string;
  artwork: { id: string; name: string };
  look: LookSpec;
  scale: number;
  /** Viewing distance of the flash check, mm. */
  distanceMm: number;
  frames: number;
  durationMs: number;
}

/** An export (a comparison sheet) and its job's state. */
export class Export extends Model<InferAttributes<Export>, InferCreationAttributes<Export>> {
  declare id: CreationOptional<string>;
  declare studioId: string;
  declare createdById: string | null;
  declare title: string;
  declare kind: ExportKind;
  /** A sheet's layout, or "animation". */
  declare layout: SheetLayout | 'animation';
  declare spec: SheetSpec | AnimationSpec;
  declare status: ExportStatus;
  declare progress: CreationOptional<number>;
  declare step: CreationOptional<string>;
  declare error: CreationOptional<string | null>;
  declare attempts: CreationOptional<number>;
  declare workedBy: CreationOptional<string | null>;
  declare width: CreationOptional<number | null>;
  declare height: CreationOptional<number | null>;
  /** Bytes of each file made, by format (png, pdf, zip), once done. */
  declare files: CreationOptional<Record<string, number> | null>;
  declare figures: CreationOptional<ExportDto['figures']>;
  declare flash: CreationOptional<ExportFlash | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare finishedAt: CreationOptional<Date | null>;
}

/** A read-only link to a finished export, for someone without an account. */
export class ExportLink extends Model<InferAttributes<ExportLink>, InferCreationAttributes<ExportLink>> {
  declare id: CreationOptional<string>;
  declare exportId: string;
  declare tokenHash: string;
  declare createdById: string | null;
  declare expiresAt: Date | null;
  declare revokedAt: CreationOptional<Date | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
}

export function initExport(sequelize: Sequelize): void {
  Export.init(
    {
      id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
      studioId: { type: DataTypes.UUID, allowNull: false },
      createdById: { type: DataTypes.UUID, allowNull: true },
      title: { type: DataTypes.STRING(120), allowNull: false },
      kind: { type: DataTypes.STRING(20), allowNull: false },
      layout: { type: DataTypes.STRING(20), allowNull: false },
      spec: { type: DataTypes.JSONB, allowNull: false },
      status: { type: DataTypes.STRING(12), allowNull: false, defaultValue: 'queued' },
      progress: { type: DataTypes.REAL, allowNull: false, defaultValue: 0 },
      step: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
      error: { type: DataTypes.TEXT, allowNull: true },
      attempts: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
      workedBy: { type: DataTypes.STRING(120), allowNull: true },
      width: { type: DataTypes.INTEGER, allowNull: true },
      height: { type: DataTypes.INTEGER, allowNull: true },
      files: { type: DataTypes.JSONB, allowNull: true },
      figures: { type: DataTypes.JSONB, allowNull: true },
      flash: { type: DataTypes.JSONB, allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
      finishedAt: { type: DataTypes.DATE, allowNull: true },
    },
    { sequelize, tableName: 'exports' },
  );
  ExportLink.init(
    {
      id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
      exportId: { type: DataTypes.UUID, allowNull: false },
      tokenHash: { type: DataTypes.CHAR(64), allowNull: false },
      createdById: { type: DataTypes.UUID, allowNull: true },
      expiresAt: { type: DataTypes.DATE, allowNull: true },
      revokedAt: { type: DataTypes.DATE, allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    },
    { sequelize, tableName: 'export_links' },
  );
}
