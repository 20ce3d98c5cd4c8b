/**
 * A local stand-in for the hosted e-mail service, speaking the same HTTP API as far as Headroom
 * uses it: POST /emails, POST /emails/batch (Bearer key, JSON with snake_case keys, optional
 * Idempotency-Key) answering { id }. It records every message; GET /emails lists them newest
 * first, GET /emails/:id returns one, DELETE /emails clears the mailbox. POST /fake/outage with
 * { "down": true } makes sends fail with 503 until set back, to exercise retries.
 */
import { randomUUID } from "node:crypto";
import http from "node:http";

export type CapturedEmail = {
  id: string;
  created_at: string;
  from: string;
  to: string[];
  cc: string[];
  bcc: string[];
  reply_to: string[];
  subject: string;
  html: string | null;
  text: string | null;
  headers: Record<string, string>;
  tags: { name: string; value: string }[];
  idempotency_key: string | null;
};

export type EmailFake = { url: string; port: number; messages: CapturedEmail[]; close: () => Promise<void> };

const MAX_BODY_BYTES = 5 * 1024 * 1024;
const MAX_MESSAGES = 5_000;

function asList(value: unknown): string[] {
  if (value == null) return [];
  return (Array.isArray(value) ? value : [value]).map(String);
}

function send(res: http.ServerResponse, status: number, body: unknown) {
  res.writeHead(status, { "content-type": "application/json" });
  res.end(JSON.stringify(body));
}

function validationError(res: http.ServerResponse, message: string) {
  send(res, 422, { statusCode: 422, name: "validation_error", message });
}

export function startEmailFake(options: { port?: number; host?: string } = {}): Promise<EmailFake> {
  const messages: CapturedEmail[] = [];
  const byIdempotencyKey = new Map<string, string>();
  let down = false;

  const capture = (payload: Record<string, unknown>, idempotencyKey: string | null): string | { error: string } => {
    if (idempotencyKey && byIdempotencyKey.has(idempotencyKey)) return byIdempotencyKey.get(idempotencyKey)!;
    const to = asList(payload.to);
    if (typeof payload.from !== "string" || !payload.from) return { error: "Missing `from` field." };
    if (to.length === 0) return { error: "Missing `to` field." };
    if (typeof payload.subject !== "string") return { error: "Missing `subject` field." };
    if (typeof payload.html !== "string" && typeof payload.text !== "string") return { error: "Missing `html` or `text` field." };
    const id = randomUUID();
    messages.unshift({
      id,
      created_at: new Date().toISOString(),
      from: payload.from,
      to,
      cc: asList(payload.cc),
      bcc: asList(payload.bcc),
      reply_to: asList(payload.reply_to),
      subject: payload.subject,
      html: typeof payload.html === "string" ? payload.html : null,
      text: typeof payload.text === "string" ? payload.text : null,
      headers: (payload.headers as Record<string, string>) ?? {},
      tags: (payload.tags as { name: string; value: string }[]) ?? [],
      idempotency_key: idempotencyKey,
    });
    if (messages.length > MAX_MESSAGES) messages.length = MAX_MESSAGES;
    if (idempotencyKey) byIdempotencyKey.set(idempotencyKey, id);
    return id;
  };

  const server = http.createServer((req, res) => {
    const chunks: Buffer[] = [];
    let size = 0;
    req.on("data", (chunk: Buffer) => {
      size += chunk.length;
      if (size > MAX_BODY_BYTES) {
        send(res, 413, { statusCode: 413, name: "validation_error", message: "Body too large." });
        req.destroy();
      } else chunks.push(chunk);
    });
    req.on("end", () => {
      const url = new URL(req.url ?? "/", "http://fake");
      const method = req.method ?? "GET";
      const path = url.pathname.replace(/\/+$/, "") || "/";
      let body: unknown = undefined;
      if (chunks.length) {
        try {
          body = JSON.parse(Buffer.concat(chunks).toString("utf8"));
        } catch {
          return validationError(res, "Body is not valid JSON.");
        }
      }
      if (path === "/health") return send(res, 200, { ok: true, messages: messages.length, down });
      if (path === "/fake/outage" && method === "POST") {
        down = Boolean((body as { down?: boolean } | undefined)?.down);
        return send(res, 200, { down });
      }
      if (path === "/emails" && method === "GET") return send(res, 200, { object: "list", data: messages });
      if (path === "/emails" && method === "DELETE") {
        messages.length = 0;
        byIdempotencyKey.clear();
        return send(res, 200, { ok: true });
      }
      if (path.startsWith("/emails/") && method === "GET" && path !== "/emails/batch") {
        const found = messages.find((m) => m.id === path.slice("/emails/".length));
        return found ? send(res, 200, { object: "email", ...found }) : send(res, 404, { statusCode: 404, name: "not_found", message: "Email not found." });
      }
      if ((path === "/emails" || path === "/emails/batch") && method === "POST") {
        const auth = req.headers.authorization ?? "";
        if (!/^Bearer\s+\S+/.test(auth)) return send(res, 401, { statusCode: 401, name: "missing_api_key", message: "Missing API key in the authorization header." });
        if (down) return send(res, 503, { statusCode: 503, name: "application_error", message: "The e-mail service is unavailable (simulated outage)." });
        const key = (req.headers["idempotency-key"] as string | undefined) ?? null;
        if (path === "/emails") {
          if (!body || typeof body !== "object" || Array.isArray(body)) return validationError(res, "Body must be a JSON object.");
          const outcome = capture(body as Record<string, unknown>, key);
          return typeof outcome === "string" ? send(res, 200, { id: outcome }) : validationError(res, outcome.error);
        }
        if (!Array.isArray(body)) return validationError(res, "Body must be a JSON array.");
        const ids: { id: string }[] = [];
        for (const [index, item] of body.entries()) {
          const outcome = capture(item as Record<string, unknown>, key ? `${key}:${index}` : null);
          if (typeof outcome !== "string") return validationError(res, `Item ${index}: ${outcome.error}`);
          ids.push({ id: outcome });
        }
        return send(res, 200, { data: ids });
      }
      send(res, 404, { statusCode: 404, name: "not_found", message: `No route for ${method} ${path}.` });
    });
  });

  return new Promise((resolve, reject) => {
    server.once("error", reject);
    server.listen(options.port ?? 3025, options.host ?? "127.0.0.1", () => {
      const address = server.address();
      const port = typeof address === "object" && address ? address.port : (options.port ?? 3025);
      resolve({
        url: `http://${options.host ?? "127.0.0.1"}:${port}`,
        port,
        messages,
        close: () => new Promise<void>((done) => server.close(() => done())),
      });
    });
  });
}
