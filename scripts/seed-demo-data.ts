// Loads the demo event list into the database through the real ingestion path (stored upload,
// parse, validate, convert, COPY). Run by seeders/20261201001000-demo-events.cjs.
import { mkdirSync, writeFileSync } from "node:fs";
import { closeDb, getDb } from "@/lib/db";
import { demoBatches } from "@/lib/demo/generate";
import { runIngest } from "@/lib/services/ingest";
import { receiveUpload } from "@/lib/services/uploads";

const { models } = getDb();
const site = await models.Site.findOne({ where: { name: "Quebrada Alta test array" } });
const analyst = await models.User.findOne({ where: { email: "analyst@demo.siderea.test" } });
if (!site || !analyst) throw new Error("the demo site and analyst must be seeded first");
const { main, later } = demoBatches();
mkdirSync(".siderea/demo", { recursive: true });
writeFileSync(".siderea/demo/quebrada-alta-2023-2024.csv", main);
writeFileSync(".siderea/demo/quebrada-alta-later-batch.csv", later);
const id = await receiveUpload(new Blob([main]).stream(), {
  userId: analyst.id,
  datasetId: null,
  fileName: "quebrada-alta-2023-2024.csv",
  options: {
    mode: "new",
    name: "Quebrada Alta 2023-2024 (demo)",
    description: "Invented demo data: isotropic background, a weak dipole and one injected cluster, two years with gaps.",
    siteId: site.id,
    mapping: { timeFormat: "iso", azimuthConvention: "north-clockwise", energyUnit: "EeV", columns: {} },
    dropBadRows: false,
    blinded: false,
  },
}, { queue: false });
const outcome = await runIngest(id);
if (outcome.status !== "done") throw new Error(`demo ingestion did not finish: ${JSON.stringify(outcome)}`);
console.log(`demo dataset ${outcome.datasetId}: ${outcome.eventCount} events`);
await closeDb();
