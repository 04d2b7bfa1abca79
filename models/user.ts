import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from "sequelize";
import { ROLES, type Role } from "@/lib/auth/roles";

export class User extends Model<InferAttributes<User>, InferCreationAttributes<User>> {
  declare id: CreationOptional<number>;
  declare email: string;
  declare name: string;
  declare passwordHash: string;
  declare role: Role;
  declare disabledAt: Date | null;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize): typeof User {
    User.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        email: { type: DataTypes.STRING(254), allowNull: false },
        name: { type: DataTypes.STRING(120), allowNull: false },
        passwordHash: { type: DataTypes.STRING(100), allowNull: false, field: "password_hash" },
        role: { type: DataTypes.ENUM(...ROLES), allowNull: false },
        disabledAt: { type: DataTypes.DATE, allowNull: true, field: "disabled_at" },
        createdAt: { type: DataTypes.DATE, field: "created_at" },
        updatedAt: { type: DataTypes.DATE, field: "updated_at" },
      },
      { sequelize, tableName: "users", underscored: true },
    );
    return User;
  }
}
