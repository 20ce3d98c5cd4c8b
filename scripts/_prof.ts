process.env.DATABASE_PATH = "/tmp/headroom-bench-planner-jqFSHg/register.db";
process.env.LOG_LEVEL = "silent";
async function main() {
  const { getDb } = await import("@/db/client");
  const { planPlaces } = await import("@/lib/assessment/storage-plan");
  const db = getDb();
  const ether = (db.$client.prepare("select id from substances where cas='60-29-7'").get() as {id:number}).id;
  for (let k=0;k<4;k++){ const t = performance.now(); const r = planPlaces(db, { substanceId: ether, mixtureId: null, amount: 1, amountUnit: "L", label: "x" }, { limit: 20 }); console.log("plan", (performance.now()-t).toFixed(0), r.items[0].roomCode, r.items[0].code, r.items[0].verdict, require("os").loadavg()[0]); }
}
main();
