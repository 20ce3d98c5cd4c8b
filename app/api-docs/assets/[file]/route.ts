import { SWAGGER_ASSETS } from "@/lib/api-docs/swagger-assets";

/** The reference page's script and style files, from a fixed list (lib/api-docs/swagger-assets.ts). */
export async function GET(_request: Request, context: { params: Promise<{ file: string }> }): Promise<Response> {
  const { file } = await context.params;
  const asset = Object.hasOwn(SWAGGER_ASSETS, file) ? SWAGGER_ASSETS[file] : undefined;
  if (!asset) return new Response("Not found.\n", { status: 404, headers: { "content-type": "text/plain; charset=utf-8" } });
  const body = await asset.read();
  return new Response(typeof body === "string" ? body : new Uint8Array(body), {
    headers: { "content-type": asset.contentType, "cache-control": asset.cacheControl, "x-content-type-options": "nosniff" },
  });
}
