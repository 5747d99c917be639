"""The vortex time step as stages: the bordered solve, the stage order, site indices, several bodies."""

import math
import re

import numpy as np
import pytest

from unsteady.vortex.bodies import Body, BodyPoints, RigidCamber
from unsteady.vortex.sites import SheddingSite, TrailingEdgeSite
from unsteady.vortex.solver import VortexSolver
from unsteady.vortex.system import solve_bordered

U, C, DT = 10.0, 0.2, 0.2 / (10.0 * 16)


def plate(n=16, lift=0.0, camber=0.0):
    """A flat (or parabolic-cambered) plate of chord C, pitching about its quarter chord."""
    x = 0.5 * (1.0 - np.cos(np.pi * np.arange(n + 1) / n))
    return Body.from_nodes(x, 4.0 * camber * x * (1.0 - x) + lift, C, 0.25)


class Pitch:
    """Constant pitch with a slow sine on top (radians)."""

    def __init__(self, alpha=0.05, amp=0.02, omega=20.0):
        self.alpha, self.amp, self.omega = alpha, amp, omega

    def state(self, t):
        return (self.alpha + self.amp * math.sin(self.omega * t),
                self.amp * self.omega * math.cos(self.omega * t), 0.0, 0.0)

    def after_step(self, t, dt, loads):
        pass


class Keep:
    """Observer that keeps copies of what it is shown."""

    def __init__(self):
        self.states = []

    def on_step(self, s):
        self.states.append({"gamma_bound": s.gamma_bound.copy(), "gamma_wake": s.gamma_wake.copy(),
                            "wake_site": s.wake_site.copy(), "far_gamma": s.far_gamma.copy(),
                            "far_site": s.far_site.copy(), "start": s.extra["gamma_start"],
                            "cl": s.loads["cl"], "body_cl": [r["cl"] for r in s.body_loads]})


class FixedStrengthSite(SheddingSite):
    """Test site: every ``every`` steps a vortex of fixed strength at a fixed body point.

    Its row fixes its own strength (c = 0, d = 1 on itself); the body's
    trailing-edge site then sheds whatever keeps Kelvin's theorem.
    """

    def __init__(self, body, xi, zeta, gamma, every):
        super().__init__(body)
        self.xi, self.zeta, self.gamma, self.every = xi, zeta, gamma, every
        self.shed_steps = []

    def locate(self, step):
        a, h = step.alpha, step.h
        self.x = self.xi * math.cos(a) + self.zeta * math.sin(a)
        self.z = h - self.xi * math.sin(a) + self.zeta * math.cos(a)

    def sheds(self, step):
        return step.n > 0 and step.n % self.every == 0

    def propose(self, step):
        self.shed_steps.append(step.n)
        return self.x, self.z

    def border_row(self, step, proposals):
        d = [1.0 if p.site is self else 0.0 for p in proposals]
        return np.zeros(self.solver.system.n), d, self.gamma


# -- the bordered solve -----------------------------------------------------
@pytest.mark.parametrize("k", [1, 2, 3])
def test_bordered_solve_matches_full_system(k):
    # Schur-complement block elimination (Golub & Van Loan, Matrix Computations,
    # 4th ed., sec. 3.2.10) against numpy.linalg.solve of the assembled system
    rng = np.random.default_rng(10 + k)
    N = 24
    A = rng.normal(size=(N, N)) + N * np.eye(N)
    B = rng.normal(size=(N, k))
    Cm = rng.normal(size=(k, N))
    D = rng.normal(size=(k, k)) + 3.0 * N * np.eye(k)
    r, e = rng.normal(size=N), rng.normal(size=k)
    a_inv = np.linalg.inv(A)
    g, s = solve_bordered(a_inv, list(Cm @ a_inv), list(B.T.copy()), D, r, e)
    full = np.linalg.solve(np.block([[A, B], [Cm, D]]), np.concatenate([r, e]))
    assert np.allclose(g, full[:N], rtol=0, atol=1e-13 * np.abs(full).max())
    assert np.allclose(np.asarray(s), full[N:], rtol=0, atol=1e-13 * np.abs(full).max())


def test_bordered_solve_without_border_is_the_body_solve():
    rng = np.random.default_rng(3)
    A = rng.normal(size=(8, 8)) + 8 * np.eye(8)
    r = rng.normal(size=8)
    g, s = solve_bordered(np.linalg.inv(A), [], [], [], r, [])
    assert len(s) == 0 and np.allclose(A @ g, r, atol=1e-13)


# -- the stage order ----------------------------------------------------------
class RecordingSite(TrailingEdgeSite):
    def __init__(self, log):
        super().__init__(0, 0.3)
        self.log = log

    def locate(self, step):
        self.log.append("locate")
        super().locate(step)

    def sheds(self, step):
        self.log.append("sheds")
        return super().sheds(step)

    def propose(self, step):
        self.log.append("propose")
        return super().propose(step)

    def border_row(self, step, proposals):
        self.log.append("border_row")
        return super().border_row(step, proposals)

    def commit(self, step):
        self.log.append("commit")
        super().commit(step)


class RecordingSolver(VortexSolver):
    pass


def _recording(name):
    def stage(self, s):
        self.log.append(name)
        getattr(VortexSolver, name)(self, s)
    return stage


for _name in VortexSolver.STAGES:
    setattr(RecordingSolver, _name, _recording(_name))


class RecordingObserver:
    def __init__(self, log):
        self.log = log

    def on_start(self, solver):
        self.log.append("on_start")

    def on_step(self, s):
        self.log.append("on_step")

    def on_end(self, solver):
        self.log.append("on_end")


def test_stages_run_in_the_documented_order():
    log = []
    sv = RecordingSolver(plate(), Pitch(), speed=U, density=1.2, dt=DT, steps=2, sites=[RecordingSite(log)])
    sv.log = log
    sv.run([RecordingObserver(log)])
    first = ["_place", "locate", "_air_velocities", "_shed", "sheds", "_solve", "commit",
             "_loads", "_observe", "on_step", "_convect", "_far_wake"]
    later = ["_place", "locate", "_air_velocities", "_shed", "sheds", "propose", "_solve", "border_row",
             "commit", "_loads", "_observe", "on_step"]
    assert log == ["on_start"] + first + later + ["_convect", "_far_wake"] + later + ["on_end"]
    # the class docstring numbers the stages in the same order
    documented = re.findall(r"^\s+\d\. ``(_\w+)``", VortexSolver.__doc__, flags=re.M)
    assert tuple(documented) == VortexSolver.STAGES


# -- site indices, several sites ------------------------------------------------
def _two_site_run(far_wake=None, chords=6.0, wake="frozen"):
    steps = int(round(chords * C / (U * DT)))
    extra = FixedStrengthSite(0, -0.05, 0.2 * C, 0.01 * U * C, every=3)
    keep = Keep()
    sv = VortexSolver(plate(), Pitch(), speed=U, density=1.2, dt=DT, steps=steps, wake=wake,
                      start="impulsive", far_wake=far_wake, sites=[TrailingEdgeSite(0), extra])
    sv.run([keep])
    return sv, extra, keep.states


def test_every_wake_vortex_carries_the_index_of_its_site():
    sv, extra, states = _two_site_run()
    last = states[-1]
    site = last["wake_site"]
    assert set(np.unique(site)) == {0, 1}
    # the fixed-strength site's vortices: as many as it shed, each of its strength
    assert (site == 1).sum() == len(extra.shed_steps)
    assert np.all(last["gamma_wake"][site == 1] == extra.gamma)
    # the trailing edge sheds every step after the first
    assert (site == 0).sum() == len(states) - 1
    # Kelvin's theorem: bound + wake stays zero after an impulsive start (round-off)
    for st in states:
        total = st["gamma_bound"].sum() + st["gamma_wake"].sum()
        assert abs(total) < 1e-13 * U * C * (len(st["gamma_wake"]) + 1)


def test_far_wake_lumps_keep_their_site_and_each_sites_circulation():
    sv, extra, states = _two_site_run(far_wake=1.5, chords=8.0, wake="free")
    last = states[-1]
    assert set(np.unique(last["far_site"])) == {0, 1}
    # per site, wake + lumps hold what the site shed (the fixed site: count x strength)
    shed_1 = len(extra.shed_steps) * extra.gamma
    held_1 = last["gamma_wake"][last["wake_site"] == 1].sum() + last["far_gamma"][last["far_site"] == 1].sum()
    assert held_1 == pytest.approx(shed_1, rel=1e-12)
    total = last["gamma_bound"].sum() + last["gamma_wake"].sum() + last["far_gamma"].sum()
    assert abs(total) < 1e-12 * U * C


# -- several bodies, refactoring ------------------------------------------------
def test_two_bodies_far_apart_act_as_one_each():
    # two plates 2000 chords apart (one above the other): each sheds its own wake
    # and keeps its own circulation, and each lifts as if alone (the other's
    # influence ~ c / d, common practice: far field of a vortex pair)
    steps = 60
    kw = dict(speed=U, density=1.2, dt=DT, steps=steps, wake="free", start="impulsive")
    alone, both = Keep(), Keep()
    VortexSolver(plate(), Pitch(amp=0.0), **kw).run([alone])
    sv = VortexSolver([plate(), plate(lift=2000.0)], Pitch(amp=0.0), **kw)
    sv.run([both])
    last = both.states[-1]
    n0 = sv.system.slices[0]
    n1 = sv.system.slices[1]
    for b, sl in enumerate((n0, n1)):
        total = last["gamma_bound"][sl].sum() + last["gamma_wake"][last["wake_site"] == b].sum()
        assert abs(total) < 1e-13 * U * C * steps
    assert (last["wake_site"] == 1).sum() == steps
    cl_alone = np.array([s["cl"] for s in alone.states[1:]])
    cl_both = np.array([s["body_cl"] for s in both.states[1:]])
    assert np.allclose(cl_both[:, 0], cl_alone, rtol=1e-4)
    assert np.allclose(cl_both[:, 1], cl_alone, rtol=1e-4)


class MorphingPlate(RigidCamber):
    """Test body: flat until t_change, then cambered (its points move once in the body frame)."""

    def __init__(self, t_change):
        super().__init__(plate())
        self.t_change = t_change
        b = plate(camber=0.04)
        self._after = BodyPoints(b.xi_v, b.zeta_v, b.xi_c, b.zeta_c, b.nc_xi, b.nc_zeta)
        self.swapped = False

    def points(self, t):
        return self._after if t > self.t_change else self._points

    def changed(self, t):
        if t > self.t_change and not self.swapped:
            self.swapped = True
            return True
        return False


def test_a_body_that_moves_in_its_frame_is_refactored_once_and_kelvin_holds():
    keep = Keep()
    sv = VortexSolver(MorphingPlate(t_change=20 * DT), Pitch(), speed=U, density=1.2, dt=DT,
                      steps=40, wake="frozen", start="impulsive")
    sv.run([keep])
    assert sv.system.version == 2
    for st in keep.states:
        assert abs(st["gamma_bound"].sum() + st["gamma_wake"].sum()) < 1e-13 * U * C * 40
    # the camber raises the bound circulation's magnitude (more lift) once it appears
    assert abs(keep.states[30]["gamma_bound"].sum()) > abs(keep.states[19]["gamma_bound"].sum())


def test_kelvin_holds_for_a_steady_start_with_far_wake():
    keep = Keep()
    VortexSolver(plate(), Pitch(), speed=U, density=1.2, dt=DT, steps=200, wake="free",
                 far_wake=2.0).run([keep])
    assert len(keep.states[-1]["far_gamma"]) > 0
    for st in keep.states:
        total = st["gamma_bound"].sum() + st["gamma_wake"].sum() + st["far_gamma"].sum() + st["start"]
        assert abs(total) < 1e-12 * U * C


def test_each_body_needs_exactly_one_kelvin_site():
    with pytest.raises(ValueError, match="body 0 has 0 Kelvin sites"):
        VortexSolver(plate(), Pitch(), speed=U, density=1.2, dt=DT, steps=2,
                     sites=[FixedStrengthSite(0, 0.0, 0.1, 0.1, 2)])
    with pytest.raises(ValueError, match="body 1 has 2 Kelvin sites"):
        VortexSolver([plate(), plate(lift=5.0)], Pitch(), speed=U, density=1.2, dt=DT, steps=2,
                     sites=[TrailingEdgeSite(0), TrailingEdgeSite(1), TrailingEdgeSite(1)])
    with pytest.raises(ValueError, match="names body 3"):
        VortexSolver(plate(), Pitch(), speed=U, density=1.2, dt=DT, steps=2, sites=[TrailingEdgeSite(3)])


def test_solver_module_still_exports_the_public_names():
    from unsteady.vortex import solver
    for name in ("VortexSolver", "StepState", "SolverDiverged", "default_core_radii", "to_inertial",
                 "rotate", "build_body", "Body"):
        assert hasattr(solver, name), name
    assert solver.Body is Body
