"""Each element's pressure-route lift against its vortex-impulse lift, at the default step and finer.

Usage: .venv/bin/python tools/check_element_routes.py [SCENARIO ...] [--case gust|pitching] [--halvings K]
                                                      [--chords C] [--point-cores] [--where]

Without a scenario, a case of our own: ``gust`` (default), a NACA 2412 wing of
0.25 m (30 elements) with a flat tail of 0.12 m (15 elements) 0.9 m behind it
and 0.05 m up, held at 3 degrees, through a 1-cosine gust of 25 chords, 3 m/s
(the wing's wake passes within 0.002 tail chords of the tail's vortices);
``pitching``, the validation test's case (tests/validation/test_elements_classical.py):
a wing of 20 elements and a tail of 0.48 chords (10 elements) 3 chords behind it
in the wing's wake plane, pitching together 3 degrees about 3 at k = 0.3, so that
the wake sweeps through the tail (``--chords`` default 10 there).  For each run: per element, the largest difference of the
pressure-route ``cl_<i>`` and the impulse-route lift
(:class:`unsteady.vortex.elements.ElementImpulse`) after the first five rows, in
% of that element's peak |cl_<i>|, and the rms difference, at the default step,
half of it, a quarter (``--halvings``).  ``--point-cores``: the solver without the cross
cores (``VortexSolver(cross_core=False)``: every wake meets every element through
the small core r_b), for comparison.
"""

from __future__ import annotations

import argparse

import numpy as np

from unsteady import load_scenario, simulate
from unsteady.inputs.gusts import build_gust_field
from unsteady.vortex.elements import ElementImpulse
from unsteady.vortex.solver import default_core_radii

WING = {"shape": "naca2412", "thick": False, "chord": 0.25, "elements": 30}
TAIL = {"shape": "flat", "chord": 0.12, "elements": 15, "position": [0.9, 0.05], "incidence": -2.0}


def builtin(chords, case="gust"):
    if case == "pitching":
        return {"flow": {"speed": 15.0, "density": 1.2},
                "airfoil": [{"shape": "naca2412", "chord": 0.25, "elements": 20},
                            {"shape": "flat", "chord": 0.12, "elements": 10, "position": [0.75, 0.0],
                             "incidence": -2.0}],
                "motion": {"pitch": {"law": "sine", "amplitude": 3.0, "reduced_frequency": 0.3, "mean": 3.0}},
                "run": {"chords": chords, "wake": "free"}, "output": {"plots": False}}
    return {"flow": {"speed": 15.0, "density": 1.2}, "airfoil": [WING, TAIL],
            "motion": {"pitch": {"law": "constant", "value": 3.0}},
            "gust": {"profile": "one-minus-cosine", "amplitude": 3.0, "length": 6.25, "arrival": 0.05},
            "run": {"chords": chords, "wake": "free", "far_wake": 30}, "output": {"plots": False}}


class _Routes(ElementImpulse):
    """ElementImpulse that takes the model's placed elements and the solver's cores at the start."""

    def __init__(self, sc, gust, cross):
        self.sc, self.gust_field, self.with_cross = sc, gust, cross

    def on_start(self, model):
        from unsteady.vortex.elements import cross_core_radii
        sc = self.sc
        bodies = model.body if isinstance(model.body, list) else [model.body]
        r_c, r_b = default_core_radii(bodies[0].chord, sc.speed, sc.dt)
        r_c = sc.data["run"].get("core_radius") or r_c
        super().__init__(bodies, sc.speed, sc.density, sc.dt, (r_c, r_b, cross_core_radii(bodies, r_c) if self.with_cross else None),
                         gust=self.gust_field)


def measure(raw, label, halvings, cross=True, where=False):
    base = load_scenario(raw)
    if base.data["airfoil"].get("lesp_critical") is not None:
        raise SystemExit(f"{label}: leading-edge shedding is not covered here (its soft cores are not "
                         "in ElementImpulse)")
    if base.data.get("ground"):
        raise SystemExit(f"{label}: over the ground the vortices' impulse is not the force on the elements")
    dt0 = base.dt
    for k in range(halvings + 1):
        sc = load_scenario(raw, overrides={"run.dt": dt0 / 2 ** k}) if k else load_scenario(raw)
        gust = build_gust_field(sc) if sc.data.get("gust") else None
        rec = _Routes(sc, gust, cross)
        h = simulate(sc, [rec]).history
        imp = rec.lift
        parts = []
        for b in range(imp.shape[1]):
            cl = h[f"cl_{b + 1}"]
            n = min(cl.size, imp.shape[0])
            d = cl[5:n] - imp[5:n, b]
            d = d[np.isfinite(d)]               # rows at a far-wake merge left out (ElementImpulse)
            peak = np.abs(cl[5:n]).max()
            parts.append(f"element {b + 1}: max {100 * np.abs(d).max() / peak:.2f} %, "
                         f"rms {100 * np.sqrt(np.mean(d * d)) / peak:.3f} % of peak {peak:.4f}")
        print(f"{label} dt/{2 ** k} ({sc.steps} steps): " + "; ".join(parts), flush=True)
        if where:
            for b in range(imp.shape[1]):
                d = np.nan_to_num(np.abs(h[f"cl_{b + 1}"][5:] - imp[5:h["t"].size, b]))
                worst = np.argsort(d)[-5:][::-1] + 5
                print(f"  element {b + 1} worst rows: " + ", ".join(f"{i} ({h['chords'][i]:.2f} chords, "
                                                                    f"{d[i - 5]:.4f})" for i in worst))


def main():
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("scenarios", nargs="*")
    ap.add_argument("--halvings", type=int, default=2)
    ap.add_argument("--case", choices=("gust", "pitching"), default="gust")
    ap.add_argument("--chords", type=float, default=None, help="default 40 (gust), 10 (pitching)")
    ap.add_argument("--point-cores", action="store_true")
    ap.add_argument("--where", action="store_true", help="also the five worst rows of each element")
    args = ap.parse_args()
    if args.point_cores:
        import functools
        from unsteady.vortex import solver
        solver.VortexSolver.__init__ = functools.partialmethod(solver.VortexSolver.__init__, cross_core=False)
    label = " (point cores)" if args.point_cores else ""
    if not args.scenarios:
        chords = args.chords or (10.0 if args.case == "pitching" else 40.0)
        name = "wing + tail, 1-cosine gust" if args.case == "gust" else "wing + tail pitching, tail in the wake"
        measure(builtin(chords, args.case), name + label, args.halvings, not args.point_cores, args.where)
    for path in args.scenarios:
        measure(path, path + label, args.halvings, not args.point_cores, args.where)


if __name__ == "__main__":
    main()
