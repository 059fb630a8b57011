// Worker-thread entry when ohmbook runs from its TypeScript source (tsx, tests): registers tsx in
// this thread, then loads the real entry, analyseWorker.ts. The compiled CLI uses analyseWorker.js.
import { register } from "tsx/esm/api";

register();
const { default: analyse } = await import("./analyseWorker.ts");
export default analyse;
