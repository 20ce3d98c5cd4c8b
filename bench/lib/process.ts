// A bench's server process: a free port to start it on, starting it, and its memory read from /proc.
import { spawn, type ChildProcess } from "node:child_process";
import fs from "node:fs";
import net from "node:net";
import path from "node:path";

/** A TCP port free on 127.0.0.1 now. */
export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = net.createServer();
    server.once("error", reject);
    server.listen(0, "127.0.0.1", () => {
      const { port } = server.address() as net.AddressInfo;
      server.close(() => resolve(port));
    });
  });
}

/** RSS in bytes of a process and its descendants, from /proc. */
export function treeRss(rootPid: number): number {
  const children = new Map<number, number[]>();
  for (const entry of fs.readdirSync("/proc")) {
    if (!/^\d+$/.test(entry)) continue;
    try {
      const stat = fs.readFileSync(`/proc/${entry}/stat`, "utf8");
      const ppid = Number(stat.slice(stat.lastIndexOf(")") + 2).split(" ")[1]);
      children.set(ppid, [...(children.get(ppid) ?? []), Number(entry)]);
    } catch {
      // the process ended meanwhile
    }
  }
  let total = 0;
  const pending = [rootPid];
  while (pending.length) {
    const pid = pending.pop()!;
    try {
      const match = /VmRSS:\s+(\d+) kB/.exec(fs.readFileSync(`/proc/${pid}/status`, "utf8"));
      if (match) total += Number(match[1]) * 1024;
    } catch {
      // ended
    }
    pending.push(...(children.get(pid) ?? []));
  }
  return total;
}

export type BenchServer = { base: string; pid: number; readyMs: number; stop(): Promise<void> };

/**
 * `next start` of the built app on 127.0.0.1:`port` in production mode, its output in
 * `<logDir>/server.log`, stopped when the bench exits; resolves once /api/health answers (60 s at
 * most). `env` adds to the bench's own environment (DATABASE_PATH, SESSION_SECRET, limits).
 */
export async function startServer(options: { port: number; logDir: string; env: Record<string, string> }): Promise<BenchServer> {
  const base = `http://127.0.0.1:${options.port}`;
  const logFile = path.join(options.logDir, "server.log");
  const serverLog = fs.openSync(logFile, "w");
  const server: ChildProcess = spawn(process.execPath, [path.join("node_modules", "next", "dist", "bin", "next"), "start", "-p", String(options.port), "-H", "127.0.0.1"], {
    stdio: ["ignore", serverLog, serverLog],
    env: {
      ...process.env,
      NODE_ENV: "production",
      NEXT_TELEMETRY_DISABLED: "1",
      LOG_LEVEL: "warn",
      APP_URL: base,
      COOKIE_SECURE: "false",
      BACKUP_NIGHTLY: "false",
      // E-mail goes nowhere: the benches send none that matter.
      RESEND_BASE_URL: "http://127.0.0.1:9",
      ...options.env,
    },
  });
  const kill = () => {
    if (server.exitCode === null) server.kill("SIGTERM");
  };
  process.on("exit", kill);
  const startedAt = performance.now();
  for (;;) {
    if (server.exitCode !== null) throw new Error(`the server stopped (exit ${server.exitCode}); see ${logFile}`);
    try {
      if ((await fetch(`${base}/api/health`)).ok) break;
    } catch {
      // not listening yet
    }
    if (performance.now() - startedAt > 60_000) throw new Error("the server did not answer /api/health within 60 s");
    await new Promise((resolve) => setTimeout(resolve, 200));
  }
  return {
    base,
    pid: server.pid!,
    readyMs: performance.now() - startedAt,
    stop: async () => {
      if (server.exitCode !== null) return fs.closeSync(serverLog);
      const exited = new Promise((resolve) => server.once("exit", resolve));
      kill();
      await exited;
      fs.closeSync(serverLog);
    },
  };
}
