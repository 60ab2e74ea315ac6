// Law-evidence bench: the CPU time of lawEvidenceOf (src/verdict/law-evidence.ts) per measure, on
// the inputs of one simulated suite (simulated once and cached in a v8-serialised file, so that
// runs before and after a change read the same inputs), and a bit-exact dump of every result
// (numbers written with their 17 significant digits, NaN, +-Infinity and -0 spelled out) to
// compare two versions with `cmp`. CPU time is this thread's process.cpuUsage (other agents share
// the cores, so wall time says little). Round 1 includes the JIT's warm-up.
// Usage: node --import tsx bench/law-evidence.ts SUITE.json [--paths N] [--rounds R] [--inputs FILE] [--out FILE]

import fs from "node:fs";
import os from "node:os";
import v8 from "node:v8";
import { runSuite } from "../src/run/run.js";
import { loadSuite } from "../src/suite/load.js";
import { lawEvidenceInput, lawEvidenceOf, type LawEvidenceInput } from "../src/verdict/law-evidence.js";

const args = process.argv.slice(2);
const file = args.find((a, i) => !a.startsWith("--") && (i === 0 || !args[i - 1].startsWith("--")));
if (!file) throw new Error("usage: law-evidence.ts SUITE.json [--paths N] [--rounds R] [--inputs FILE] [--out FILE]");
const flag = (name: string) => {
  const i = args.indexOf(name);
  return i >= 0 ? args[i + 1] : undefined;
};
const rounds = Number(flag("--rounds") ?? 3);
const inputsFile = flag("--inputs");
let inputs: LawEvidenceInput[];
if (inputsFile && fs.existsSync(inputsFile)) {
  inputs = v8.deserialize(fs.readFileSync(inputsFile)) as LawEvidenceInput[];
} else {
  const paths = flag("--paths");
  const suite = loadSuite(file, { paths: paths === undefined ? undefined : Number(paths) });
  const out = await runSuite(suite, { workers: 2, checkpoint: null, log: () => {} });
  if (out.status !== "done") throw new Error("simulation stopped");
  const sim = out.sim;
  inputs = suite.measure.map((m) => lawEvidenceInput(sim, m));
  if (inputsFile) fs.writeFileSync(inputsFile, v8.serialize(inputs));
}

const exact = (_k: string, v: unknown) => (typeof v === "number" ? (Object.is(v, -0) ? "-0" : Number.isFinite(v) ? v.toPrecision(17) : String(v)) : v);
const cpuMs = () => {
  const u = process.cpuUsage();
  return (u.user + u.system) / 1000;
};
const load0 = os.loadavg();
const dump: string[] = [];
const rows: string[] = [];
for (let r = 1; r <= rounds; r++) {
  let total = 0;
  const per: string[] = [];
  for (const input of inputs) {
    const c0 = cpuMs();
    const ev = lawEvidenceOf(input);
    const c = cpuMs() - c0;
    total += c;
    per.push(`${input.measure} ${c.toFixed(0)}`);
    if (r === 1) dump.push(JSON.stringify({ measure: input.measure, ev }, exact));
  }
  rows.push(`round ${r}: ${per.join(", ")}; total ${total.toFixed(0)} ms CPU`);
}
console.log(rows.join("\n"));
console.log(`load average ${load0.map((x) => x.toFixed(2)).join(" ")} at start, ${os.loadavg().map((x) => x.toFixed(2)).join(" ")} at end`);
const outFile = flag("--out");
if (outFile) fs.writeFileSync(outFile, dump.join("\n") + "\n");
