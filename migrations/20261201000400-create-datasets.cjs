"use strict";

/** Event lists of one site, versioned by appended batches; dataset_versions keeps every version's content hash. */
module.exports = {
  async up(queryInterface, Sequelize) {
    await queryInterface.createTable("datasets", {
      id: { type: Sequelize.INTEGER, primaryKey: true, autoIncrement: true },
      name: { type: Sequelize.STRING(160), allowNull: false },
      description: { type: Sequelize.TEXT, allowNull: false, defaultValue: "" },
      site_id: { type: Sequelize.INTEGER, allowNull: false, references: { model: "sites", key: "id" }, onDelete: "RESTRICT" },
      owner_id: { type: Sequelize.INTEGER, allowNull: true, references: { model: "users", key: "id" }, onDelete: "SET NULL" },
      status: { type: Sequelize.ENUM("ingesting", "ready", "failed"), allowNull: false, defaultValue: "ingesting" },
      version: { type: Sequelize.INTEGER, allowNull: false, defaultValue: 0 },
      content_hash: { type: Sequelize.STRING(64), allowNull: true },
      event_count: { type: Sequelize.BIGINT, allowNull: false, defaultValue: 0 },
      time_start: { type: Sequelize.DATE, allowNull: true },
      time_end: { type: Sequelize.DATE, allowNull: true },
      mapping: { type: Sequelize.JSONB, allowNull: false, defaultValue: {} },
      dropped_rows: { type: Sequelize.INTEGER, allowNull: false, defaultValue: 0 },
      blinded: { type: Sequelize.BOOLEAN, allowNull: false, defaultValue: false },
      blind_seed: { type: Sequelize.BIGINT, allowNull: true },
      unblinded_at: { type: Sequelize.DATE, allowNull: true },
      created_at: { type: Sequelize.DATE, allowNull: false, defaultValue: Sequelize.fn("now") },
      updated_at: { type: Sequelize.DATE, allowNull: false, defaultValue: Sequelize.fn("now") },
    });
    await queryInterface.createTable("dataset_versions", {
      id: { type: Sequelize.INTEGER, primaryKey: true, autoIncrement: true },
      dataset_id: { type: Sequelize.INTEGER, allowNull: false, references: { model: "datasets", key: "id" }, onDelete: "CASCADE" },
      version: { type: Sequelize.INTEGER, allowNull: false },
      content_hash: { type: Sequelize.STRING(64), allowNull: false },
      event_count: { type: Sequelize.BIGINT, allowNull: false },
      batch_event_count: { type: Sequelize.BIGINT, allowNull: false },
      dropped_rows: { type: Sequelize.INTEGER, allowNull: false, defaultValue: 0 },
      created_by: { type: Sequelize.INTEGER, allowNull: true, references: { model: "users", key: "id" }, onDelete: "SET NULL" },
      created_at: { type: Sequelize.DATE, allowNull: false, defaultValue: Sequelize.fn("now") },
    });
    await queryInterface.addIndex("dataset_versions", ["dataset_id", "version"], { unique: true });
  },
  async down(queryInterface) {
    await queryInterface.dropTable("dataset_versions");
    await queryInterface.dropTable("datasets");
    await queryInterface.sequelize.query('DROP TYPE IF EXISTS "enum_datasets_status"');
  },
};
