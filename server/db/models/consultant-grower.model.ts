import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize';

/** Which growers a consultant may read. */
export class ConsultantGrower extends Model<
  InferAttributes<ConsultantGrower>,
  InferCreationAttributes<ConsultantGrower>
> {
  declare userId: string;
  declare growerId: string;
  declare workspaceId: string;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    ConsultantGrower.init(
      {
        userId: { type: DataTypes.UUID, primaryKey: true },
        growerId: { type: DataTypes.UUID, primaryKey: true },
        workspaceId: { type: DataTypes.UUID, allowNull: false },
        createdAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'consultant_growers', updatedAt: false },
    );
  }
}
