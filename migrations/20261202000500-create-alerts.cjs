"use strict";

/**
 * Alerts of watched analyses: the watch settings, the chain of reruns on new dataset versions,
 * the alerts raised (position in both frames, counts, local and post-trial figures), one
 * delivery row per alert and subscriber (its state survives a dead SMTP server), the used
 * nonces of one-time links, and one subscription per user and analysis (or "all published").
 */
module.exports = {
  async up(queryInterface, Sequelize) {
    const now = { type: Sequelize.DATE, allowNull: false, defaultValue: Sequelize.fn("now") };
    await queryInterface.createTable("analysis_watches", {
      analysis_id: { type: Sequelize.INTEGER, primaryKey: true, references: { model: "analyses", key: "id" }, onDelete: "CASCADE" },
      dedup_radius_deg: { type: Sequelize.DOUBLE, allowNull: true },
      update_step_sigma: { type: Sequelize.DOUBLE, allowNull: false, defaultValue: 1 },
      started_by: { type: Sequelize.INTEGER, allowNull: true, references: { model: "users", key: "id" }, onDelete: "SET NULL" },
      started_at: now,
      stopped_at: { type: Sequelize.DATE, allowNull: true },
    });
    await queryInterface.createTable("watch_runs", {
      id: { type: Sequelize.INTEGER, primaryKey: true, autoIncrement: true },
      watched_analysis_id: { type: Sequelize.INTEGER, allowNull: false, references: { model: "analyses", key: "id" }, onDelete: "CASCADE" },
      run_analysis_id: { type: Sequelize.INTEGER, allowNull: false, unique: true, references: { model: "analyses", key: "id" }, onDelete: "CASCADE" },
      previous_analysis_id: { type: Sequelize.INTEGER, allowNull: true, references: { model: "analyses", key: "id" }, onDelete: "SET NULL" },
      dataset_version: { type: Sequelize.INTEGER, allowNull: false },
      status: { type: Sequelize.ENUM("queued", "evaluated", "failed"), allowNull: false, defaultValue: "queued" },
      error: { type: Sequelize.TEXT, allowNull: true },
      comparison: { type: Sequelize.JSONB, allowNull: true },
      created_at: now,
      evaluated_at: { type: Sequelize.DATE, allowNull: true },
    });
    await queryInterface.addIndex("watch_runs", ["watched_analysis_id", "dataset_version"], { unique: true, name: "watch_runs_analysis_version" });
    await queryInterface.createTable("alerts", {
      id: { type: Sequelize.INTEGER, primaryKey: true, autoIncrement: true },
      watched_analysis_id: { type: Sequelize.INTEGER, allowNull: false, references: { model: "analyses", key: "id" }, onDelete: "CASCADE" },
      run_analysis_id: { type: Sequelize.INTEGER, allowNull: false, references: { model: "analyses", key: "id" }, onDelete: "CASCADE" },
      watch_run_id: { type: Sequelize.INTEGER, allowNull: false, references: { model: "watch_runs", key: "id" }, onDelete: "CASCADE" },
      parent_alert_id: { type: Sequelize.INTEGER, allowNull: true, references: { model: "alerts", key: "id" }, onDelete: "CASCADE" },
      kind: { type: Sequelize.ENUM("new", "update"), allowNull: false },
      dataset_id: { type: Sequelize.INTEGER, allowNull: false },
      dataset_version: { type: Sequelize.INTEGER, allowNull: false },
      ra_deg: { type: Sequelize.DOUBLE, allowNull: false },
      dec_deg: { type: Sequelize.DOUBLE, allowNull: false },
      l_deg: { type: Sequelize.DOUBLE, allowNull: false },
      b_deg: { type: Sequelize.DOUBLE, allowNull: false },
      radius_deg: { type: Sequelize.DOUBLE, allowNull: false },
      energy_threshold_eev: { type: Sequelize.DOUBLE, allowNull: true },
      n_on: { type: Sequelize.INTEGER, allowNull: false },
      n_expected: { type: Sequelize.DOUBLE, allowNull: false },
      local_sigma: { type: Sequelize.DOUBLE, allowNull: false },
      post_trial_p: { type: Sequelize.DOUBLE, allowNull: false },
      post_trial_p_upper_bound: { type: Sequelize.DOUBLE, allowNull: true },
      post_trial_sigma: { type: Sequelize.DOUBLE, allowNull: true },
      post_trial_sigma_lower_bound: { type: Sequelize.DOUBLE, allowNull: true },
      n_skies: { type: Sequelize.INTEGER, allowNull: false },
      trials_counted: { type: Sequelize.TEXT, allowNull: false },
      previous_local_sigma: { type: Sequelize.DOUBLE, allowNull: true },
      previous_announced_sigma: { type: Sequelize.DOUBLE, allowNull: true },
      created_at: now,
    });
    await queryInterface.addIndex("alerts", ["watched_analysis_id", "id"], { name: "alerts_watched" });
    await queryInterface.createTable("alert_deliveries", {
      id: { type: Sequelize.INTEGER, primaryKey: true, autoIncrement: true },
      alert_id: { type: Sequelize.INTEGER, allowNull: false, references: { model: "alerts", key: "id" }, onDelete: "CASCADE" },
      user_id: { type: Sequelize.INTEGER, allowNull: false, references: { model: "users", key: "id" }, onDelete: "CASCADE" },
      subscription_id: { type: Sequelize.INTEGER, allowNull: true, references: { model: "subscriptions", key: "id" }, onDelete: "SET NULL" },
      delivery: { type: Sequelize.ENUM("immediate", "daily-digest"), allowNull: false },
      to_address: { type: Sequelize.STRING(320), allowNull: false },
      state: { type: Sequelize.ENUM("pending", "sent", "cancelled"), allowNull: false, defaultValue: "pending" },
      attempts: { type: Sequelize.INTEGER, allowNull: false, defaultValue: 0 },
      last_error: { type: Sequelize.TEXT, allowNull: true },
      last_attempt_at: { type: Sequelize.DATE, allowNull: true },
      sent_at: { type: Sequelize.DATE, allowNull: true },
      smtp_message_id: { type: Sequelize.TEXT, allowNull: true },
      created_at: now,
    });
    await queryInterface.addIndex("alert_deliveries", ["alert_id", "user_id"], { unique: true, name: "alert_deliveries_alert_user" });
    await queryInterface.addIndex("alert_deliveries", ["state", "delivery"], { name: "alert_deliveries_state" });
    await queryInterface.createTable("used_links", {
      nonce: { type: Sequelize.STRING(64), primaryKey: true },
      purpose: { type: Sequelize.STRING(40), allowNull: false },
      used_at: now,
    });
    // One subscription per user and analysis, and one "all published" subscription per user.
    await queryInterface.sequelize.query("CREATE UNIQUE INDEX subscriptions_user_analysis ON subscriptions (user_id, analysis_id) WHERE analysis_id IS NOT NULL");
    await queryInterface.sequelize.query("CREATE UNIQUE INDEX subscriptions_user_all_published ON subscriptions (user_id) WHERE analysis_id IS NULL");
  },
  async down(queryInterface) {
    await queryInterface.sequelize.query("DROP INDEX IF EXISTS subscriptions_user_all_published");
    await queryInterface.sequelize.query("DROP INDEX IF EXISTS subscriptions_user_analysis");
    await queryInterface.dropTable("used_links");
    await queryInterface.dropTable("alert_deliveries");
    await queryInterface.dropTable("alerts");
    await queryInterface.dropTable("watch_runs");
    await queryInterface.dropTable("analysis_watches");
    for (const t of ["enum_alert_deliveries_delivery", "enum_alert_deliveries_state", "enum_alerts_kind", "enum_watch_runs_status"]) {
      await queryInterface.sequelize.query(`DROP TYPE IF EXISTS "${t}"`);
    }
  },
};
