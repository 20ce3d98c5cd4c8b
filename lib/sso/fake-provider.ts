/**
 * A local OpenID Connect provider for development, the demo and the tests (oidc-provider), started
 * beside the app like the e-mail fake. It knows a few invented people (login, password, name,
 * e-mail, `groups`), signs them in through a plain form (fields `login` and `password`, a
 * "Continue" button), grants the one first-party client every scope without a consent step, and
 * puts `email`, `email_verified`, `name` and `groups` in the ID token.
 *
 * It asks for the login every time (its own session cookie is ignored when an authorization
 * starts), so the demo can switch between people.
 *
 * Control endpoints for tests and the demo, answered only to this machine:
 *   GET  /people                  the people, without passwords
 *   POST /people/{login}/groups   { "groups": ["…"] } replaces that person's groups
 *
 * Its cookies are named `oidcfake_*`: cookies are not kept apart by port, so on localhost they
 * share a jar with the app's own (`headroom_session`, `headroom_sso`).
 */
import { generateKeyPairSync, randomBytes } from "node:crypto";
import http from "node:http";
import Provider, { type Configuration, type KoaContextWithOIDC } from "oidc-provider";

export type FakePerson = {
  login: string;
  password: string;
  name: string;
  email: string;
  emailVerified: boolean;
  groups: string[];
};

export type OidcFake = {
  /** The issuer, exactly as the provider announces it: http://localhost:PORT (no trailing slash). */
  issuer: string;
  port: number;
  clientId: string;
  clientSecret: string;
  people: Map<string, FakePerson>;
  setGroups: (login: string, groups: string[]) => void;
  close: () => Promise<void>;
};

export const DEMO_OIDC_CLIENT_ID = "headroom-demo";
export const DEMO_OIDC_CLIENT_SECRET = "headroom-demo-client-secret-local-only";
export const DEMO_SSO_PASSWORD = "headroom-demo";

/** Invented people of the demo organisation's institution (its example.org domain). */
export const DEMO_SSO_PEOPLE: FakePerson[] = [
  { login: "ines", password: DEMO_SSO_PASSWORD, name: "Ines Calloway", email: "ines.calloway@example.org", emailVerified: true, groups: ["research-staff"] },
  { login: "tobias", password: DEMO_SSO_PASSWORD, name: "Tobias Renwick", email: "tobias.renwick@example.org", emailVerified: true, groups: ["chem-safety-office"] },
  { login: "odile", password: DEMO_SSO_PASSWORD, name: "Odile Fairbanks", email: "odile.fairbanks@example.org", emailVerified: true, groups: [] },
];

const COOKIE_NAMES = { session: "oidcfake_session", interaction: "oidcfake_interaction", resume: "oidcfake_resume" };
const MAX_BODY_BYTES = 16 * 1024;

function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c]!);
}

function loginPage(uid: string, error?: string, login = ""): string {
  return `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><title>Institution sign-in (local test provider)</title>
<style>body{font-family:system-ui,sans-serif;max-width:24rem;margin:4rem auto;padding:0 1rem;color:#1f2933}
label{display:block;margin-top:1rem;font-size:.9rem}input{width:100%;padding:.5rem;margin-top:.25rem;box-sizing:border-box}
button{margin-top:1.5rem;padding:.6rem 1.2rem}p.error{color:#b42318}small{color:#52606d}</style></head>
<body><h1>Institution sign-in</h1><small>Local test provider for Headroom's demo and tests. Invented people only.</small>
${error ? `<p class="error" role="alert">${escapeHtml(error)}</p>` : ""}
<form method="post" action="/interaction/${escapeHtml(uid)}/login" autocomplete="off">
<label for="login">Login</label><input id="login" name="login" value="${escapeHtml(login)}" required autofocus>
<label for="password">Password</label><input id="password" name="password" type="password" required>
<button type="submit">Continue</button></form></body></html>`;
}

function readBody(req: http.IncomingMessage): Promise<string> {
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    let size = 0;
    req.on("data", (chunk: Buffer) => {
      size += chunk.length;
      if (size > MAX_BODY_BYTES) {
        reject(new Error("body too large"));
        req.destroy();
        return;
      }
      chunks.push(chunk);
    });
    req.on("end", () => resolve(Buffer.concat(chunks).toString("utf8")));
    req.on("error", reject);
  });
}

function isLoopbackSocket(req: http.IncomingMessage): boolean {
  const address = req.socket.remoteAddress ?? "";
  return address === "127.0.0.1" || address === "::1" || address === "::ffff:127.0.0.1";
}

function sendJson(res: http.ServerResponse, status: number, body: unknown) {
  res.writeHead(status, { "content-type": "application/json" });
  res.end(JSON.stringify(body));
}

function publicPerson(person: FakePerson) {
  return { login: person.login, name: person.name, email: person.email, emailVerified: person.emailVerified, groups: person.groups };
}

export async function startOidcFake(options: {
  port: number;
  /** Where the app receives the code; every address the client may use. */
  redirectUris: string[];
  people?: FakePerson[];
  clientId?: string;
  clientSecret?: string;
}): Promise<OidcFake> {
  const issuer = `http://localhost:${options.port}`;
  const clientId = options.clientId ?? DEMO_OIDC_CLIENT_ID;
  const clientSecret = options.clientSecret ?? DEMO_OIDC_CLIENT_SECRET;
  const people = new Map((options.people ?? DEMO_SSO_PEOPLE).map((p) => [p.login, { ...p, groups: [...p.groups] }]));
  const signingKey = generateKeyPairSync("rsa", { modulusLength: 2048 }).privateKey.export({ format: "jwk" });

  const configuration: Configuration = {
    clients: [
      {
        client_id: clientId,
        client_secret: clientSecret,
        redirect_uris: options.redirectUris,
        grant_types: ["authorization_code"],
        response_types: ["code"],
        token_endpoint_auth_method: "client_secret_basic",
      },
    ],
    async findAccount(_ctx, id) {
      const person = people.get(id);
      if (!person) return undefined;
      return {
        accountId: id,
        // Read at each sign-in, so a change of groups through the control endpoint counts at once.
        async claims() {
          const now = people.get(id) ?? person;
          return { sub: id, name: now.name, email: now.email, email_verified: now.emailVerified, groups: [...now.groups] };
        },
      };
    },
    claims: { openid: ["sub"], email: ["email", "email_verified"], profile: ["name"], groups: ["groups"] },
    scopes: ["openid", "email", "profile", "groups"],
    // Put the scopes' claims (groups among them) in the ID token, not only behind userinfo.
    conformIdTokenClaims: false,
    features: { devInteractions: { enabled: false } },
    interactions: { url: (_ctx: KoaContextWithOIDC, interaction) => `/interaction/${interaction.uid}` },
    // The demo client is first-party: grant what it asks without a consent screen.
    async loadExistingGrant(ctx) {
      const accountId = ctx.oidc.session?.accountId;
      if (!accountId || ctx.oidc.client?.clientId !== clientId) return undefined;
      const grant = new ctx.oidc.provider.Grant({ clientId, accountId });
      grant.addOIDCScope("openid email profile groups");
      await grant.save();
      return grant;
    },
    pkce: { required: () => true },
    jwks: { keys: [signingKey as never] },
    cookies: { keys: [randomBytes(32).toString("base64url")], names: COOKIE_NAMES },
    ttl: { Session: 600, Interaction: 600, Grant: 600, AuthorizationCode: 60, AccessToken: 600, IdToken: 600 },
  };

  const provider = new Provider(issuer, configuration);
  const handle = provider.callback();

  async function interaction(req: http.IncomingMessage, res: http.ServerResponse, uid: string, submit: boolean) {
    const details = await provider.interactionDetails(req, res);
    if (details.uid !== uid) throw new Error("interaction mismatch");
    if (details.prompt.name !== "login") {
      // Consent for the first-party client: grant it and carry on.
      const grant = new provider.Grant({ clientId, accountId: details.session!.accountId });
      grant.addOIDCScope("openid email profile groups");
      const grantId = await grant.save();
      await provider.interactionFinished(req, res, { consent: { grantId } }, { mergeWithLastSubmission: true });
      return;
    }
    if (!submit) {
      res.writeHead(200, { "content-type": "text/html; charset=utf-8", "cache-control": "no-store" });
      res.end(loginPage(uid));
      return;
    }
    const form = new URLSearchParams(await readBody(req));
    const login = (form.get("login") ?? "").trim();
    const person = people.get(login);
    if (!person || person.password !== form.get("password")) {
      res.writeHead(200, { "content-type": "text/html; charset=utf-8", "cache-control": "no-store" });
      res.end(loginPage(uid, "That login and password do not match a person of this test provider.", login));
      return;
    }
    await provider.interactionFinished(req, res, { login: { accountId: login } }, { mergeWithLastSubmission: false });
  }

  async function control(req: http.IncomingMessage, res: http.ServerResponse, url: URL): Promise<boolean> {
    if (url.pathname === "/people" && req.method === "GET") {
      if (!isLoopbackSocket(req)) return sendJson(res, 403, { error: "loopback only" }), true;
      sendJson(res, 200, { people: [...people.values()].map(publicPerson) });
      return true;
    }
    const match = /^\/people\/([^/]+)\/groups$/.exec(url.pathname);
    if (match && req.method === "POST") {
      if (!isLoopbackSocket(req)) return sendJson(res, 403, { error: "loopback only" }), true;
      const person = people.get(decodeURIComponent(match[1]));
      if (!person) return sendJson(res, 404, { error: "no such person" }), true;
      let groups: unknown;
      try {
        groups = (JSON.parse(await readBody(req)) as { groups?: unknown }).groups;
      } catch {
        return sendJson(res, 400, { error: "send JSON: { \"groups\": [\"…\"] }" }), true;
      }
      if (!Array.isArray(groups) || groups.length > 100 || !groups.every((g) => typeof g === "string" && g.length > 0 && g.length <= 256)) {
        return sendJson(res, 400, { error: "groups must be a list of up to 100 non-empty strings" }), true;
      }
      person.groups = [...groups];
      sendJson(res, 200, publicPerson(person));
      return true;
    }
    return false;
  }

  const listener: http.RequestListener = (req, res) => {
    const url = new URL(req.url ?? "/", issuer);
    const interactionMatch = /^\/interaction\/([A-Za-z0-9_-]+)(\/login)?$/.exec(url.pathname);
    void (async () => {
      if (await control(req, res, url)) return;
      if (interactionMatch) {
        const submit = Boolean(interactionMatch[2]);
        if ((submit && req.method !== "POST") || (!submit && req.method !== "GET")) return sendJson(res, 405, { error: "method not allowed" });
        return interaction(req, res, interactionMatch[1], submit);
      }
      if (url.pathname === "/auth" && req.headers.cookie) {
        // Ask for the login at every new authorization: forget the provider's own session.
        req.headers.cookie = req.headers.cookie
          .split(";")
          .filter((part) => !part.trim().startsWith(`${COOKIE_NAMES.session}`))
          .join(";");
      }
      handle(req, res);
    })().catch((error: Error) => {
      if (!res.headersSent) {
        res.writeHead(400, { "content-type": "text/plain; charset=utf-8" });
        res.end(`The local test provider could not go on: ${error.message}. Start the sign-in again from Headroom.`);
      } else res.end();
    });
  };

  const servers: http.Server[] = [];
  const listen = (host: string) =>
    new Promise<void>((resolve, reject) => {
      const server = http.createServer(listener);
      server.once("error", reject);
      server.listen(options.port, host, () => {
        servers.push(server);
        resolve();
      });
    });
  await listen("127.0.0.1");
  // "localhost" may resolve to ::1 first; answer there too when this machine has IPv6.
  await listen("::1").catch(() => undefined);

  return {
    issuer,
    port: options.port,
    clientId,
    clientSecret,
    people,
    setGroups(login, groups) {
      const person = people.get(login);
      if (!person) throw new Error(`No person ${login} at the local provider.`);
      person.groups = [...groups];
    },
    close: () =>
      Promise.all(
        servers.map(
          (server) =>
            new Promise<void>((resolve) => {
              server.closeAllConnections();
              server.close(() => resolve());
            }),
        ),
      ).then(() => undefined),
  };
}
