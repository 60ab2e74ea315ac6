#!/usr/bin/env node
// The `walkhull` executable: run a command and exit with its code (0 ok, 1 check failed, 2 bad input).
// process.exitCode (not process.exit) so that piped stdout is flushed before the process ends.
import { main } from "./commands.js";

main(process.argv.slice(2)).then(
  (code) => {
    process.exitCode = code;
  },
  (e) => {
    process.stderr.write(`walkhull: internal error: ${(e as Error).stack ?? e}\n`);
    process.exitCode = 70;
  },
);
