// The worker pool's thread entry (plain JavaScript, so Node loads it as it is, in development, tests
// and the production build alike): tsx compiles the TypeScript tasks it imports, once per thread.
// Both of tsx's hooks are needed: the project's .ts files load as CommonJS (package.json has no
// "type"), and some of them reach ES modules.
import { register as registerCommonJs } from "tsx/cjs/api";
import { register as registerEsm } from "tsx/esm/api";

registerCommonJs();
registerEsm();
const tasks = await import("./heavy-tasks.ts");
const runHeavyTask = tasks.runHeavyTask ?? tasks.default.runHeavyTask;

export default runHeavyTask;
