import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type NonAttribute,
  type Sequelize,
} from 'sequelize';
import type { Grower } from './grower.model';

export class Farm extends Model<InferAttributes<Farm>, InferCreationAttributes<Farm>> {
  declare id: CreationOptional<string>;
  declare workspaceId: string;
  declare growerId: string;
  declare name: string;
  declare notes: string | null;
  declare archivedAt: CreationOptional<Date | null>;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare grower?: NonAttribute<Grower>;

  static initModel(sequelize: Sequelize) {
    Farm.init(
      {
        id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
        workspaceId: { type: DataTypes.UUID, allowNull: false },
        growerId: { type: DataTypes.UUID, allowNull: false },
        name: { type: DataTypes.TEXT, allowNull: false },
        notes: DataTypes.TEXT,
        archivedAt: DataTypes.DATE,
        version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'farms', version: true },
    );
  }
}
