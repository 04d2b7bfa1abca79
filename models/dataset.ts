import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";

export type DatasetStatus = "ingesting" | "ready" | "failed";

export class Dataset extends Model<InferAttributes<Dataset>, InferCreationAttributes<Dataset>> {
  declare id: CreationOptional<number>;
  declare name: string;
  declare description: CreationOptional<string>;
  declare siteId: number;
  declare ownerId: number | null;
  declare status: CreationOptional<DatasetStatus>;
  declare version: CreationOptional<number>;
  declare contentHash: string | null;
  declare eventCount: CreationOptional<string>;
  declare timeStart: Date | null;
  declare timeEnd: Date | null;
  declare mapping: CreationOptional<Record<string, unknown>>;
  declare droppedRows: CreationOptional<number>;
  declare blinded: CreationOptional<boolean>;
  declare blindSeed: string | null;
  declare unblindedAt: Date | null;
  declare summary: Record<string, unknown> | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): typeof Dataset {
    Dataset.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        name: { type: DataTypes.STRING(160), allowNull: false },
        description: { type: DataTypes.TEXT, allowNull: false, defaultValue: "" },
        siteId: { type: DataTypes.INTEGER, allowNull: false, field: "site_id" },
        ownerId: { type: DataTypes.INTEGER, allowNull: true, field: "owner_id" },
        status: { type: DataTypes.ENUM("ingesting", "ready", "failed"), allowNull: false, defaultValue: "ingesting" },
        version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
        contentHash: { type: DataTypes.STRING(64), allowNull: true, field: "content_hash" },
        // BIGINT comes back from pg as a string; callers convert with Number() (counts stay < 2^53).
        eventCount: { type: DataTypes.BIGINT, allowNull: false, defaultValue: 0, field: "event_count" },
        timeStart: { type: DataTypes.DATE, allowNull: true, field: "time_start" },
        timeEnd: { type: DataTypes.DATE, allowNull: true, field: "time_end" },
        mapping: { type: DataTypes.JSONB, allowNull: false, defaultValue: {} },
        droppedRows: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0, field: "dropped_rows" },
        blinded: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        blindSeed: { type: DataTypes.BIGINT, allowNull: true, field: "blind_seed" },
        unblindedAt: { type: DataTypes.DATE, allowNull: true, field: "unblinded_at" },
        summary: { type: DataTypes.JSONB, allowNull: true },
        createdAt: { type: DataTypes.DATE, field: "created_at" },
        updatedAt: { type: DataTypes.DATE, field: "updated_at" },
      },
      { sequelize, tableName: "datasets", underscored: true },
    );
    return Dataset;
  }
}
