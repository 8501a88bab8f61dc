import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type NonAttribute,
  type Sequelize,
} from 'sequelize';
import type { Crop } from '../../../shared/schemas/crops';
import type { Field } from './field.model';

/** One crop in one field in one year. */
export class CropSeason extends Model<InferAttributes<CropSeason>, InferCreationAttributes<CropSeason>> {
  declare id: CreationOptional<string>;
  declare workspaceId: string;
  declare growerId: string;
  declare fieldId: string;
  declare year: number;
  declare crop: Crop;
  declare plannedPlantingDate: string | null;
  declare notes: string | null;
  declare archivedAt: CreationOptional<Date | null>;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare field?: NonAttribute<Field>;

  static initModel(sequelize: Sequelize) {
    CropSeason.init(
      {
        id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
        workspaceId: { type: DataTypes.UUID, allowNull: false },
        growerId: { type: DataTypes.UUID, allowNull: false },
        fieldId: { type: DataTypes.UUID, allowNull: false },
        year: { type: DataTypes.INTEGER, allowNull: false },
        crop: { type: DataTypes.TEXT, allowNull: false },
        plannedPlantingDate: { type: DataTypes.DATEONLY, allowNull: true },
        notes: DataTypes.TEXT,
        archivedAt: DataTypes.DATE,
        version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'crop_seasons', version: true },
    );
  }
}
