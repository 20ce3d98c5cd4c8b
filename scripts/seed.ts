/** Seeds the demo organisation when the database is empty. */
import { closeDb, getDb } from "../db/client";
import { seedDemo } from "../db/seed/demo";
import { DEMO_INGEST_KEY } from "../db/seed/demo-readings";

const startedAt = performance.now();
seedDemo(getDb())
  .then((seeded) => {
    if (seeded) {
      console.log(`[headroom] seeded the demo organisation in ${((performance.now() - startedAt) / 1000).toFixed(1)} s`);
      console.log(`[headroom] demo ingest key (demo only — revoke it on a real installation): ${DEMO_INGEST_KEY}`);
    } else {
      console.log("[headroom] database not empty; nothing seeded");
    }
    closeDb();
  })
  .catch((error) => {
    console.error(error);
    process.exit(1);
  });
