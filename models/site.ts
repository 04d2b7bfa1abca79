import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";

export type AzimuthConvention = "north-clockwise" | "east-counterclockwise";

export class Site extends Model<InferAttributes<Site>, InferCreationAttributes<Site>> {
  declare id: CreationOptional<number>;
  declare name: string;
  declare latitudeDeg: number;
  declare longitudeDeg: number;
  declare heightM: number;
  declare zenithMaxDeg: number;
  declare azimuthConvention: AzimuthConvention;
  declare areaKm2: number | null;
  declare notes: string;
  declare createdBy: number | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): typeof Site {
    Site.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        name: { type: DataTypes.STRING(120), allowNull: false },
        latitudeDeg: { type: DataTypes.DOUBLE, allowNull: false, field: "latitude_deg" },
        longitudeDeg: { type: DataTypes.DOUBLE, allowNull: false, field: "longitude_deg" },
        heightM: { type: DataTypes.DOUBLE, allowNull: false, field: "height_m" },
        zenithMaxDeg: { type: DataTypes.DOUBLE, allowNull: false, field: "zenith_max_deg" },
        azimuthConvention: { type: DataTypes.ENUM("north-clockwise", "east-counterclockwise"), allowNull: false, field: "azimuth_convention" },
        areaKm2: { type: DataTypes.DOUBLE, allowNull: true, field: "area_km2" },
        notes: { type: DataTypes.TEXT, allowNull: false, defaultValue: "" },
        createdBy: { type: DataTypes.INTEGER, allowNull: true, field: "created_by" },
        createdAt: { type: DataTypes.DATE, field: "created_at" },
        updatedAt: { type: DataTypes.DATE, field: "updated_at" },
      },
      { sequelize, tableName: "sites", underscored: true },
    );
    return Site;
  }
}
