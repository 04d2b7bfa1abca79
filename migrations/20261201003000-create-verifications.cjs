"use strict";

/** Verifications: a reproduction bundle checked against an events CSV uploaded with it. */
module.exports = {
  async up(queryInterface, Sequelize) {
    await queryInterface.createTable("verifications", {
      id: { type: Sequelize.INTEGER, primaryKey: true, autoIncrement: true },
      user_id: { type: Sequelize.INTEGER, allowNull: true, references: { model: "users", key: "id" }, onDelete: "SET NULL" },
      upload_id: { type: Sequelize.UUID, allowNull: true },
      bundle: { type: Sequelize.JSONB, allowNull: false },
      status: { type: Sequelize.ENUM("awaiting-events", "queued", "running", "done", "failed"), allowNull: false, defaultValue: "awaiting-events" },
      result: { type: Sequelize.JSONB, allowNull: true },
      error: { type: Sequelize.TEXT, allowNull: true },
      created_at: { type: Sequelize.DATE, allowNull: false, defaultValue: Sequelize.fn("now") },
      finished_at: { type: Sequelize.DATE, allowNull: true },
    });
  },
  async down(queryInterface) {
    await queryInterface.dropTable("verifications");
    await queryInterface.sequelize.query('DROP TYPE IF EXISTS "enum_verifications_status"');
  },
};
