// A bench's server process: a free port to start it on, and its memory read from /proc.
import fs from "node:fs";
import net from "node:net";

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
