/**
 * Runs the local OpenID Connect provider on http://localhost:OIDC_FAKE_PORT (default 3026) for an
 * app at APP_URL (default http://localhost:3000): `npx tsx scripts/oidc-fake.ts`. Point the app at
 * it with OIDC_ISSUER=http://localhost:3026 OIDC_CLIENT_ID=headroom-demo
 * OIDC_CLIENT_SECRET=headroom-demo-client-secret-local-only.
 */
import { DEMO_SSO_PEOPLE, startOidcFake } from "../lib/sso/fake-provider";

const port = Number(process.env.OIDC_FAKE_PORT || 3026);
const appUrl = (process.env.APP_URL || `http://localhost:${process.env.PORT || 3000}`).replace(/\/+$/, "");
startOidcFake({ port, redirectUris: [`${appUrl}/sso/callback`] })
  .then((fake) => {
    console.log(JSON.stringify({ app: "headroom-oidc-fake", msg: "listening", issuer: fake.issuer, clientId: fake.clientId, clientSecret: fake.clientSecret, redirectUri: `${appUrl}/sso/callback` }));
    for (const p of DEMO_SSO_PEOPLE) console.log(`  ${p.login} / ${p.password}: ${p.name} <${p.email}>, groups: ${p.groups.join(", ") || "none"}`);
    const stop = () => void fake.close().then(() => process.exit(0));
    process.on("SIGINT", stop);
    process.on("SIGTERM", stop);
  })
  .catch((error: Error) => {
    console.error(`The OpenID Connect fake could not listen on port ${port}: ${error.message}`);
    process.exit(1);
  });
