// Walk generation: the steps of every walk of one path, their positions (PX/PY, walk-major) and
// cumulative moments per grid point (segSums), and the control values read from them.

import { fillNormals, nextSubstream } from "./rng";
import { drawStepsInto, LAW_GAUSSIAN } from "./laws";
import { clearSegSums, controlAt, drift, G, gridAt, K, lawCode, lawParams, N, NZ, PX, PY, segSums, SX, SY, walkPoint } from "./setup";

/** Draws the steps of every walk of one path into PX/PY and their cumulative moments into segSums. */
export function generateWalks(): void {
  clearSegSums();
  for (let j = 0; j < K; j++) {
    nextSubstream();
    const code = lawCode(j);
    const params = lawParams(j);
    // Gaussian steps are formed from the normals inside the position loop (one pass fewer),
    // with the same arithmetic as drawStepsInto.
    const gauss = code == LAW_GAUSSIAN;
    let mx = 0.0, my = 0.0, l11 = 0.0, l21 = 0.0, l22 = 0.0;
    if (gauss) {
      fillNormals(NZ, N << 1);
      mx = load<f64>(params); my = load<f64>(params + 8);
      l11 = load<f64>(params + 16); l21 = load<f64>(params + 24); l22 = load<f64>(params + 32);
    } else {
      drawStepsInto(code, params, N, SX, SY, NZ);
    }
    const px = PX + (<usize>walkPoint(j, 0) << 3), py = PY + (<usize>walkPoint(j, 0) << 3);
    let x = 0.0, y = 0.0;
    store<f64>(px, 0.0);
    store<f64>(py, 0.0);
    let i = 0;
    let sx = 0.0, sy = 0.0, sxx = 0.0, sxy = 0.0, syy = 0.0; // cumulative over the walk
    for (let g = 0; g < G; g++) {
      const hi = gridAt(g);
      for (; i < hi; i++) {
        if (gauss) {
          const z1 = load<f64>(NZ + (<usize>i << 4));
          const z2 = load<f64>(NZ + (<usize>i << 4) + 8);
          x += mx + l11 * z1;
          y += my + (l21 * z1 + l22 * z2);
        } else {
          x += load<f64>(SX + (<usize>i << 3));
          y += load<f64>(SY + (<usize>i << 3));
        }
        store<f64>(px + (<usize>(i + 1) << 3), x);
        store<f64>(py + (<usize>(i + 1) << 3), y);
        sx += x; sy += y; sxx += x * x; sxy += x * y; syy += y * y;
      }
      const o = segSums(j, g);
      store<f64>(o, sx);
      store<f64>(o + 8, sy);
      store<f64>(o + 16, sxx);
      store<f64>(o + 24, sxy);
      store<f64>(o + 32, syy);
    }
  }
}

/**
 * Writes the control values of grid point g (step count n = hi) for every walk j into ctl:
 * the centred endpoint X = S_n - n mu and the centred integrated path Y = sum_{i<=n} S_i -
 * mu n(n+1)/2 (both with mean 0 exactly; their covariances follow from the step covariance),
 * laid out [g][walk][Xx, Xy, Yx, Yy] (controlAt).
 */
export function writeControls(ctl: usize, g: i32, hi: i32): void {
  const fn = <f64>hi;
  const tri = 0.5 * fn * (fn + 1.0);
  for (let j = 0; j < K; j++) {
    const mx = drift(j, 0), my = drift(j, 1);
    const at = <usize>walkPoint(j, hi) << 3;
    const o = segSums(j, g);
    const r = controlAt(ctl, g, j);
    store<f64>(r, load<f64>(PX + at) - fn * mx);
    store<f64>(r + 8, load<f64>(PY + at) - fn * my);
    store<f64>(r + 16, load<f64>(o) - tri * mx);
    store<f64>(r + 24, load<f64>(o + 8) - tri * my);
  }
}
