"use strict";

/** Detector arrays: geodetic position, default zenith cut and the azimuth convention of their reconstruction. */
module.exports = {
  async up(queryInterface, Sequelize) {
    await queryInterface.createTable("sites", {
      id: { type: Sequelize.INTEGER, primaryKey: true, autoIncrement: true },
      name: { type: Sequelize.STRING(120), allowNull: false, unique: true },
      latitude_deg: { type: Sequelize.DOUBLE, allowNull: false },
      longitude_deg: { type: Sequelize.DOUBLE, allowNull: false },
      height_m: { type: Sequelize.DOUBLE, allowNull: false, defaultValue: 0 },
      zenith_max_deg: { type: Sequelize.DOUBLE, allowNull: false, defaultValue: 60 },
      azimuth_convention: {
        type: Sequelize.ENUM("north-clockwise", "east-counterclockwise"),
        allowNull: false,
        defaultValue: "north-clockwise",
      },
      area_km2: { type: Sequelize.DOUBLE, allowNull: true },
      notes: { type: Sequelize.TEXT, allowNull: false, defaultValue: "" },
      created_by: { type: Sequelize.INTEGER, allowNull: true, references: { model: "users", key: "id" }, onDelete: "SET NULL" },
      created_at: { type: Sequelize.DATE, allowNull: false, defaultValue: Sequelize.fn("now") },
      updated_at: { type: Sequelize.DATE, allowNull: false, defaultValue: Sequelize.fn("now") },
    });
    await queryInterface.sequelize.query(`ALTER TABLE sites
      ADD CONSTRAINT sites_latitude_range CHECK (latitude_deg BETWEEN -90 AND 90),
      ADD CONSTRAINT sites_longitude_range CHECK (longitude_deg BETWEEN -180 AND 360),
      ADD CONSTRAINT sites_zenith_range CHECK (zenith_max_deg > 0 AND zenith_max_deg <= 90)`);
  },
  async down(queryInterface) {
    await queryInterface.dropTable("sites");
    await queryInterface.sequelize.query('DROP TYPE IF EXISTS "enum_sites_azimuth_convention"');
  },
};
