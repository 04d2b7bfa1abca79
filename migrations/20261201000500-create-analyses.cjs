"use strict";

/** Saved analyses: canonical settings and their hash, the exact dataset version, seed, status and results. */
module.exports = {
  async up(queryInterface, Sequelize) {
    await queryInterface.createTable("analyses", {
      id: { type: Sequelize.INTEGER, primaryKey: true, autoIncrement: true },
      name: { type: Sequelize.STRING(160), allowNull: false },
      purpose: { type: Sequelize.TEXT, allowNull: false, defaultValue: "" },
      kind: { type: Sequelize.ENUM("hotspot", "large-scale"), allowNull: false },
      owner_id: { type: Sequelize.INTEGER, allowNull: true, references: { model: "users", key: "id" }, onDelete: "SET NULL" },
      dataset_id: { type: Sequelize.INTEGER, allowNull: false, references: { model: "datasets", key: "id" }, onDelete: "RESTRICT" },
      dataset_version: { type: Sequelize.INTEGER, allowNull: false },
      dataset_hash: { type: Sequelize.STRING(64), allowNull: false },
      settings: { type: Sequelize.JSONB, allowNull: false },
      settings_hash: { type: Sequelize.STRING(64), allowNull: false },
      code_version: { type: Sequelize.STRING(80), allowNull: false },
      seed: { type: Sequelize.BIGINT, allowNull: false },
      status: {
        type: Sequelize.ENUM("queued", "running", "done", "failed", "cancelled"),
        allowNull: false,
        defaultValue: "queued",
      },
      progress: { type: Sequelize.REAL, allowNull: false, defaultValue: 0 },
      error: { type: Sequelize.TEXT, allowNull: true },
      summary: { type: Sequelize.JSONB, allowNull: true },
      started_at: { type: Sequelize.DATE, allowNull: true },
      finished_at: { type: Sequelize.DATE, allowNull: true },
      published_at: { type: Sequelize.DATE, allowNull: true },
      watched: { type: Sequelize.BOOLEAN, allowNull: false, defaultValue: false },
      created_at: { type: Sequelize.DATE, allowNull: false, defaultValue: Sequelize.fn("now") },
      updated_at: { type: Sequelize.DATE, allowNull: false, defaultValue: Sequelize.fn("now") },
    });
    await queryInterface.createTable("analysis_shares", {
      analysis_id: { type: Sequelize.INTEGER, primaryKey: true, references: { model: "analyses", key: "id" }, onDelete: "CASCADE" },
      user_id: { type: Sequelize.INTEGER, primaryKey: true, references: { model: "users", key: "id" }, onDelete: "CASCADE" },
      shared_by: { type: Sequelize.INTEGER, allowNull: true, references: { model: "users", key: "id" }, onDelete: "SET NULL" },
      created_at: { type: Sequelize.DATE, allowNull: false, defaultValue: Sequelize.fn("now") },
    });
  },
  async down(queryInterface) {
    await queryInterface.dropTable("analysis_shares");
    await queryInterface.dropTable("analyses");
    await queryInterface.sequelize.query('DROP TYPE IF EXISTS "enum_analyses_kind"');
    await queryInterface.sequelize.query('DROP TYPE IF EXISTS "enum_analyses_status"');
  },
};
