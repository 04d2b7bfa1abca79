import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";

export class Subscription extends Model<InferAttributes<Subscription>, InferCreationAttributes<Subscription>> {
  declare id: CreationOptional<number>;
  declare userId: number;
  declare analysisId: number | null;
  declare localSigmaThreshold: CreationOptional<number>;
  declare postTrialSigmaThreshold: number | null;
  declare delivery: CreationOptional<"immediate" | "daily-digest">;
  declare paused: CreationOptional<boolean>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): typeof Subscription {
    Subscription.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        userId: { type: DataTypes.INTEGER, allowNull: false, field: "user_id" },
        analysisId: { type: DataTypes.INTEGER, allowNull: true, field: "analysis_id" },
        localSigmaThreshold: { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 4, field: "local_sigma_threshold" },
        postTrialSigmaThreshold: { type: DataTypes.DOUBLE, allowNull: true, field: "post_trial_sigma_threshold" },
        delivery: { type: DataTypes.ENUM("immediate", "daily-digest"), allowNull: false, defaultValue: "immediate" },
        paused: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
        createdAt: { type: DataTypes.DATE, field: "created_at" },
        updatedAt: { type: DataTypes.DATE, field: "updated_at" },
      },
      { sequelize, tableName: "subscriptions", underscored: true },
    );
    return Subscription;
  }
}
