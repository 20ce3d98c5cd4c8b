import type { Metadata } from "next";
import { headers } from "next/headers";
import Link from "next/link";
import { Caution } from "@/components/ui/caution";

export const metadata: Metadata = { title: "API reference" };

/**
 * The API reference: Swagger UI over /api/v1/openapi.json, every file from this site. Public like
 * the document itself: it shows how the API works, never data; "Try it out" uses the reader's own
 * session, so it answers only what their role may see.
 */
export default async function ApiDocsPage() {
  // The proxy puts this response's nonce in the request's policy (proxy.ts); the starter script needs it.
  const policy = (await headers()).get("content-security-policy") ?? "";
  const nonce = /'nonce-([^']+)'/.exec(policy)?.[1];
  return (
    <div className="min-h-screen bg-white">
      {/* Swagger UI's own style sheet, served by this site (lib/api-docs/swagger-assets.ts), not part of the app's bundle. */}
      {/* eslint-disable-next-line @next/next/no-css-tags */}
      <link rel="stylesheet" href="/api-docs/assets/swagger-ui.css" precedence="default" />
      <header className="border-b border-ink-200 bg-ink-50">
        <div className="mx-auto max-w-6xl space-y-3 px-5 py-5">
          <p className="text-sm">
            <Link href="/" className="text-accent-700 hover:underline">
              Headroom
            </Link>
          </p>
          <h1 className="text-2xl font-semibold text-ink-900">API reference</h1>
          <p className="max-w-3xl text-sm text-ink-700">
            Every route under <code>/api/v1</code>, with who may call it, what it takes and what it answers. The same description as JSON, for code
            generators and tests: <a href="/api/v1/openapi.json" className="text-accent-700 hover:underline">/api/v1/openapi.json</a> (OpenAPI 3.1).
          </p>
          <p className="max-w-3xl text-sm text-ink-700">
            &ldquo;Try it out&rdquo; sends real requests to this Headroom with your session: sign in first, and remember that writes change real records.
            Logger gateways use an API key instead (&ldquo;Authorize&rdquo;, then <code>hrk_…</code>).
          </p>
          <Caution className="max-w-3xl" />
        </div>
      </header>
      <main className="mx-auto max-w-6xl px-2 pb-10">
        <div id="swagger-ui">
          <p className="px-3 py-6 text-sm text-ink-600">Loading the reference…</p>
        </div>
      </main>
      <script src="/api-docs/assets/start.js" async nonce={nonce} />
    </div>
  );
}
