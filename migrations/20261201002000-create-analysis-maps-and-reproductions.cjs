"use strict";

/**
 * analysis_maps: result maps of an analysis as little-endian Float32 HEALPix arrays (bytea),
 * with their Nside, ordering and frame. analysis_reproductions: reruns of a saved analysis
 * and how their numbers compare with the saved ones.
 */
module.exports = {
  async up(queryInterface, Sequelize) {
    await queryInterface.sequelize.query(`
      CREATE TABLE analysis_maps (
        analysis_id integer NOT NULL REFERENCES analyses(id) ON DELETE CASCADE,
        layer varchar(20) NOT NULL,
        nside integer NOT NULL,
        ordering varchar(6) NOT NULL DEFAULT 'RING',
        coordsys char(1) NOT NULL DEFAULT 'C',
        unit varchar(40) NOT NULL,
        data bytea NOT NULL,
        PRIMARY KEY (analysis_id, layer)
      )`);
    await queryInterface.createTable("analysis_reproductions", {
      id: { type: Sequelize.INTEGER, primaryKey: true, autoIncrement: true },
      analysis_id: { type: Sequelize.INTEGER, allowNull: false, references: { model: "analyses", key: "id" }, onDelete: "CASCADE" },
      requested_by: { type: Sequelize.INTEGER, allowNull: true, references: { model: "users", key: "id" }, onDelete: "SET NULL" },
      status: { type: Sequelize.ENUM("queued", "running", "done", "failed"), allowNull: false, defaultValue: "queued" },
      code_version: { type: Sequelize.STRING(80), allowNull: true },
      summary: { type: Sequelize.JSONB, allowNull: true },
      comparison: { type: Sequelize.JSONB, allowNull: true },
      error: { type: Sequelize.TEXT, allowNull: true },
      created_at: { type: Sequelize.DATE, allowNull: false, defaultValue: Sequelize.fn("now") },
      finished_at: { type: Sequelize.DATE, allowNull: true },
    });
  },
  async down(queryInterface) {
    await queryInterface.dropTable("analysis_reproductions");
    await queryInterface.sequelize.query('DROP TYPE IF EXISTS "enum_analysis_reproductions_status"');
    await queryInterface.sequelize.query("DROP TABLE IF EXISTS analysis_maps");
  },
};
