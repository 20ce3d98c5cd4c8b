/** Seeds the demo organisation when the database is empty. */
import { closeDb, getDb } from "../db/client";
import { seedDemo } from "../db/seed/demo";

seedDemo(getDb())
  .then((seeded) => {
    console.log(seeded ? "[headroom] seeded the demo organisation" : "[headroom] database not empty; nothing seeded");
    closeDb();
  })
  .catch((error) => {
    console.error(error);
    process.exit(1);
  });
