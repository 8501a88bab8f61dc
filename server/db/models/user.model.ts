import {
  DataTypes,
  Model,
  type CreationOptional,
  type ForeignKey,
  type InferAttributes,
  type InferCreationAttributes,
  type NonAttribute,
  type Sequelize,
} from 'sequelize';
import type { Role } from '../../../shared/schemas/auth.schema';
import type { Workspace } from './workspace.model';

export type UserStatus = 'invited' | 'active' | 'disabled';

export class User extends Model<InferAttributes<User>, InferCreationAttributes<User>> {
  declare id: CreationOptional<string>;
  declare workspaceId: ForeignKey<Workspace['id']>;
  declare email: string;
  declare name: string;
  declare role: Role;
  declare status: CreationOptional<UserStatus>;
  declare passwordHash: string | null;
  declare tokenVersion: CreationOptional<number>;
  declare unitSystem: CreationOptional<'imperial' | 'metric'>;
  declare growerId: string | null;
  declare lastSignInAt: Date | null;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare workspace?: NonAttribute<Workspace>;

  static initModel(sequelize: Sequelize) {
    User.init(
      {
        id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
        workspaceId: { type: DataTypes.UUID, allowNull: false },
        email: { type: DataTypes.TEXT, allowNull: false },
        name: { type: DataTypes.TEXT, allowNull: false },
        role: { type: DataTypes.TEXT, allowNull: false },
        status: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'invited' },
        passwordHash: { type: DataTypes.TEXT, allowNull: true },
        tokenVersion: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        unitSystem: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'imperial' },
        growerId: { type: DataTypes.UUID, allowNull: true },
        lastSignInAt: { type: DataTypes.DATE, allowNull: true },
        version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'users', version: true },
    );
  }
}
