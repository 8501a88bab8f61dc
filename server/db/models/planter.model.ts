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
import type { Grower } from './grower.model';

/** A planter profile, in SI units (metres, metres per second, disc revolutions per minute). */
export class Planter extends Model<InferAttributes<Planter>, InferCreationAttributes<Planter>> {
  declare id: CreationOptional<string>;
  declare workspaceId: string;
  declare growerId: string;
  declare name: string;
  declare rowCount: number;
  declare rowSpacingM: number;
  declare arrangement: 'single' | 'split-row';
  declare interplantRowCount: number | null;
  declare rowsPerSection: number;
  declare displaySectionLimit: number;
  declare holesPerDisc: { crop: Crop; holes: number }[];
  declare discRpmMin: number;
  declare discRpmMax: number;
  declare speedMinMps: number;
  declare speedPlannedMps: number;
  declare speedMaxMps: number;
  declare groundSpeedSource: 'radar' | 'wheel' | 'gnss';
  declare notes: string | null;
  declare archivedAt: CreationOptional<Date | null>;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare grower?: NonAttribute<Grower>;

  static initModel(sequelize: Sequelize) {
    Planter.init(
      {
        id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
        workspaceId: { type: DataTypes.UUID, allowNull: false },
        growerId: { type: DataTypes.UUID, allowNull: false },
        name: { type: DataTypes.TEXT, allowNull: false },
        rowCount: { type: DataTypes.INTEGER, allowNull: false },
        rowSpacingM: { type: DataTypes.DOUBLE, allowNull: false },
        arrangement: { type: DataTypes.TEXT, allowNull: false },
        interplantRowCount: { type: DataTypes.INTEGER, allowNull: true },
        rowsPerSection: { type: DataTypes.INTEGER, allowNull: false },
        displaySectionLimit: { type: DataTypes.INTEGER, allowNull: false },
        holesPerDisc: { type: DataTypes.JSONB, allowNull: false },
        discRpmMin: { type: DataTypes.DOUBLE, allowNull: false },
        discRpmMax: { type: DataTypes.DOUBLE, allowNull: false },
        speedMinMps: { type: DataTypes.DOUBLE, allowNull: false },
        speedPlannedMps: { type: DataTypes.DOUBLE, allowNull: false },
        speedMaxMps: { type: DataTypes.DOUBLE, allowNull: false },
        groundSpeedSource: { type: DataTypes.TEXT, allowNull: false },
        notes: DataTypes.TEXT,
        archivedAt: DataTypes.DATE,
        version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'planters', version: true },
    );
  }
}
