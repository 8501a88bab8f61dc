import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';
import { Import } from './import.model';
import type { ImportPurpose } from '../../../shared/schemas/import.schema';

/** A file as it was uploaded (bytes, name, hash, who, when). Written with INSERT … ON CONFLICT, read here. */
export class Upload extends Model<InferAttributes<Upload>, InferCreationAttributes<Upload>> {
  declare id: CreationOptional<string>;
  declare workspaceId: string;
  declare fieldId: string;
  declare purpose: ImportPurpose;
  declare originalName: string;
  declare sizeBytes: number;
  declare sha256: string;
  declare content: Buffer;
  declare createdBy: string | null;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    Upload.init(
      {
        id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
        workspaceId: { type: DataTypes.UUID, allowNull: false },
        fieldId: { type: DataTypes.UUID, allowNull: false },
        purpose: { type: DataTypes.TEXT, allowNull: false },
        originalName: { type: DataTypes.TEXT, allowNull: false },
        sizeBytes: { type: DataTypes.INTEGER, allowNull: false },
        sha256: { type: DataTypes.TEXT, allowNull: false },
        content: { type: DataTypes.BLOB, allowNull: false },
        createdBy: { type: DataTypes.UUID, allowNull: true },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'uploads', updatedAt: false },
    );
  }
}

/** Initialises the upload and import models (called from associations.ts). */
export function initImportModels(sequelize: Sequelize) {
  Upload.initModel(sequelize);
  Import.initModel(sequelize);
}
