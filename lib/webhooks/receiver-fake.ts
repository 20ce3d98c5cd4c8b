/**
 * A local webhook receiver for the demo and tests, like the e-mail fake. Every POST (any path but
 * /fake/…) is recorded with its webhook headers and body; when it knows the endpoint's secret it
 * checks the signature with the Standard Webhooks verifier and records whether it was valid.
 * GET /deliveries lists the recordings newest first (the last MAX kept), DELETE /deliveries clears
 * them, POST /fake/fail { "count": 2, "status": 500 } makes the next requests fail, to exercise retries.
 */
import { randomUUID } from "node:crypto";
import http from "node:http";
import { Webhook } from "standardwebhooks";

export type ReceivedWebhook = {
  id: string;
  receivedAt: string;
  path: string;
  webhookId: string | null;
  webhookTimestamp: string | null;
  webhookSignature: string | null;
  eventType: string | null;
  body: string;
  /** true / false when the secret is known, null when it is not. */
  signatureValid: boolean | null;
  verifyError: string | null;
  answeredStatus: number;
};

export type WebhookReceiver = {
  url: string;
  port: number;
  received: ReceivedWebhook[];
  /** Answer `status` (default 500) to the next `count` deliveries. */
  failNext: (count: number, status?: number) => void;
  /** The secret to verify signatures with from now on. */
  setSecret: (secret: string | null) => void;
  close: () => Promise<void>;
};

const MAX_BODY_BYTES = 1024 * 1024;
const MAX_KEPT = 500;

function send(res: http.ServerResponse, status: number, body: unknown) {
  res.writeHead(status, { "content-type": "application/json" });
  res.end(JSON.stringify(body));
}

function header(req: http.IncomingMessage, name: string): string | null {
  const value = req.headers[name];
  return typeof value === "string" ? value : null;
}

export function startWebhookReceiver(options: { port?: number; host?: string; secret?: string; keep?: number } = {}): Promise<WebhookReceiver> {
  const received: ReceivedWebhook[] = [];
  const keep = options.keep ?? MAX_KEPT;
  let verifier = options.secret ? new Webhook(options.secret) : null;
  let failing = { count: 0, status: 500 };

  const server = http.createServer((req, res) => {
    const chunks: Buffer[] = [];
    let size = 0;
    let tooLarge = false;
    req.on("data", (chunk: Buffer) => {
      size += chunk.length;
      if (size > MAX_BODY_BYTES) {
        if (!tooLarge) send(res, 413, { error: "Body too large." });
        tooLarge = true;
        req.destroy();
      } else chunks.push(chunk);
    });
    req.on("end", () => {
      if (tooLarge) return;
      const url = new URL(req.url ?? "/", "http://receiver");
      const path = url.pathname.replace(/\/+$/, "") || "/";
      const method = req.method ?? "GET";
      const text = Buffer.concat(chunks).toString("utf8");
      if (path === "/health") return send(res, 200, { ok: true, received: received.length });
      if (path === "/deliveries" && method === "GET") return send(res, 200, { data: received });
      if (path === "/deliveries" && method === "DELETE") {
        received.length = 0;
        return send(res, 200, { ok: true });
      }
      if (path === "/fake/fail" && method === "POST") {
        try {
          const body = JSON.parse(text || "{}") as { count?: number; status?: number };
          failing = { count: Math.max(0, Math.floor(Number(body.count ?? 1))), status: Number(body.status ?? 500) };
          return send(res, 200, failing);
        } catch {
          return send(res, 400, { error: "Body is not valid JSON." });
        }
      }
      if (method !== "POST") return send(res, 404, { error: `No route for ${method} ${path}.` });
      const webhookHeaders = {
        "webhook-id": header(req, "webhook-id") ?? "",
        "webhook-timestamp": header(req, "webhook-timestamp") ?? "",
        "webhook-signature": header(req, "webhook-signature") ?? "",
      };
      let signatureValid: boolean | null = null;
      let verifyError: string | null = null;
      if (verifier) {
        try {
          verifier.verify(text, webhookHeaders);
          signatureValid = true;
        } catch (error) {
          signatureValid = false;
          verifyError = (error as Error).message;
        }
      }
      let eventType: string | null = null;
      try {
        eventType = (JSON.parse(text) as { type?: string }).type ?? null;
      } catch {
        eventType = null;
      }
      const answeredStatus = failing.count > 0 ? failing.status : signatureValid === false ? 401 : 200;
      if (failing.count > 0) failing.count -= 1;
      received.unshift({
        id: randomUUID(),
        receivedAt: new Date().toISOString(),
        path,
        webhookId: header(req, "webhook-id"),
        webhookTimestamp: header(req, "webhook-timestamp"),
        webhookSignature: header(req, "webhook-signature"),
        eventType,
        body: text,
        signatureValid,
        verifyError,
        answeredStatus,
      });
      if (received.length > keep) received.length = keep;
      send(res, answeredStatus, answeredStatus < 300 ? { ok: true } : { error: signatureValid === false ? "Invalid signature." : "Failing on purpose (POST /fake/fail)." });
    });
  });

  return new Promise((resolve, reject) => {
    server.once("error", reject);
    server.listen(options.port ?? 3027, options.host ?? "127.0.0.1", () => {
      const address = server.address();
      const port = typeof address === "object" && address ? address.port : (options.port ?? 3027);
      resolve({
        url: `http://${options.host ?? "127.0.0.1"}:${port}`,
        port,
        received,
        failNext: (count, status = 500) => {
          failing = { count, status };
        },
        setSecret: (secret) => {
          verifier = secret ? new Webhook(secret) : null;
        },
        close: () =>
          new Promise<void>((done) => {
            server.closeAllConnections?.();
            server.close(() => done());
          }),
      });
    });
  });
}
