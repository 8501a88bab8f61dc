import {
  DataTypes,
  Model,
  type CreationOptional,
  type InferAttributes,
  type InferCreationAttributes,
  type NonAttribute,
  type Sequelize,
} from 'sequelize';
import type { PrescriptionStatus } from '../../../shared/schemas/prescription.schema';
import type { Product as ProductDto } from '../../../shared/schemas/product.schema';
import type { Planter as PlanterDto } from '../../../shared/schemas/planter.schema';
import type { RateUnit } from '../../../shared/rates/rate-units';
import { CropSeason } from './crop-season.model';
import { Field } from './field.model';
import { Grower } from './grower.model';
import { Planter } from './planter.model';
import { Product } from './product.model';
import { ZoneMap } from './zone-map.model';

export type StoredAcceptance = {
  reason: string;
  acceptedById: string;
  acceptedByName: string;
  acceptedAt: string;
  zoneIds: string[];
  /** The rates (SI) of the flagged zones when accepted: a change of any of them voids the acceptance. */
  rates: Record<string, number>;
  planterId: string | null;
};

/** One version of a prescription (rates in SI; zones in prescription_zones). */
export class Prescription extends Model<
  InferAttributes<Prescription>,
  InferCreationAttributes<Prescription>
> {
  declare id: CreationOptional<string>;
  declare workspaceId: string;
  declare growerId: string;
  declare fieldId: string;
  declare cropSeasonId: string;
  declare zoneMapId: string;
  declare productId: string;
  declare planterId: string | null;
  declare lineageId: string;
  declare versionNo: number;
  declare status: CreationOptional<PrescriptionStatus>;
  declare name: string;
  declare rateUnit: RateUnit;
  declare defaultRateSi: number;
  declare outOfFieldRateSi: number;
  declare minRateSi: number;
  declare maxRateSi: number;
  declare uncoveredAreaM2: number;
  declare productSnapshot: CreationOptional<ProductDto | null>;
  declare planterSnapshot: CreationOptional<PlanterDto | null>;
  declare acceptance: CreationOptional<StoredAcceptance | null>;
  declare approvedBy: CreationOptional<string | null>;
  declare approvedByName: CreationOptional<string | null>;
  declare approvedAt: CreationOptional<Date | null>;
  declare supersededAt: CreationOptional<Date | null>;
  declare createdBy: string | null;
  declare version: CreationOptional<number>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;
  declare field?: NonAttribute<Field>;
  declare season?: NonAttribute<CropSeason>;
  declare grower?: NonAttribute<Grower>;
  declare product?: NonAttribute<Product>;
  declare planter?: NonAttribute<Planter | null>;
  declare zoneMap?: NonAttribute<ZoneMap>;

  static initModel(sequelize: Sequelize) {
    Prescription.init(
      {
        id: { type: DataTypes.UUID, primaryKey: true, defaultValue: DataTypes.UUIDV4 },
        workspaceId: { type: DataTypes.UUID, allowNull: false },
        growerId: { type: DataTypes.UUID, allowNull: false },
        fieldId: { type: DataTypes.UUID, allowNull: false },
        cropSeasonId: { type: DataTypes.UUID, allowNull: false },
        zoneMapId: { type: DataTypes.UUID, allowNull: false },
        productId: { type: DataTypes.UUID, allowNull: false },
        planterId: { type: DataTypes.UUID, allowNull: true },
        lineageId: { type: DataTypes.UUID, allowNull: false },
        versionNo: { type: DataTypes.INTEGER, allowNull: false },
        status: { type: DataTypes.TEXT, allowNull: false, defaultValue: 'draft' },
        name: { type: DataTypes.TEXT, allowNull: false },
        rateUnit: { type: DataTypes.TEXT, allowNull: false },
        defaultRateSi: { type: DataTypes.DOUBLE, allowNull: false },
        outOfFieldRateSi: { type: DataTypes.DOUBLE, allowNull: false },
        minRateSi: { type: DataTypes.DOUBLE, allowNull: false },
        maxRateSi: { type: DataTypes.DOUBLE, allowNull: false },
        uncoveredAreaM2: { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 0 },
        productSnapshot: { type: DataTypes.JSONB, allowNull: true },
        planterSnapshot: { type: DataTypes.JSONB, allowNull: true },
        acceptance: { type: DataTypes.JSONB, allowNull: true },
        approvedBy: { type: DataTypes.UUID, allowNull: true },
        approvedByName: { type: DataTypes.TEXT, allowNull: true },
        approvedAt: { type: DataTypes.DATE, allowNull: true },
        supersededAt: { type: DataTypes.DATE, allowNull: true },
        createdBy: { type: DataTypes.UUID, allowNull: true },
        version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'prescriptions', version: true },
    );
  }
}

/** Initialises Product and Prescription and wires their associations (called from db/associations.ts). */
export function initPrescriptionModels(sequelize: Sequelize) {
  Product.initModel(sequelize);
  Prescription.initModel(sequelize);
  Prescription.belongsTo(Field, { as: 'field', foreignKey: 'fieldId' });
  Prescription.belongsTo(CropSeason, { as: 'season', foreignKey: 'cropSeasonId' });
  Prescription.belongsTo(Grower, { as: 'grower', foreignKey: 'growerId' });
  Prescription.belongsTo(Product, { as: 'product', foreignKey: 'productId' });
  Prescription.belongsTo(Planter, { as: 'planter', foreignKey: 'planterId' });
  Prescription.belongsTo(ZoneMap, { as: 'zoneMap', foreignKey: 'zoneMapId' });
}
