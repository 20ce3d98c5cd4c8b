/** The reference page's files come from a fixed list, from this site only. */
import { describe, expect, it } from "vitest";
import { GET } from "@/app/api-docs/assets/[file]/route";
import { SWAGGER_ASSETS, SWAGGER_STARTER } from "@/lib/api-docs/swagger-assets";

const get = (file: string) => GET(new Request(`http://localhost:3999/api-docs/assets/${encodeURIComponent(file)}`), { params: Promise.resolve({ file }) });

describe("GET /api-docs/assets/{file}", () => {
  it("serves Swagger UI's bundle and style sheet from the installed package, with long cache headers", async () => {
    const bundle = await get("swagger-ui-bundle.js");
    expect(bundle.status).toBe(200);
    expect(bundle.headers.get("content-type")).toBe("text/javascript; charset=utf-8");
    expect(bundle.headers.get("cache-control")).toBe("public, max-age=604800");
    expect((await bundle.text()).length).toBeGreaterThan(1_000_000);
    const css = await get("swagger-ui.css");
    expect(css.headers.get("content-type")).toBe("text/css; charset=utf-8");
    expect(await css.text()).toContain(".swagger-ui");
  });

  it("serves the starter script, which loads only from this site and turns the outside validator off", async () => {
    const response = await get("start.js");
    expect(response.status).toBe(200);
    const text = await response.text();
    expect(text).toBe(SWAGGER_STARTER);
    expect(text).toContain('url: "/api/v1/openapi.json"');
    expect(text).toContain("validatorUrl: null");
    expect(text).not.toMatch(/https?:\/\//);
  });

  it.each(["../package.json", "..%2Fpackage.json", "index.html", "swagger-initializer.js", "__proto__", "constructor", "swagger-ui-bundle.js.map", ""])("answers 404 for %j", async (file) => {
    const response = await get(file);
    expect(response.status).toBe(404);
  });

  it("lists exactly three files", () => {
    expect(Object.keys(SWAGGER_ASSETS).sort()).toEqual(["start.js", "swagger-ui-bundle.js", "swagger-ui.css"]);
  });
});
