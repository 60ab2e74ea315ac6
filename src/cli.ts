#!/usr/bin/env node
// The `walkhull` executable. It loads dist/bundle/cli.js when `npm run build` has made it (cli-main.ts
// and everything it imports in one file, scripts/bundle.mjs: ~0.2 s less start-up than ~300 modules
// one by one), else cli-main.js and its modules.
import { existsSync } from "node:fs";

const bundle = new URL("./bundle/cli.js", import.meta.url);
await import(existsSync(bundle) ? bundle.href : "./cli-main.js");
