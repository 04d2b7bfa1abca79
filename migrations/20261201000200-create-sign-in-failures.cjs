"use strict";

/** Failed sign-in counters, one row per key ("account:<email>" or "address:<ip>"), for slowing guessing. */
module.exports = {
  async up(queryInterface, Sequelize) {
    await queryInterface.createTable("sign_in_failures", {
      key: { type: Sequelize.STRING(300), primaryKey: true },
      failures: { type: Sequelize.INTEGER, allowNull: false, defaultValue: 0 },
      window_started_at: { type: Sequelize.DATE, allowNull: false },
      blocked_until: { type: Sequelize.DATE, allowNull: true },
    });
  },
  async down(queryInterface) {
    await queryInterface.dropTable("sign_in_failures");
  },
};
