import "server-only";
import * as oidc from "openid-client";
import { oidcRedirectUri, oidcSettings, type OidcSettings } from "@/lib/config";

/**
 * The institution's provider through openid-client: discovery once per process (per settings),
 * the authorization code flow with PKCE (S256), state and nonce, and the ID token's signature
 * checked against the provider's keys (enableNonRepudiationChecks).
 */
let cached: { key: string; configuration: Promise<oidc.Configuration> } | null = null;

export function ssoConfigured(): boolean {
  return oidcSettings() !== null;
}

function discover(settings: OidcSettings): Promise<oidc.Configuration> {
  const insecure = new URL(settings.issuer).protocol === "http:"; // loopback only: see issuerProblem
  return oidc
    .discovery(new URL(settings.issuer), settings.clientId, undefined, oidc.ClientSecretBasic(settings.clientSecret), {
      timeout: 10,
      ...(insecure ? { execute: [oidc.allowInsecureRequests] } : {}),
    })
    .then((configuration) => {
      oidc.enableNonRepudiationChecks(configuration);
      return configuration;
    });
}

/** The discovered provider, cached; a failed discovery is not cached, so the next sign-in tries again. */
export function oidcConfiguration(): Promise<oidc.Configuration> {
  const settings = oidcSettings();
  if (!settings) throw new Error("Single sign-on is not configured (OIDC_ISSUER is not set).");
  const key = `${settings.issuer}\n${settings.clientId}\n${settings.clientSecret}`;
  if (cached?.key === key) return cached.configuration;
  const configuration = discover(settings);
  const entry = { key, configuration };
  cached = entry;
  configuration.catch(() => {
    if (cached === entry) cached = null;
  });
  return configuration;
}

/** Forgets the discovered provider (tests that start a new one). */
export function forgetOidcConfiguration(): void {
  cached = null;
}

export type PendingSignIn = { state: string; nonce: string; codeVerifier: string; startedAt: number };

export const SSO_SCOPES = "openid email profile groups";

/** Where to send the person, and the values the callback must find again. */
export async function beginAuthorization(now = Date.now()): Promise<{ url: URL; pending: PendingSignIn }> {
  const configuration = await oidcConfiguration();
  const codeVerifier = oidc.randomPKCECodeVerifier();
  const pending: PendingSignIn = { state: oidc.randomState(), nonce: oidc.randomNonce(), codeVerifier, startedAt: now };
  const url = oidc.buildAuthorizationUrl(configuration, {
    redirect_uri: oidcRedirectUri(),
    scope: SSO_SCOPES,
    response_type: "code",
    code_challenge: await oidc.calculatePKCECodeChallenge(codeVerifier),
    code_challenge_method: "S256",
    state: pending.state,
    nonce: pending.nonce,
  });
  return { url, pending };
}

export type SsoClaims = {
  iss: string;
  sub: string;
  email: string | null;
  emailVerified: boolean | null;
  name: string | null;
  groups: unknown;
};

/**
 * Redeems the code at the provider. `callbackUrl` is the redirect URI (from APP_URL) with the
 * query the provider sent; the state, nonce and PKCE verifier must match the pending sign-in.
 * Throws when the provider's answer fails any check.
 */
export async function redeemCode(callbackUrl: URL, pending: PendingSignIn): Promise<SsoClaims> {
  const configuration = await oidcConfiguration();
  const tokens = await oidc.authorizationCodeGrant(configuration, callbackUrl, {
    pkceCodeVerifier: pending.codeVerifier,
    expectedState: pending.state,
    expectedNonce: pending.nonce,
    idTokenExpected: true,
  });
  const claims = tokens.claims();
  if (!claims) throw new Error("The provider sent no ID token.");
  return {
    iss: claims.iss,
    sub: claims.sub,
    email: typeof claims.email === "string" ? claims.email : null,
    emailVerified: typeof claims.email_verified === "boolean" ? claims.email_verified : null,
    name: typeof claims.name === "string" ? claims.name : null,
    groups: claims.groups,
  };
}
