/**
 * The files the reference page (/api-docs) loads, all served by Headroom itself: Swagger UI's
 * script and style sheet from the installed swagger-ui-dist package, and the page's own starter
 * script (an external file: the pages' Content-Security-Policy allows no inline script). A fixed
 * list: a name not on it is not found, so no path from the URL ever reaches the file system.
 */
import fs from "node:fs/promises";
import path from "node:path";

/** Starts Swagger UI on the document; loads the bundle first (a script a trusted script adds is trusted under 'strict-dynamic'). */
export const SWAGGER_STARTER = `(function () {
  "use strict";
  function start() {
    window.SwaggerUIBundle({
      url: "/api/v1/openapi.json",
      dom_id: "#swagger-ui",
      deepLinking: true,
      docExpansion: "none",
      defaultModelsExpandDepth: 0,
      displayRequestDuration: true,
      // "Try it out" calls this same site; the browser sends the session cookie itself.
      withCredentials: true,
      // No badge from an outside validator service: nothing loads from another host.
      validatorUrl: null,
      presets: [window.SwaggerUIBundle.presets.apis],
      layout: "BaseLayout",
    });
  }
  if (window.SwaggerUIBundle) return start();
  var bundle = document.createElement("script");
  bundle.src = "/api-docs/assets/swagger-ui-bundle.js";
  bundle.onload = start;
  bundle.onerror = function () {
    var target = document.getElementById("swagger-ui");
    if (target) target.textContent = "The reference viewer could not be loaded. The document itself is at /api/v1/openapi.json.";
  };
  document.head.appendChild(bundle);
})();
`;

type Asset = { contentType: string; cacheControl: string; read: () => Promise<string | Buffer> };

const LONG = "public, max-age=604800";

function fromPackage(name: string): () => Promise<Buffer> {
  // process.cwd() is the app's folder under `next start`, `next dev` and the tests alike.
  return () => fs.readFile(path.join(process.cwd(), "node_modules", "swagger-ui-dist", name));
}

export const SWAGGER_ASSETS: Record<string, Asset> = {
  "swagger-ui-bundle.js": { contentType: "text/javascript; charset=utf-8", cacheControl: LONG, read: fromPackage("swagger-ui-bundle.js") },
  "swagger-ui.css": { contentType: "text/css; charset=utf-8", cacheControl: LONG, read: fromPackage("swagger-ui.css") },
  "start.js": { contentType: "text/javascript; charset=utf-8", cacheControl: "public, max-age=300", read: async () => SWAGGER_STARTER },
};
