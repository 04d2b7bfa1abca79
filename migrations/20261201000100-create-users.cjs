"use strict";

/** People who sign in, with one role each (see lib/auth/roles.ts). */
module.exports = {
  async up(queryInterface, Sequelize) {
    await queryInterface.createTable("users", {
      id: { type: Sequelize.INTEGER, primaryKey: true, autoIncrement: true },
      email: { type: Sequelize.STRING(254), allowNull: false },
      name: { type: Sequelize.STRING(120), allowNull: false },
      password_hash: { type: Sequelize.STRING(100), allowNull: false },
      role: { type: Sequelize.ENUM("admin", "analyst", "referee", "member"), allowNull: false, defaultValue: "member" },
      disabled_at: { type: Sequelize.DATE, allowNull: true },
      created_at: { type: Sequelize.DATE, allowNull: false, defaultValue: Sequelize.fn("now") },
      updated_at: { type: Sequelize.DATE, allowNull: false, defaultValue: Sequelize.fn("now") },
    });
    // E-mail addresses are unique regardless of case.
    await queryInterface.sequelize.query("CREATE UNIQUE INDEX users_email_lower_key ON users (lower(email))");
  },
  async down(queryInterface) {
    await queryInterface.dropTable("users");
    await queryInterface.sequelize.query('DROP TYPE IF EXISTS "enum_users_role"');
  },
};
