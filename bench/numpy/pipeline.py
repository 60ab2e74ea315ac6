"""What a researcher would otherwise write: the same work as walkhull's pipeline in numpy + scipy.

k independent Gaussian walks (drifts as in bench/pipeline.ts, identity covariance) of n steps from
the origin; the convex hull of all points (scipy.spatial.ConvexHull, Qhull); perimeter (in 2-D
ConvexHull.area is the perimeter), area (ConvexHull.volume), diameter (largest distance between
hull vertices) and the vertex count. Prints one JSON line: {"k", "n", "paths", "nsPerStep"}.
A step moves every walk once, as in the bench. Usage: pipeline.py K N PATHS REPS [cpu]
(cpu: time with this process's CPU time instead of the wall clock, like the bench's --cpu)
"""
import json
import sys
import time

import numpy as np
from scipy.spatial import ConvexHull
from scipy.spatial.distance import pdist

DRIFTS = [(1.0, 0.0), (0.0, 1.0), (-1.0, 0.0), (0.0, -1.0)]


def one_path(rng, k, n):
    walks = [np.zeros((1, 2))]
    for j in range(k):
        steps = rng.standard_normal((n, 2)) + np.asarray(DRIFTS[j])
        walks.append(np.cumsum(steps, axis=0))
    pts = np.vstack(walks)
    hull = ConvexHull(pts)
    verts = pts[hull.vertices]
    return hull.area, pdist(verts).max(), hull.volume, len(hull.vertices)


def main():
    k, n, paths, reps = (int(a) for a in sys.argv[1:5])
    clock = time.process_time if sys.argv[5:6] == ["cpu"] else time.perf_counter
    rng = np.random.default_rng(1)
    for _ in range(max(1, paths // 4)):
        one_path(rng, k, n)
    total = 0.0
    for _ in range(reps):
        t0 = clock()
        for _ in range(paths):
            one_path(rng, k, n)
        total += clock() - t0
    print(json.dumps({"k": k, "n": n, "paths": paths, "nsPerStep": total / reps * 1e9 / (paths * n)}))


if __name__ == "__main__":
    main()
