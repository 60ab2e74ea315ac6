#!/usr/bin/env node
// The `walkhull` executable. It loads dist/bundle/cli.js when `npm run build` has made it (cli-main.ts
// and everything it imports in one file, scripts/bundle.mjs: ~0.2 s less start-up than ~300 modules
// one by one) and it is not older than cli-main.js (a tsc run alone leaves it stale), else cli-main.js.
import { bundleIsCurrent } from "./paths.js";

const bundle = new URL("./bundle/cli.js", import.meta.url);
const plain = new URL("./cli-main.js", import.meta.url);
await import(bundleIsCurrent(bundle.pathname, plain.pathname) ? bundle.href : plain.href);
