// A helper thread of LawEvidenceThreads (src/verdict/law-evidence.ts): computes the limit-law
// evidence of the measures it is sent, one message each, until it is ended.
import { parentPort } from "node:worker_threads";
import { lawEvidenceOf, type LawEvidenceInput } from "./law-evidence.js";

parentPort!.on("message", (input: LawEvidenceInput) => {
  parentPort!.postMessage({ measure: input.measure, evidence: lawEvidenceOf(input) });
});
