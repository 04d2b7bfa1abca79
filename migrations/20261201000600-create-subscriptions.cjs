"use strict";

/** Alert subscriptions: one watched analysis, or every published one when analysis_id is null. */
module.exports = {
  async up(queryInterface, Sequelize) {
    await queryInterface.createTable("subscriptions", {
      id: { type: Sequelize.INTEGER, primaryKey: true, autoIncrement: true },
      user_id: { type: Sequelize.INTEGER, allowNull: false, references: { model: "users", key: "id" }, onDelete: "CASCADE" },
      analysis_id: { type: Sequelize.INTEGER, allowNull: true, references: { model: "analyses", key: "id" }, onDelete: "CASCADE" },
      local_sigma_threshold: { type: Sequelize.DOUBLE, allowNull: false, defaultValue: 4 },
      post_trial_sigma_threshold: { type: Sequelize.DOUBLE, allowNull: true },
      delivery: { type: Sequelize.ENUM("immediate", "daily-digest"), allowNull: false, defaultValue: "immediate" },
      paused: { type: Sequelize.BOOLEAN, allowNull: false, defaultValue: false },
      created_at: { type: Sequelize.DATE, allowNull: false, defaultValue: Sequelize.fn("now") },
      updated_at: { type: Sequelize.DATE, allowNull: false, defaultValue: Sequelize.fn("now") },
    });
  },
  async down(queryInterface) {
    await queryInterface.dropTable("subscriptions");
    await queryInterface.sequelize.query('DROP TYPE IF EXISTS "enum_subscriptions_delivery"');
  },
};
