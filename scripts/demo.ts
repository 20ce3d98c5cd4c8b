/**
 * `npm run demo`: migrates and (when empty) seeds the database, builds the app, and serves it on
 * PORT (default 3000) with the local e-mail fake on EMAIL_FAKE_PORT (default 3025) and the local
 * OpenID Connect provider on OIDC_FAKE_PORT (default 3026) unless OIDC_ISSUER names another provider,
 * and the local webhook receiver on WEBHOOK_FAKE_PORT (default 3027), registered as a webhook endpoint.
 * Flags: --fresh deletes the database file first (tests); --no-build serves the existing build.
 * The build is `next build` and then the worker threads' bundle (scripts/build-workers.ts).
 */
import { spawn, spawnSync } from "node:child_process";
import { randomBytes } from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import { closeDb, databasePath, getDb } from "../db/client";
import { seedDemo } from "../db/seed/demo";
import { DEMO_INGEST_KEY } from "../db/seed/demo-readings";
import { startEmailFake } from "../lib/mail/fake-server";
import { DEMO_OIDC_CLIENT_ID, DEMO_OIDC_CLIENT_SECRET, DEMO_SSO_PEOPLE, startOidcFake } from "../lib/sso/fake-provider";
import { DEMO_WEBHOOK_SECRET, ensureDemoWebhookEndpoint } from "../lib/webhooks/demo-endpoint";
import { startWebhookReceiver } from "../lib/webhooks/receiver-fake";
import { buildWorkerBundle } from "./build-workers";

const args = new Set(process.argv.slice(2));
process.env.NEXT_TELEMETRY_DISABLED = "1";
const port = Number(process.env.PORT || 3000);
const fakePort = Number(process.env.EMAIL_FAKE_PORT || 3025);
const oidcFakePort = Number(process.env.OIDC_FAKE_PORT || 3026);
const webhookPort = Number(process.env.WEBHOOK_FAKE_PORT || 3027);
const dbFile = databasePath();

function say(message: string) {
  console.log(`[headroom] ${message}`);
}

function sessionSecret(): string {
  if (process.env.SESSION_SECRET) return process.env.SESSION_SECRET;
  const file = path.join(path.dirname(path.resolve(dbFile)), "session-secret");
  if (!fs.existsSync(file)) {
    fs.mkdirSync(path.dirname(file), { recursive: true });
    fs.writeFileSync(file, randomBytes(32).toString("base64url"), { mode: 0o600 });
  }
  return fs.readFileSync(file, "utf8").trim();
}

async function main() {
  if (args.has("--fresh")) {
    for (const suffix of ["", "-wal", "-shm"]) fs.rmSync(`${dbFile}${suffix}`, { force: true });
    say(`removed ${dbFile}`);
  }
  getDb(); // opens the file and applies pending migrations
  say(`database ${dbFile} is up to date`);
  if (await seedDemo(getDb())) {
    say("seeded the demo organisation (invented data; demo accounts use the password headroom-demo)");
    say(`demo ingest key (demo only — revoke it on a real installation): ${DEMO_INGEST_KEY}`);
  }
  // Webhooks: the local receiver as an endpoint, its secret encrypted under the server's SESSION_SECRET.
  process.env.SESSION_SECRET = sessionSecret();
  ensureDemoWebhookEndpoint(getDb(), `http://127.0.0.1:${webhookPort}/headroom`);
  closeDb();

  if (!args.has("--no-build")) {
    say("building the app");
    const build = spawnSync("npx", ["next", "build"], { stdio: "inherit", env: process.env });
    if (build.status !== 0) process.exit(build.status ?? 1);
    say(`worker bundle written to ${path.relative(process.cwd(), await buildWorkerBundle())}`);
  }

  let fake: Awaited<ReturnType<typeof startEmailFake>> | undefined;
  try {
    fake = await startEmailFake({ port: fakePort });
    say(`e-mail fake listening on ${fake.url} (captured messages: ${fake.url}/emails)`);
  } catch (error) {
    say(`e-mail fake not started on port ${fakePort} (${(error as Error).message}); using whatever listens there`);
  }

  // --- Single sign-on: the local provider, unless the operator named a real one ---
  const appUrl = (process.env.APP_URL || `http://localhost:${port}`).replace(/\/+$/, "");
  const localIssuer = `http://localhost:${oidcFakePort}`;
  let oidcFake: Awaited<ReturnType<typeof startOidcFake>> | undefined;
  let oidcEnv: Record<string, string> = {};
  if (!process.env.OIDC_ISSUER || process.env.OIDC_ISSUER === localIssuer) {
    try {
      oidcFake = await startOidcFake({ port: oidcFakePort, redirectUris: [`${appUrl}/sso/callback`] });
      say(`single sign-on: local provider on ${oidcFake.issuer} (people: ${oidcFake.issuer}/people); demo people, password ${DEMO_SSO_PEOPLE[0].password}:`);
      for (const p of DEMO_SSO_PEOPLE) say(`  ${p.login}: ${p.name} <${p.email}>, groups: ${p.groups.join(", ") || "none"}`);
    } catch (error) {
      say(`single sign-on: local provider not started on port ${oidcFakePort} (${(error as Error).message}); using whatever listens there`);
    }
    oidcEnv = { OIDC_ISSUER: localIssuer, OIDC_CLIENT_ID: DEMO_OIDC_CLIENT_ID, OIDC_CLIENT_SECRET: DEMO_OIDC_CLIENT_SECRET };
  } else {
    say(`single sign-on: provider ${process.env.OIDC_ISSUER}`);
  }

  let receiver: Awaited<ReturnType<typeof startWebhookReceiver>> | undefined;
  try {
    receiver = await startWebhookReceiver({ port: webhookPort, secret: DEMO_WEBHOOK_SECRET });
    say(`webhook receiver listening on ${receiver.url} (recorded deliveries: ${receiver.url}/deliveries)`);
  } catch (error) {
    say(`webhook receiver not started on port ${webhookPort} (${(error as Error).message}); using whatever listens there`);
  }

  const server = spawn("npx", ["next", "start", "-p", String(port)], {
    stdio: "inherit",
    env: {
      ...process.env,
      NODE_ENV: "production",
      SESSION_SECRET: sessionSecret(),
      APP_URL: process.env.APP_URL || `http://localhost:${port}`,
      RESEND_BASE_URL: process.env.RESEND_BASE_URL || `http://127.0.0.1:${fakePort}`,
      COOKIE_SECURE: process.env.COOKIE_SECURE || "false",
      ...oidcEnv,
      WEBHOOK_FAKE_PORT: String(webhookPort),
      WEBHOOK_ALLOW_HTTP_LOOPBACK: process.env.WEBHOOK_ALLOW_HTTP_LOOPBACK || "true",
    },
  });
  say(`serving on http://localhost:${port}`);
  const stop = () => {
    server.kill("SIGTERM");
    void fake?.close();
    void oidcFake?.close();
    void receiver?.close();
  };
  process.on("SIGINT", stop);
  process.on("SIGTERM", stop);
  server.on("exit", (code) => {
    void fake?.close();
    void oidcFake?.close();
    void receiver?.close();
    process.exit(code ?? 0);
  });
}

main().catch((error) => {
  console.error(error);
  process.exit(1);
});
