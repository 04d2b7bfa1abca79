"use strict";

// Demo event list (invented; see lib/demo/generate.ts), loaded through the real ingestion code.
const { execFileSync } = require("child_process");
const path = require("path");

const NAME = "Quebrada Alta 2023-2024 (demo)";

module.exports = {
  async up() {
    const root = path.resolve(__dirname, "..");
    execFileSync(path.join(root, "node_modules/.bin/tsx"), ["--conditions=react-server", "scripts/seed-demo-data.ts"], {
      cwd: root,
      stdio: ["ignore", "inherit", "inherit"],
      env: process.env,
    });
  },
  async down(queryInterface) {
    await queryInterface.sequelize.query("DELETE FROM datasets WHERE name = :name", { replacements: { name: NAME } });
  },
};
