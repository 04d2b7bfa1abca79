import { DataTypes, Model, type CreationOptional, type NonAttribute, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";

export class AuditEntry extends Model<InferAttributes<AuditEntry>, InferCreationAttributes<AuditEntry>> {
  declare id: CreationOptional<string>;
  declare actorId: number | null;
  declare action: string;
  declare targetType: string;
  declare targetId: string | null;
  declare details: CreationOptional<Record<string, unknown>>;
  declare createdAt: CreationOptional<Date>;
  /** Present when loaded with `include: "actor"`. */
  declare actor?: NonAttribute<{ name: string; email: string } | null>;

  static initModel(sequelize: Sequelize): typeof AuditEntry {
    AuditEntry.init(
      {
        id: { type: DataTypes.BIGINT, primaryKey: true, autoIncrement: true },
        actorId: { type: DataTypes.INTEGER, allowNull: true, field: "actor_id" },
        action: { type: DataTypes.STRING(60), allowNull: false },
        targetType: { type: DataTypes.STRING(40), allowNull: false, field: "target_type" },
        targetId: { type: DataTypes.STRING(60), allowNull: true, field: "target_id" },
        details: { type: DataTypes.JSONB, allowNull: false, defaultValue: {} },
        createdAt: { type: DataTypes.DATE, field: "created_at" },
      },
      { sequelize, tableName: "audit_entries", underscored: true, updatedAt: false },
    );
    return AuditEntry;
  }
}
