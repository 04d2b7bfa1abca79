"use strict";

/** Saved coverage configurations: a named site latitude, zenith cut, optional area and live time, and efficiency. */
module.exports = {
  async up(queryInterface, Sequelize) {
    await queryInterface.createTable("coverage_configurations", {
      id: { type: Sequelize.INTEGER, primaryKey: true, autoIncrement: true },
      name: { type: Sequelize.STRING(120), allowNull: false, unique: true },
      notes: { type: Sequelize.TEXT, allowNull: false, defaultValue: "" },
      latitude_deg: { type: Sequelize.DOUBLE, allowNull: false },
      zenith_max_deg: { type: Sequelize.DOUBLE, allowNull: false },
      area_km2: { type: Sequelize.DOUBLE, allowNull: true },
      live_time_yr: { type: Sequelize.DOUBLE, allowNull: true },
      efficiency: { type: Sequelize.JSONB, allowNull: false },
      owner_id: { type: Sequelize.INTEGER, allowNull: true, references: { model: "users", key: "id" }, onDelete: "SET NULL" },
      created_at: { type: Sequelize.DATE, allowNull: false, defaultValue: Sequelize.fn("now") },
      updated_at: { type: Sequelize.DATE, allowNull: false, defaultValue: Sequelize.fn("now") },
    });
  },
  async down(queryInterface) {
    await queryInterface.dropTable("coverage_configurations");
  },
};
