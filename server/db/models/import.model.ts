import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';
import type { ImportPurpose } from '../../../shared/schemas/import.schema';

export type ImportFormat = 'geojson' | 'shapefile' | 'kml' | 'kmz' | 'csv';

/** One reading of an upload: its purpose, format and the coordinate system the user chose (if asked). */
export class Import extends Model<InferAttributes<Import>, InferCreationAttributes<Import>> {
  declare id: CreationOptional<string>;
  declare workspaceId: string;
  declare uploadId: string;
  declare fieldId: string;
  declare purpose: ImportPurpose;
  declare format: ImportFormat;
  declare crsCode: string | null;
  declare createdBy: string | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    Import.init(
      {
        id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
        workspaceId: { type: DataTypes.UUID, allowNull: false },
        uploadId: { type: DataTypes.UUID, allowNull: false },
        fieldId: { type: DataTypes.UUID, allowNull: false },
        purpose: { type: DataTypes.TEXT, allowNull: false },
        format: { type: DataTypes.TEXT, allowNull: false },
        crsCode: { type: DataTypes.TEXT, allowNull: true },
        createdBy: { type: DataTypes.UUID, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'imports' },
    );
  }
}
