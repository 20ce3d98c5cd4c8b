/**
 * Bundles the worker threads' entry (`lib/workers/worker.ts`) into one ES module that plain Node
 * loads under `next start`: our TypeScript with its `@/` imports compiled in, `import "server-only"`
 * resolved as under React's server condition (to nothing), every package left to node_modules.
 *
 * `npm run build` and `npm run demo` run it after `next build` (which empties `.next/`); outside
 * production the pool loads the TypeScript through tsx instead (lib/workers/dev-entry.mjs).
 * Run by hand: `npx tsx scripts/build-workers.ts`.
 */
import path from "node:path";
import { pathToFileURL } from "node:url";
import { build, type Plugin } from "esbuild";

export const WORKER_BUNDLE = path.join(".next", "workers", "worker.mjs");

/** `import "server-only"` throws outside React's server condition; in the worker it is a no-op. */
const serverOnly: Plugin = {
  name: "server-only",
  setup(builder) {
    builder.onResolve({ filter: /^server-only$/ }, () => ({ path: "server-only", namespace: "empty-module" }));
    builder.onLoad({ filter: /.*/, namespace: "empty-module" }, () => ({ contents: "export {};", loader: "js" }));
  },
};

/** Writes the bundle to `outFile` (relative to the project root); resolves with its absolute path. */
export async function buildWorkerBundle(outFile: string = WORKER_BUNDLE, root: string = process.cwd()): Promise<string> {
  const target = path.resolve(root, outFile);
  await build({
    absWorkingDir: root,
    entryPoints: [path.join(root, "lib/workers/worker.ts")],
    outfile: target,
    bundle: true,
    platform: "node",
    format: "esm",
    target: "node20",
    conditions: ["react-server"],
    tsconfig: path.join(root, "tsconfig.json"),
    // Packages (better-sqlite3 with its native addon, exceljs, pino, drizzle-orm, zod, …) load from
    // node_modules as the server loads them; only the app's own code is bundled.
    packages: "external",
    plugins: [serverOnly],
    // Error classes travel between threads by their registered key, but names read better in logs.
    keepNames: true,
    sourcemap: "linked",
    logLevel: "warning",
    // Packages in CommonJS that the bundle requires (rare) get a require function.
    banner: { js: 'import { createRequire as __createRequire } from "node:module"; const require = __createRequire(import.meta.url);' },
  });
  return target;
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? "").href) {
  buildWorkerBundle().then(
    (file) => console.log(`[headroom] worker bundle written to ${path.relative(process.cwd(), file)}`),
    (error) => {
      console.error(error);
      process.exit(1);
    },
  );
}
