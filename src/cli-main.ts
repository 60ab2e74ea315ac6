// The `walkhull` executable's body (src/cli.ts loads it, bundled or not): run a command and exit
// with its code (0 ok, 1 check failed, 2 bad input).
// process.exitCode (not process.exit) so that piped stdout is flushed before the process ends.
// `run` starts its workers and the module compile first (src/run/prestart.ts), so that they load
// while this thread loads the command code and validates the suite.
import { prestartWorkers, releaseEarly } from "./run/prestart.js";

const argv = process.argv.slice(2);
const early = prestartWorkers(argv);
const { main } = await import("./commands.js");

main(argv, early).then(
  (code) => {
    process.exitCode = code;
  },
  (e) => {
    process.stderr.write(`walkhull: internal error: ${(e as Error).stack ?? e}\n`);
    process.exitCode = 70;
  },
).finally(() => releaseEarly(early));
