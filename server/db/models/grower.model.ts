import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';

export class Grower extends Model<InferAttributes<Grower>, InferCreationAttributes<Grower>> {
  declare id: CreationOptional<string>;
  declare workspaceId: string;
  declare name: string;
  declare contactName: string | null;
  declare email: string | null;
  declare phone: string | null;
  declare notes: string | null;
  declare archivedAt: CreationOptional<Date | null>;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    Grower.init(
      {
        id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
        workspaceId: { type: DataTypes.UUID, allowNull: false },
        name: { type: DataTypes.TEXT, allowNull: false },
        contactName: DataTypes.TEXT,
        email: DataTypes.TEXT,
        phone: DataTypes.TEXT,
        notes: DataTypes.TEXT,
        archivedAt: DataTypes.DATE,
        version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'growers', version: true },
    );
  }
}
