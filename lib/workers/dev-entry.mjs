// The worker threads' entry outside production: registers tsx in this thread (TypeScript, the `@/`
// paths of tsconfig.json), then loads lib/workers/worker.ts. The pool starts the thread with
// `--conditions=react-server`, under which `import "server-only"` is a no-op.
import { register as registerCommonJs } from "tsx/cjs/api";
import { register as registerEsm } from "tsx/esm/api";

registerCommonJs();
registerEsm();
const loaded = await import("./worker.ts");
// The project's .ts files are CommonJS to Node: the module's exports arrive as `default`.
const run = typeof loaded.default === "function" ? loaded.default : loaded.default.default;

export default run;
