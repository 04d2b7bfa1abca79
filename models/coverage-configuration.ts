import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";
import type { EfficiencyInput } from "@/lib/validations/coverage";

/** A named coverage configuration (lib/validations/coverage.ts), reusable as an analysis's exposure. */
export class CoverageConfiguration extends Model<InferAttributes<CoverageConfiguration>, InferCreationAttributes<CoverageConfiguration>> {
  declare id: CreationOptional<number>;
  declare name: string;
  declare notes: string;
  declare latitudeDeg: number;
  declare zenithMaxDeg: number;
  declare areaKm2: number | null;
  declare liveTimeYr: number | null;
  declare efficiency: EfficiencyInput;
  declare ownerId: number | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): typeof CoverageConfiguration {
    CoverageConfiguration.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        name: { type: DataTypes.STRING(120), allowNull: false, unique: true },
        notes: { type: DataTypes.TEXT, allowNull: false, defaultValue: "" },
        latitudeDeg: { type: DataTypes.DOUBLE, allowNull: false, field: "latitude_deg" },
        zenithMaxDeg: { type: DataTypes.DOUBLE, allowNull: false, field: "zenith_max_deg" },
        areaKm2: { type: DataTypes.DOUBLE, allowNull: true, field: "area_km2" },
        liveTimeYr: { type: DataTypes.DOUBLE, allowNull: true, field: "live_time_yr" },
        efficiency: { type: DataTypes.JSONB, allowNull: false },
        ownerId: { type: DataTypes.INTEGER, allowNull: true, field: "owner_id" },
        createdAt: { type: DataTypes.DATE, field: "created_at" },
        updatedAt: { type: DataTypes.DATE, field: "updated_at" },
      },
      { sequelize, tableName: "coverage_configurations", underscored: true },
    );
    return CoverageConfiguration;
  }
}
