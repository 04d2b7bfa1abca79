import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";

export type AnalysisKind = "hotspot" | "large-scale";
export type AnalysisStatus = "queued" | "running" | "done" | "failed" | "cancelled";

export class Analysis extends Model<InferAttributes<Analysis>, InferCreationAttributes<Analysis>> {
  declare id: CreationOptional<number>;
  declare name: string;
  declare purpose: CreationOptional<string>;
  declare kind: AnalysisKind;
  declare ownerId: number | null;
  declare datasetId: number;
  declare datasetVersion: number;
  declare datasetHash: string;
  declare settings: Record<string, unknown>;
  declare settingsHash: string;
  declare codeVersion: string;
  declare seed: string;
  declare status: CreationOptional<AnalysisStatus>;
  declare progress: CreationOptional<number>;
  declare error: string | null;
  declare summary: Record<string, unknown> | null;
  declare startedAt: Date | null;
  declare finishedAt: Date | null;
  declare publishedAt: Date | null;
  declare watched: CreationOptional<boolean>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): typeof Analysis {
    Analysis.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        name: { type: DataTypes.STRING(160), allowNull: false },
        purpose: { type: DataTypes.TEXT, allowNull: false, defaultValue: "" },
        kind: { type: DataTypes.ENUM("hotspot", "large-scale"), allowNull: false },
        ownerId: { type: DataTypes.INTEGER, allowNull: true, field: "owner_id" },
        datasetId: { type: DataTypes.INTEGER, allowNull: false, field: "dataset_id" },
        datasetVersion: { type: DataTypes.INTEGER, allowNull: false, field: "dataset_version" },
        datasetHash: { type: DataTypes.STRING(64), allowNull: false, field: "dataset_hash" },
        settings: { type: DataTypes.JSONB, allowNull: false },
        settingsHash: { type: DataTypes.STRING(64), allowNull: false, field: "settings_hash" },
        codeVersion: { type: DataTypes.STRING(80), allowNull: false, field: "code_version" },
        seed: { type: DataTypes.BIGINT, allowNull: false },
        status: { type: DataTypes.ENUM("queued", "running", "done", "failed", "cancelled"), allowNull: false, defaultValue: "queued" },
        progress: { type: DataTypes.REAL, allowNull: false, defaultValue: 0 },
        error: { type: DataTypes.TEXT, allowNull: true },
        summary: { type: DataTypes.JSONB, allowNull: true },
        startedAt: { type: DataTypes.DATE, allowNull: true, field: "started_at" },
        finishedAt: { type: DataTypes.DATE, allowNull: true, field: "finished_at" },
        publishedAt: { type: DataTypes.DATE, allowNull: true, field: "published_at" },
        watched: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        createdAt: { type: DataTypes.DATE, field: "created_at" },
        updatedAt: { type: DataTypes.DATE, field: "updated_at" },
      },
      { sequelize, tableName: "analyses", underscored: true },
    );
    return Analysis;
  }
}
