// The path loop: one block of paths, k walks from the origin, hulls at every n of the grid along
// one path. Per grid segment (n_{g-1}, n_g]: candidates = previous hull vertices + the new points
// of every walk; a conservative point filter drops new points strictly inside the polygon of 8
// extreme points of their walk's segment; a second pass filters the survivors again (k > 1:
// against the octagon of all candidates in the joint frame; k = 1: in the walk's frame rotated by
// pi/8); the survivors are sorted and chained (hull(prefix n_g) = hull(hull(prefix n_{g-1}) + new
// points)). All buffers are allocated once in setup (setup.ts) and reused for every path.

import { append, candCount, clearCandidates, filterSecondPass, gatherAndFilter } from "./filters";
import { monotoneChain, sortPoints } from "./hull";
import { writeMeasures } from "./measures";
import { controlBytes, CX, CY, G, gridAt, HX, HY, K, PX, PY, recordAt, recordBytes, segSums, setFrameFromSums, walkPoint } from "./setup";
import { generateWalks, writeControls } from "./walks";

/** Vertex count of the hull in HX/HY. */
export let hullCount: i32 = 0;

/** Hull of the current candidates into HX/HY; returns the vertex count. */
export function chainCandidates(): i32 {
  const n = candCount;
  sortPoints(CX, CY, 0, n - 1);
  hullCount = monotoneChain(CX, CY, n, HX, HY);
  return hullCount;
}

/** Forgets the current hull (a path's first grid point starts from the origin). */
export function clearHull(): void {
  hullCount = 0;
}

/**
 * The candidates of grid point g (n = hi, previous n = prev) after both filter passes: the
 * previous hull (or the origin) and each walk's new points filtered in that walk's own frame (so
 * k needles pointing different ways are each filtered well: a point strictly inside one walk's
 * hull is strictly inside the hull of all walks).
 */
export function filterStep(g: i32, prev: i32, hi: i32): void {
  clearCandidates();
  if (g == 0) append(PX, PY, 0, 1); // the origin, once
  else append(HX, HY, 0, hullCount);
  for (let j = 0; j < K; j++) {
    setFrameFromSums(<f64>(1 + hi), segSums(j, g));
    gatherAndFilter(PX, PY, walkPoint(j, prev + 1), walkPoint(j, hi + 1));
  }
  filterSecondPass(g, hi);
}

/** Simulates one path: the measures per grid point into the record at out, the controls into ctl. */
export function runPath(out: usize, ctl: usize): void {
  generateWalks();
  let prev = 0;
  for (let g = 0; g < G; g++) {
    const hi = gridAt(g);
    filterStep(g, prev, hi);
    writeMeasures(recordAt(out, g), HX, HY, chainCandidates());
    writeControls(ctl, g, hi);
    prev = hi;
  }
}

/** Runs `count` paths of the current block stream into out (count records) and ctl (count control records). */
export function runPaths(count: i32, out: usize, ctl: usize): void {
  const rec = recordBytes();
  const crec = controlBytes();
  for (let p = 0; p < count; p++) runPath(out + <usize>p * rec, ctl + <usize>p * crec);
}

export function pointsXPtr(): usize { return PX; }
export function pointsYPtr(): usize { return PY; }
export function hullXPtr(): usize { return HX; }
export function hullYPtr(): usize { return HY; }
export function getHullCount(): i32 { return hullCount; }
