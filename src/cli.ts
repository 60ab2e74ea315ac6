#!/usr/bin/env node
// The `walkhull` executable. It loads dist/bundle/cli.js when `npm run build` has made it (cli-main.ts
// and everything it imports in one file, scripts/bundle.mjs: ~0.2 s less start-up than ~300 modules
// one by one), else cli-main.js and its modules.
import { statSync } from "node:fs";

const bundle = new URL("./bundle/cli.js", import.meta.url);
const plain = new URL("./cli-main.js", import.meta.url);
// Only a bundle not older than the module it was made from (a tsc run alone leaves it stale).
let current: boolean;
try {
  current = statSync(bundle).mtimeMs >= statSync(plain).mtimeMs;
} catch {
  current = false;
}
await import(current ? bundle.href : plain.href);
