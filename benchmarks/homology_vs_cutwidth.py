import sys, time, json
import sweepwidth as sw
from sweepwidth import generators
from sweepwidth.problems.cycles import FaceSweep
T = float(sys.argv[1]); n = int(sys.argv[2]); seed = int(sys.argv[3])
P = generators.weighted_delaunay_disk(n, seed=seed)
S = frozenset(f for f in range(P.number_of_faces()) if f != P.outer_face)
fs = FaceSweep.build(P, P.face_boundary_cycle(P.outer_face), S)
G, a, b = fs.ordering_graph()
t = time.monotonic(); r = sw.cutwidth(G, first=[a], last=[b], time_limit=T); t1 = time.monotonic() - t
print(json.dumps({"direct_cutwidth": [fs.const + r.lower, fs.const + r.upper, round(t1, 2)]}), flush=True)
t = time.monotonic(); h = sw.homology_width(P, time_limit=T); t2 = time.monotonic() - t
print(json.dumps({"homology_width": [h.lower, h.upper, round(t2, 2)], "cw": h.stats["parts"][0].get("cutwidth")}), flush=True)
