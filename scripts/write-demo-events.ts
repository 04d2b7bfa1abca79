// Writes the demo event lists (invented scenario; see lib/demo/generate.ts) to a folder:
//   npx tsx scripts/write-demo-events.ts [folder]   (default .siderea/demo)
import { mkdirSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { demoBatches } from "@/lib/demo/generate";

const dir = process.argv[2] ?? ".siderea/demo";
mkdirSync(dir, { recursive: true });
const { main, later } = demoBatches();
writeFileSync(join(dir, "quebrada-alta-2023-2024.csv"), main);
writeFileSync(join(dir, "quebrada-alta-later-batch.csv"), later);
console.log(`wrote ${dir}/quebrada-alta-2023-2024.csv and ${dir}/quebrada-alta-later-batch.csv`);
