// Wilson score interval for a binomial proportion (e.g. the rejection rate of a calibration run).
//
// Method: Wilson, "Probable inference, the law of succession, and statistical inference", JASA 22
// (1927) 209-212: centre (x + z^2/2)/(n + z^2), half-width z sqrt(x(n-x)/n + z^2/4)/(n + z^2),
// z = Phi^{-1}(1 - (1 - level)/2). Cost O(1).
// Example: wilsonInterval(0, 100, 0.95) = [0, 0.03699]; wilsonInterval(5, 100, 0.95) = [0.02154, 0.11175].

import { normalQuantile } from "./normal.js";

export function wilsonInterval(successes: number, trials: number, level = 0.95): [number, number] {
  if (!(Number.isInteger(trials) && trials > 0)) throw new Error(`trials: must be a positive integer, got ${trials}`);
  if (!(Number.isInteger(successes) && successes >= 0 && successes <= trials))
    throw new Error(`successes: must be an integer in [0, ${trials}], got ${successes}`);
  if (!(level > 0 && level < 1)) throw new Error(`level: must be in (0, 1), got ${level}`);
  const z = normalQuantile(1 - (1 - level) / 2);
  const z2 = z * z;
  const centre = (successes + z2 / 2) / (trials + z2);
  const half = (z * Math.sqrt((successes * (trials - successes)) / trials + z2 / 4)) / (trials + z2);
  return [Math.max(0, centre - half), Math.min(1, centre + half)];
}
