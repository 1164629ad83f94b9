// Plain-JS entry for piscina: Node 20 cannot load a .ts worker through execArgv, so this file
// loads the TypeScript worker through tsx's API instead.
import { tsImport } from "tsx/esm/api";

export default (await tsImport("./analysis-worker.ts", import.meta.url)).default;
