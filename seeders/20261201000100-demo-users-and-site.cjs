"use strict";

// Demo scenario (invented): the "Quebrada Alta" test array, a fictional ground array on a high
// plateau, and four demo accounts, one per role. Passwords are documented in README.md and are for
// the local demo only.
const bcrypt = require("bcryptjs");

const DEMO_USERS = [
  { email: "admin@demo.siderea.test", name: "Demo Administrator", role: "admin", password: "siderea-admin" },
  { email: "analyst@demo.siderea.test", name: "Demo Analyst", role: "analyst", password: "siderea-analyst" },
  { email: "referee@demo.siderea.test", name: "Demo Referee", role: "referee", password: "siderea-referee" },
  { email: "member@demo.siderea.test", name: "Demo Member", role: "member", password: "siderea-member" },
];

module.exports = {
  async up(queryInterface) {
    const now = new Date();
    await queryInterface.bulkInsert(
      "users",
      DEMO_USERS.map((u) => ({
        email: u.email,
        name: u.name,
        role: u.role,
        password_hash: bcrypt.hashSync(u.password, 10),
        created_at: now,
        updated_at: now,
      })),
    );
    const [[admin]] = await queryInterface.sequelize.query("SELECT id FROM users WHERE email = 'admin@demo.siderea.test'");
    await queryInterface.bulkInsert("sites", [
      {
        name: "Quebrada Alta test array",
        latitude_deg: -31.4,
        longitude_deg: -68.9,
        height_m: 1650,
        zenith_max_deg: 60,
        azimuth_convention: "north-clockwise",
        area_km2: 1200,
        notes: "Invented demo array for the Siderea demo scenario. Not a real detector.",
        created_by: admin.id,
        created_at: now,
        updated_at: now,
      },
    ]);
  },
  async down(queryInterface) {
    await queryInterface.bulkDelete("sites", { name: "Quebrada Alta test array" });
    await queryInterface.bulkDelete("users", { email: DEMO_USERS.map((u) => u.email) });
  },
};
