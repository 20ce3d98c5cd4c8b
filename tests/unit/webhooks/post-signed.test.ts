/** One delivery attempt against hostile receivers: redirects, floods, silence, and the loopback when it is not allowed. */
import http from "node:http";
import type { AddressInfo } from "node:net";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { postSigned, RESPONSE_KEEP_BYTES } from "@/lib/webhooks/deliver";

let server: http.Server;
let base: string;
const hits: string[] = [];

beforeAll(async () => {
  server = http.createServer((req, res) => {
    hits.push(req.url ?? "");
    if (req.url === "/redirect") {
      res.writeHead(302, { location: `${base}/elsewhere` });
      return res.end();
    }
    if (req.url === "/flood") {
      res.writeHead(200, { "content-type": "text/plain" });
      const chunk = Buffer.alloc(64 * 1024, "x");
      let sent = 0;
      const write = () => {
        while (sent < 20 * 1024 * 1024) {
          sent += chunk.length;
          if (!res.write(chunk)) return res.once("drain", write);
        }
        res.end();
      };
      res.on("error", () => undefined);
      return write();
    }
    if (req.url === "/silent") return; // never answers
    res.writeHead(204);
    res.end();
  });
  await new Promise<void>((done) => server.listen(0, "127.0.0.1", done));
  base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
});

afterAll(async () => {
  server.closeAllConnections();
  await new Promise<void>((done) => server.close(() => done()));
});

const post = (path: string, opts: { allowPrivate?: boolean; timeoutMs?: number } = {}) =>
  postSigned(new URL(`${base}${path}`), "{}", { "webhook-id": "msg_test" }, { allowPrivate: opts.allowPrivate ?? true, timeoutMs: opts.timeoutMs });

describe("a delivery attempt", () => {
  it("counts any 2xx as received", async () => {
    expect(await post("/ok")).toMatchObject({ statusCode: 204, error: null, body: null });
  });

  it("does not follow a redirect: a 3xx is a failure naming where it pointed", async () => {
    hits.length = 0;
    const outcome = await post("/redirect");
    expect(outcome).toMatchObject({ statusCode: 302, error: `Redirects are not followed (HTTP 302 to ${base}/elsewhere).` });
    expect(hits).toEqual(["/redirect"]);
  });

  it("reads at most 4 KB of an answer and stops", async () => {
    const outcome = await post("/flood");
    expect(outcome.statusCode).toBe(200);
    expect(outcome.error).toBeNull();
    expect(Buffer.byteLength(outcome.body!)).toBe(RESPONSE_KEEP_BYTES);
    expect(outcome.durationMs).toBeLessThan(5_000);
  });

  it("gives up on a receiver that never answers", async () => {
    const outcome = await post("/silent", { timeoutMs: 300 });
    expect(outcome).toMatchObject({ statusCode: null, error: "No answer within 0.3 s.", body: null });
    expect(outcome.durationMs).toBeGreaterThanOrEqual(290);
    expect(outcome.durationMs).toBeLessThan(2_000);
  });

  it("refuses the loopback on the socket unless private addresses are allowed", async () => {
    hits.length = 0;
    const outcome = await post("/ok", { allowPrivate: false });
    expect(outcome).toMatchObject({ statusCode: null, error: "Refused: the address (127.0.0.1) is not public; allow private addresses for this endpoint if it is inside your network." });
    expect(hits).toEqual([]);
  });

  it("refuses a host name that resolves to the loopback too (checked at connect time, not only when saved)", async () => {
    hits.length = 0;
    const port = (server.address() as AddressInfo).port;
    const outcome = await postSigned(new URL(`http://localhost:${port}/ok`), "{}", {}, { allowPrivate: false });
    expect(outcome.error).toMatch(/^Refused: the address \((127\.0\.0\.1|::1)\) is not public/);
    expect(hits).toEqual([]);
  });
});
