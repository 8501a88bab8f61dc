import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';
import type { Crop } from '../../../shared/schemas/crops';
import type { RateKind } from '../../../shared/rates/rate-units';

/** A product of the workspace: seed (counted) or another product (mass or volume); unit size in SI. */
export class Product extends Model<InferAttributes<Product>, InferCreationAttributes<Product>> {
  declare id: CreationOptional<string>;
  declare workspaceId: string;
  declare kind: 'seed' | 'other';
  declare name: string;
  declare crop: Crop | null;
  declare rateKind: RateKind;
  declare unitName: string;
  declare unitSize: number;
  /** numeric(12,2): pg returns a string. */
  declare pricePerUnit: string | number | null;
  declare currency: string;
  declare notes: string | null;
  declare archivedAt: CreationOptional<Date | null>;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    Product.init(
      {
        id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
        workspaceId: { type: DataTypes.UUID, allowNull: false },
        kind: { type: DataTypes.TEXT, allowNull: false },
        name: { type: DataTypes.TEXT, allowNull: false },
        crop: { type: DataTypes.TEXT, allowNull: true },
        rateKind: { type: DataTypes.TEXT, allowNull: false },
        unitName: { type: DataTypes.TEXT, allowNull: false },
        unitSize: { type: DataTypes.DOUBLE, allowNull: false },
        pricePerUnit: { type: DataTypes.DECIMAL(12, 2), allowNull: true },
        currency: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'USD' },
        notes: DataTypes.TEXT,
        archivedAt: DataTypes.DATE,
        version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'products', version: true },
    );
  }
}
