"use strict";

/** Append-only audit log: who did what to which record (runs, shares, publishing, unblinding, role changes). */
module.exports = {
  async up(queryInterface, Sequelize) {
    await queryInterface.createTable("audit_entries", {
      id: { type: Sequelize.BIGINT, primaryKey: true, autoIncrement: true },
      actor_id: { type: Sequelize.INTEGER, allowNull: true, references: { model: "users", key: "id" }, onDelete: "SET NULL" },
      action: { type: Sequelize.STRING(60), allowNull: false },
      target_type: { type: Sequelize.STRING(40), allowNull: false },
      target_id: { type: Sequelize.STRING(60), allowNull: true },
      details: { type: Sequelize.JSONB, allowNull: false, defaultValue: {} },
      created_at: { type: Sequelize.DATE, allowNull: false, defaultValue: Sequelize.fn("now") },
    });
    await queryInterface.addIndex("audit_entries", ["target_type", "target_id"]);
  },
  async down(queryInterface) {
    await queryInterface.dropTable("audit_entries");
  },
};
