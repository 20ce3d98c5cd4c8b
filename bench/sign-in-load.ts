// Benchmark: how long a health check waits while failed sign-ins hash passwords (bcryptjs, cost 12
// unless BCRYPT_COST says otherwise).
// Run with `npx tsx --conditions=react-server bench/sign-in-load.ts`.
//
// A server process answers GET /health at once and POST /sign-in… with a failed sign-in; this
// process sends N sign-ins in parallel and, while they run, asks /health again and again, one
// request at a time, and reports its latencies. Three cases:
//   unbounded    every sign-in compares at once with bcrypt.compare on the request thread (the old path);
//   one-at-time  signInWithPassword from N different addresses (each compare waits its turn in the
//                password thread, lib/workers/passwords.mjs);
//   one-address  signInWithPassword, 4 × N attempts from one address at one account: the
//                account-and-address limit lets 10 compare, the rest are refused before hashing.
import { fork, type ChildProcess } from "node:child_process";
import fs from "node:fs";
import http from "node:http";
import os from "node:os";
import path from "node:path";

const PARALLEL = Number(process.env.PARALLEL || 16);

async function serve() {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "headroom-bench-sign-in-"));
  process.env.DATABASE_PATH = path.join(dir, "bench.db");
  process.env.BCRYPT_COST ??= "12";
  process.env.LOG_LEVEL = "silent";
  const bcrypt = (await import("bcryptjs")).default;
  const { getDb } = await import("@/db/client");
  const { users } = await import("@/db/schema");
  const { signInWithPassword } = await import("@/lib/auth/sign-in");
  const { bcryptCost } = await import("@/lib/config");

  const hash = bcrypt.hashSync("the right password", bcryptCost());
  getDb().insert(users).values({ email: "owner@example.test", name: "Owner", role: "admin", passwordHash: hash }).run();
  const started = performance.now();
  await bcrypt.compare("wrong", hash);
  const compareMs = performance.now() - started;

  const server = http.createServer(async (request, response) => {
    if (request.url === "/health") {
      response.end("ok");
      return;
    }
    if (request.url === "/reset") {
      getDb().$client.prepare("DELETE FROM rate_limits").run();
      response.end();
      return;
    }
    let status = 401;
    try {
      if (request.url === "/sign-in-unbounded") await bcrypt.compare("wrong", hash);
      else await signInWithPassword("owner@example.test", "wrong", { clientIp: String(request.headers["x-bench-ip"]) });
    } catch (error) {
      status = (error as { status?: number }).status ?? 500;
    }
    response.statusCode = status;
    response.end();
  });
  server.listen(0, "127.0.0.1", () => {
    process.send!({ port: (server.address() as { port: number }).port, compareMs, cost: bcryptCost() });
  });
  process.on("disconnect", () => {
    server.close();
    fs.rmSync(dir, { recursive: true, force: true });
    process.exit(0);
  });
}

function percentile(sorted: number[], q: number): number {
  return sorted[Math.min(sorted.length - 1, Math.floor(q * sorted.length))];
}

async function drive() {
  const child: ChildProcess = fork(process.argv[1], ["--serve"], { execArgv: process.execArgv });
  const { port, compareMs, cost } = await new Promise<{ port: number; compareMs: number; cost: number }>((resolve) => child.once("message", resolve as never));
  const send = (method: string, pathName: string, headers: Record<string, string> = {}) =>
    new Promise<number>((resolve, reject) => {
      const request = http.request({ host: "127.0.0.1", port, path: pathName, method, headers, agent: false }, (response) => {
        response.resume();
        response.on("end", () => resolve(response.statusCode ?? 0));
      });
      request.on("error", reject);
      request.end();
    });

  console.log(`one compare at cost ${cost}: ${compareMs.toFixed(0)} ms; ${os.cpus().length} cores, load ${os.loadavg()[0].toFixed(2)}`);
  for (const [label, pathName, count, ipOf] of [
    ["unbounded", "/sign-in-unbounded", PARALLEL, (i: number) => `198.51.100.${i}`],
    ["one-at-time", "/sign-in", PARALLEL, (i: number) => `198.51.100.${i}`],
    ["one-address", "/sign-in", 4 * PARALLEL, () => "203.0.113.66"],
  ] as const) {
    await send("POST", "/reset");
    const started = performance.now();
    let done = false;
    const signIns = Promise.all(Array.from({ length: count }, (_, i) => send("POST", pathName, { "x-bench-ip": ipOf(i) }))).then((statuses) => {
      done = true;
      return statuses;
    });
    const latencies: number[] = [];
    while (!done) {
      const t = performance.now();
      await send("GET", "/health");
      latencies.push(performance.now() - t);
      await new Promise((resolve) => setTimeout(resolve, 10));
    }
    const statuses = await signIns;
    const elapsed = performance.now() - started;
    const byStatus = statuses.reduce<Record<number, number>>((acc, s) => ({ ...acc, [s]: (acc[s] ?? 0) + 1 }), {});
    const sorted = latencies.sort((a, b) => a - b);
    console.log(
      `${label.padEnd(12)} ${String(count).padStart(3)} sign-ins ${JSON.stringify(byStatus).padEnd(20)} done in ${(elapsed / 1000).toFixed(2)} s; ` +
        `/health median ${percentile(sorted, 0.5).toFixed(0)} ms, p95 ${percentile(sorted, 0.95).toFixed(0)} ms, max ${sorted[sorted.length - 1].toFixed(0)} ms (${sorted.length} checks)`,
    );
  }
  child.disconnect();
}

void (process.argv.includes("--serve") ? serve() : drive());
