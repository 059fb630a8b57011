// Child-process entry when ohmbook runs from its TypeScript source (tsx, tests): registers tsx,
// then loads the real entry, bundleChild.ts. The compiled CLI forks bundleChild.js.
import { register } from "tsx/esm/api";

register();
await import("./bundleChild.ts");
