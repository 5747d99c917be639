"""Run models, chosen by ``[run] model``: the contract every model follows, its registry, the vortex and linear models."""

from __future__ import annotations

import numpy as np

from ..core.errors import RunStopped
from ..dynamics.heave import HeaveMotion
from ..inputs import scenario
from ..inputs.gusts import build_gust_field
from ..inputs.sections import camber_elements
from ..inputs.elements import lesp_criticals, sheds_anywhere
from ..linear import model as linear
from ..linear.model import _gust_series, linear_loads, section_constants
from ..vortex.bodies import as_body_models
from ..vortex.flap import build_flap_body, hinge_nodes
from ..vortex.elements import build_elements
from ..vortex.ground import Ground
from ..vortex.loads import backward_derivative
from ..vortex.flap_panels import build_flap_surface
from ..vortex.panels import build_surface
from ..vortex.solver import (LeadingEdgeSite, SolverDiverged, StepState, TrailingEdgeSite, VortexSolver,
                             build_body)
from .observers import Rows

__all__ = ["Model", "MODELS", "register_model", "get", "VortexModel", "LinearModel",
           "linear_heave_marcher"]

#: name -> Model subclass
MODELS = {}


def register_model(name):
    """Class decorator: register a :class:`Model` subclass as ``[run] model = name``.

    Raises
    ------
    ValueError
        When ``name`` is not in :data:`unsteady.inputs.scenario.RUN_MODELS`
        (the scenario check would refuse it).
    """
    if name not in scenario.RUN_MODELS:
        raise ValueError(f"model {name!r} is not an allowed value of [run] model; "
                         f"add it to unsteady.inputs.scenario.RUN_MODELS")

    def deco(cls):
        cls.name = name
        MODELS[name] = cls
        return cls
    return deco


def get(name):
    """The :class:`Model` subclass registered as ``name``.

    Raises
    ------
    KeyError
        With the registered names, when ``name`` is not one of them.
    """
    try:
        return MODELS[name]
    except KeyError:
        raise KeyError(f"no run model {name!r}; registered: {', '.join(sorted(MODELS))}") from None


class Model:
    """A run model: one way of marching a scenario in time (``[run] model``).

    The runner (:func:`unsteady.simulation.runner.simulate`) builds the gust
    field and the motion, then the model, trims the free heave on the
    model's steady lift, marches the model through :meth:`run` with its
    observers and finishes the history and the summary in one way for
    every model.

    Rules for a model (a subclass; :class:`VortexModel` and
    :class:`LinearModel` follow them):

    1. Register the class with ``@register_model("name")``.  The name must
       be one of :data:`unsteady.inputs.scenario.RUN_MODELS`, so that the
       scenario check accepts ``[run] model = "name"`` and refuses other
       names before anything runs.
    2. ``__init__(sc, gust, motion)`` takes the checked scenario, the gust
       field (:class:`~unsteady.inputs.gusts.GustField`, or None) and the
       motion (``state(t) -> (alpha, alpha_dot, h, h_dot)`` and
       ``after_step(t, dt, loads)``; a
       :class:`~unsteady.dynamics.heave.HeaveMotion` with ``[aircraft]``),
       and calls ``super().__init__(sc, gust, motion)``.  It may prepare
       what the march needs (geometry, tables) but marches nothing and asks
       the motion for no state: the heave is trimmed after the model is
       built.  The scenario check has refused bad input already; trust it.
    3. ``steady_cl(alpha, alpha_dot) -> float`` is the lift coefficient of
       the settled flow at t = 0 at pitch ``alpha`` (rad, nose-up) and
       pitch rate ``alpha_dot`` (rad/s), without heave: in still air, or in
       the gust field as it stands at t = 0 where the airfoil is inside a
       gust then (:attr:`~unsteady.inputs.gusts.GustField.present_at_start`:
       turbulence), the flow the model's steady start begins from.  The
       heave trim calls it a few times before the march, so the run starts
       level (n = 1) in both cases.
    4. ``_march(observers)`` marches the rows n = 0 .. ``sc.steps`` in
       order, in one of two ways:

       a. row by row: build a state with the fields of
          :class:`~unsteady.vortex.solver.StepState` (arrays the model does
          not have are empty), call ``on_step(state)`` of every observer in
          the order given, then ``motion.after_step(t, dt, state.loads)``;
       b. all rows in one pass: hand them over once with
          :meth:`deliver_rows` (an :class:`~unsteady.simulation.observers.Rows`
          block); the model advances the motion itself, by ``after_step``
          per row or by a compiled step followed by the motion's
          ``take_rows``.

       ``loads`` carries ``cl``, ``cd``, ``cm``, ``cm_pivot``,
       ``cl_impulse``, ``cd_impulse``, ``cm_impulse``, ``gamma_bound_m2_s``,
       ``gamma_wake_m2_s`` (a block also ``wake_vortices``) and the model's
       own :attr:`COLUMNS`.  When the state stops being finite, raise
       :class:`~unsteady.vortex.solver.SolverDiverged`: the rows delivered
       before it stay, and the run ends with ``Result.error`` set.
    5. ``COLUMNS`` (a class attribute) names the history columns the model
       writes beyond ``BASE_COLUMNS + EXTRA_COLUMNS`` of
       :mod:`unsteady.simulation.observers` (all of which it writes).
    6. ``summary() -> dict`` gives the model's own summary keys (time step,
       start, wake options); ``snapshot_extras() -> dict`` what it adds to
       ``Result.snapshots`` (default: nothing).
    7. ``quasi_steady_cl(alpha_eff, height) -> array or None`` (optional):
       the model's own steady lift at the effective angles ``alpha_eff``
       (rad) with the pitch axis at heights ``height`` (m), for a body whose
       steady lift thin-airfoil theory does not give (thick, several
       elements, a ground); None (the default) keeps 2 pi (alpha_eff -
       alpha_L0) (:func:`unsteady.analysis.lag.add_quasi_steady`).
    8. With free heave, ``heave_apparent_mass(alpha) -> float`` is the
       model's own apparent mass in heave (kg/m per span: the part -A h''
       of its lift) and ``rate_difference(values, dt)`` the difference of
       the heave rate its loads take that h'' from (the last of a short
       history, oldest first); the runner hands both to the heave after the
       trim (:meth:`~unsteady.dynamics.heave.HeaveMotion.set_apparent_mass`),
       whose step takes that part implicitly.  The defaults (0, a
       first-order difference) suit a model whose loads have no such part:
       the step is then the explicit one.

    What the base class and the runner own, for every model: ``on_start(model)``
    before the march and ``on_end(model)`` after it, also when it diverges
    (:meth:`run`); the gust field; the free heave and its trim; the history
    recorder; the snapshot spacing (``output.snapshot_every``); the progress
    bar; the gust and heave columns; every observer's ``finish(history)``
    and ``summary(history)``; the quasi-steady column and lag metrics
    (:mod:`unsteady.analysis.lag`); the summary
    (:func:`unsteady.analysis.summary.make_summary`); the divergence stop.

    Attributes
    ----------
    name : str
        The registered name (set by :func:`register_model`).
    sc, gust, motion
        As given.
    """

    name = None
    COLUMNS = ()

    def __init__(self, sc, gust, motion):
        self.sc = sc
        self.gust = gust
        self.motion = motion

    def steady_cl(self, alpha, alpha_dot):
        """Settled still-air lift coefficient at pitch alpha (rad) and rate alpha_dot (rad/s) (rule 3)."""
        raise NotImplementedError

    def _march(self, observers):
        raise NotImplementedError

    def heave_apparent_mass(self, alpha):
        """The model's apparent mass in heave, kg/m per span (rule 8; default none)."""
        return 0.0

    @staticmethod
    def rate_difference(values, dt):
        """The difference of the heave rate the loads take h'' from (rule 8): first-order backward
        (0 on the first row)."""
        return (values[-1] - values[-2]) / dt if len(values) >= 2 else 0.0

    def quasi_steady_cl(self, alpha_eff, height):
        """The model's own quasi-steady lift (rule 7); None: thin-airfoil theory's."""
        return None

    def summary(self):
        """The model's own summary keys (rule 6)."""
        return {}

    def snapshot_extras(self):
        """What the model adds to ``Result.snapshots`` (rule 6)."""
        return {}

    def run(self, observers):
        """March with ``on_start(model)`` / ``on_end(model)`` around it; the error text when it diverged, else None."""
        for o in observers:
            if hasattr(o, "on_start"):
                o.on_start(self)
        try:
            self._march(observers)
        except (SolverDiverged, RunStopped) as exc:    # a motion's runaway too (dynamics.pitch)
            return str(exc)
        finally:
            for o in observers:
                if hasattr(o, "on_end"):
                    o.on_end(self)
        return None

    @staticmethod
    def deliver_rows(rows, observers):
        """Give a block of rows to the observers (rule 4b).

        Observers with ``on_rows(rows)`` take the whole block; the others
        then see every row through ``on_step(state)``, in order (a
        :class:`~unsteady.vortex.solver.StepState` with no wake or body
        points, ``dcp`` empty).
        """
        stepped = [o for o in observers if not hasattr(o, "on_rows")]
        for o in observers:
            if hasattr(o, "on_rows"):
                o.on_rows(rows)
        if not stepped:
            return
        empty = np.zeros(0)
        for n in range(rows.t.shape[0]):
            st = StepState(n=n, t=float(rows.t[n]), alpha=float(rows.alpha[n]),
                           alpha_dot=float(rows.alpha_dot[n]), h=float(rows.h[n]),
                           h_dot=float(rows.h_dot[n]), gamma_bound=empty, x_wake=empty,
                           z_wake=empty, gamma_wake=empty, x_body=empty, z_body=empty,
                           loads={k: float(v[n]) for k, v in rows.loads.items()}, dcp=empty)
            for o in stepped:
                o.on_step(st)


# ---------------------------------------------------------------------------
# the discrete-vortex model
# ---------------------------------------------------------------------------

class _Fixed:
    """A motion frozen at one attitude (for the steady lift)."""

    def __init__(self, alpha, alpha_dot):
        self.s = (alpha, alpha_dot, 0.0, 0.0)

    def state(self, t):
        return self.s

    def after_step(self, t, dt, loads):
        pass


class _RateStep:
    """A probe motion: held at ``alpha`` (rad), then from step 2 on the pitch rate (``which`` 0) or the
    heave rate (1) changed by ``dv`` (rad/s or m/s), the angle or height following it
    (:meth:`VortexModel.apparent_inertia`)."""

    def __init__(self, alpha, which, dv, dt):
        self.alpha, self.which, self.dv, self.dt = alpha, which, dv, dt

    def state(self, t):
        n = int(round(t / self.dt))
        s = self.dv * (n - 2) * self.dt if n >= 2 else 0.0
        v = self.dv if n >= 2 else 0.0
        if self.which == 0:
            return self.alpha + s, v, 0.0, 0.0
        return self.alpha, 0.0, s, v

    def after_step(self, t, dt, loads):
        pass


class _AllLoads:
    """The loads row of every step."""

    def __init__(self):
        self.rows = []

    def on_step(self, s):
        self.rows.append(s.loads)


class _Relay:
    """The one observer the solver sees: passes each state on, in order (the model owns on_start/on_end)."""

    def __init__(self, observers):
        self.observers = observers

    def on_step(self, s):
        for o in self.observers:
            o.on_step(s)


class _PressureRows:
    """The pressure-jump coefficient per step and element (``snapshots["dcp"]``)."""

    def __init__(self, steps, elements):
        self.dcp = np.full((steps + 1, elements), np.nan, dtype=np.float32)
        self.count = 0

    def on_step(self, s):
        self.dcp[s.n] = s.dcp
        self.count = s.n + 1


class _SurfaceRows:
    """Outside Cp per step and panel of a thick section (``snapshots["cp"]``) and the lower-minus-upper
    difference at the lower surface's chord stations (``dcp``, as for a camber line)."""

    def __init__(self, steps, model):
        self.model = model
        g = model.geometry
        self.half = g.n // 2
        self.cp = np.full((steps + 1, g.n), np.nan, dtype=np.float32)
        self.dcp = np.full((steps + 1, self.half), np.nan, dtype=np.float32)
        self.count = 0

    def on_step(self, s):
        loads = self.model.loads
        self.cp[s.n] = loads.cp_last
        self.dcp[s.n] = loads.dcp_last
        self.count = s.n + 1

    def extras(self):
        g = self.model.geometry
        return {"cp": self.cp[:self.count], "x_surface": g.x_surface, "z_surface": g.z_surface,
                "dcp": self.dcp[:self.count], "x_dcp": g.x_surface[:self.half][::-1].copy()}


@register_model("vortex")
class VortexModel(Model):
    """The time-marching discrete-vortex model (:mod:`unsteady.vortex.solver`), row by row (rule 4a).

    Its steady lift is the solver's own steady start (no shed vortex), so
    that a trimmed aircraft starts at n = 1 to round-off.
    """

    COLUMNS = ("lesp",)
    #: the loads' time derivative of the bound circulation, the rule :meth:`apparent_inertia` assumes
    rate_difference = staticmethod(backward_derivative)

    def __init__(self, sc, gust, motion):
        super().__init__(sc, gust, motion)
        self.thick = bool(sc.data["airfoil"].get("thick"))
        if self.thick:
            self.body = build_surface(sc) if sc.flap_law is None else build_flap_surface(sc, sc.flap_law)
        else:
            self.body = build_body(sc) if sc.flap_law is None else build_flap_body(sc, sc.flap_law)
        more = sc.data["airfoil"].get("_more")
        if more:                                # [[airfoil]]: the first element's model, then the others
            self.body = [self.body] + build_elements(sc)[1:]
        #: 1-based index of the first element on surface panels (its Cp goes to the snapshots), or None
        self.cp_element = (1 if self.thick else next((i for i, el in enumerate(more or (), start=2)
                                                      if el.get("thick")), None))
        several_thick = bool(more) and self.cp_element is not None
        gr = sc.data.get("ground")
        # the ground sits [ground] height below the pitch axis's height at t = 0
        self.ground = (None if not gr else
                       Ground(float(sc.kinematics.plunge.value(0.0)) - gr["height"]))
        crit = lesp_criticals(sc.data["airfoil"])
        self.COLUMNS = (("lesp", "gamma_lev") if sheds_anywhere(sc.data["airfoil"])
                        else ("lesp",)) + (("flap_deg", "ch") if sc.flap_law is not None else ()) + (
            ("ground_clearance_m",) if self.ground is not None else ()) + (
            tuple(f"{q}_{i}" for i in range(1, len(more) + 2) for q in ("cl", "cd", "cm")) if more else ()) + (
            tuple(f"lesp_{i}" for i in range(1, len(more) + 2)) if more else ()) + (
            tuple(f"gamma_lev_{i}" for i, c in enumerate(crit, start=1) if c is not None) if more else ()) + (
            tuple(f"{q}_{i}" for i, el in enumerate(more or (), start=2) if "flap_hinge" in el
                  for q in ("flap_deg", "ch"))) + (
            tuple(f"{q}_{i}" for i in range(1, len(more) + 2) for q in ("cl_impulse", "cd_impulse"))
            if several_thick else ())
        self._pressure = None

    def _steady_loads_row(self, body, alpha, alpha_dot=0.0, gust=True, ground="run"):
        """The loads row of the solver's steady start of ``body`` at a fixed attitude (step 0 at t = 0,
        no wake shed yet): in the gust field as it stands at t = 0 when the airfoil is inside it
        (``gust``), over the run's ground (``ground="run"``), another ``Ground`` or none (None)."""
        sc = self.sc
        obs = _AllLoads()
        g = self.gust if gust and self.gust is not None and self.gust.present_at_start else None
        if ground == "run":
            ground = self._ground_at_rest()
        VortexSolver(body, _Fixed(float(alpha), alpha_dot), speed=sc.speed, density=sc.density,
                     dt=sc.dt, steps=0, start="steady", gust=g, ground=ground).run([obs])
        return obs.rows[-1]

    def _ground_at_rest(self):
        """The run's ground for a body whose pitch axis sits at h = 0 (a steady start, a probe), or None."""
        return None if self.ground is None else Ground(-self.sc.data["ground"]["height"])

    def steady_cl(self, alpha, alpha_dot):
        """cl of the solver's steady start at a fixed attitude (step 0 at t = 0, no wake shed
        yet), in the gust field as it stands at t = 0 when the airfoil is inside it (rule 3)."""
        return self._steady_loads_row(self.body, alpha, alpha_dot)["cl"]

    def quasi_steady_cl(self, alpha_eff, height):
        """Steady lift of this body at the effective angles ``alpha_eff`` (rad), rows of a history (rule 7).

        For a thick section, several elements or a ground, where 2 pi (alpha_eff - alpha_L0) of
        thin-airfoil theory is not this body's steady lift (a 12 % section's slope is about 9 %
        higher; a tail adds its lift and its downwash; the ground raises the lift as it nears): the
        settled lift of the model's own steady start (:meth:`steady_cl` without the gust, a flap at
        its deflection at t = 0) at Chebyshev nodes over the run's range of angles (and of the pitch
        axis's height over a ground), between them a Chebyshev polynomial in the angle (and in
        1 / clearance), whose error is far below the model's own (the steady lift is smooth in
        both; common practice of table interpolation).  None for a single camber line in free air;
        NaN throughout where a steady solve over the ground at one of the nodes would put the body in
        it (no steady state exists there; :func:`unsteady.analysis.lag.lag_summary` says so).
        """
        import numpy.polynomial.chebyshev as cheb
        if not (self.cp_element is not None or isinstance(self.body, list) or self.ground is not None):
            return None
        a = np.asarray(alpha_eff, float)
        ok = np.isfinite(a)
        if not ok.any():
            return None
        lo, hi = float(a[ok].min()), float(a[ok].max())
        n_a = 7 if hi - lo > 1e-9 else 1
        a_nodes = 0.5 * (lo + hi) + 0.5 * (hi - lo) * np.cos(np.pi * (np.arange(n_a) + 0.5) / n_a)

        def steady(alpha, ground):
            return self._steady_loads_row(self.body, alpha, gust=False, ground=ground)["cl"]

        def fit_in_alpha(values):
            if n_a == 1:
                return lambda x: np.full_like(x, values[0])
            x = (2.0 * a_nodes - lo - hi) / (hi - lo)
            coef = cheb.chebfit(x, values, n_a - 1)
            return lambda y: cheb.chebval((2.0 * y - lo - hi) / (hi - lo), coef)

        out = np.full(a.shape, np.nan)
        if self.ground is None:
            out[ok] = fit_in_alpha([steady(x, None) for x in a_nodes])(a[ok])
            return out
        # over the ground: the axis's clearance g = h - z_ground; nodes in 1 / g, where the lift is smoothest
        g = np.asarray(height, float) - self.ground.z
        ok &= np.isfinite(g) & (g > 0)
        inv = 1.0 / g[ok]
        i_lo, i_hi = float(inv.min()), float(inv.max())
        n_g = 7 if i_hi - i_lo > 1e-9 * i_hi else 1
        i_nodes = 0.5 * (i_lo + i_hi) + 0.5 * (i_hi - i_lo) * np.cos(np.pi * (np.arange(n_g) + 0.5) / n_g)
        from ..vortex.solver import GroundContact
        try:
            rows = np.array([[steady(x, Ground(-1.0 / q)) for x in a_nodes] for q in i_nodes])   # (n_g, n_a)
        except GroundContact:
            return out
        by_alpha = np.array([fit_in_alpha(r)(a[ok]) for r in rows])                        # (n_g, m)
        if n_g == 1:
            out[ok] = by_alpha[0]
            return out
        xg = (2.0 * i_nodes - i_lo - i_hi) / (i_hi - i_lo)
        coef = cheb.chebfit(xg, by_alpha, n_g - 1)                                         # (n_g, m)
        basis = cheb.chebvander((2.0 * inv - i_lo - i_hi) / (i_hi - i_lo), n_g - 1)        # (m, n_g)
        out[ok] = np.einsum("mk,km->m", basis, coef)
        return out

    def steady_loads(self, alpha, tail_turn, tail_flap=None):
        """(cl, cm about the pitch axis) of the solver's steady start at attitude alpha (rad) with the
        last element turned by ``tail_turn`` (rad) and, when given, its flap deflected by ``tail_flap``
        (rad, trailing edge down): what the trim of pitch freedom solves on."""
        row = self._steady_loads_row(self._elements(tail_turn, tail_flap), alpha)
        return row["cl"], row["cm_pivot"]

    def heave_apparent_mass(self, alpha):
        """The model's own apparent mass in heave at attitude ``alpha`` (rad), kg/m per span: the
        heave column of :meth:`apparent_inertia` (its lift's part -A h''), measured the same way."""
        return float(self.apparent_inertia(alpha, columns=(1,))[1, 1])

    def apparent_inertia(self, alpha, columns=(0, 1)):
        """The model's own apparent inertia in pitch and heave at attitude ``alpha`` (rad): a 2 x 2 matrix
        A (per span, SI) with the step's loads (M' nose-up about the pitch axis, L' up) = -A (theta'', h'')
        in their part that answers a change of the rates within the step.

        Measured, not estimated: in the model a step change of a rate (theta' or h', at step 2 of a steady
        start at ``alpha``, the bodies as they march) changes the bound circulation within the step, and
        the loads' second-order backward difference of it (:attr:`rate_difference`)
        turns that into a load of -1.5 A dv / dt at that step and +0.5 A dv / dt at the next; so
        A = -(dF_2 - dF_3) dt / (2 dv), from runs with +dv and -dv (the quadratic part cancels).  What
        remains of the difference (the circulatory part of the response, of order U dt / c of it) is left
        in the estimate.  It is what the added-mass partitioned step of the pitch freedom needs
        (:func:`unsteady.dynamics.pitch.pitch_step`) and the free heave
        (:func:`unsteady.linear.kernels.heave_step`).  Rates: 1e-3 U over the farthest element point
        from the axis for theta', 1e-3 U for h'; ``columns`` the ones to measure (0 pitch, 1 heave;
        the others are left zero).
        """
        sc = self.sc
        U, dt = sc.speed, sc.dt
        q, c = 0.5 * sc.density * U * U, sc.chord
        reach = max(float(np.max(np.hypot(m.geometry.xi_c, m.geometry.zeta_c))) for m in as_body_models(self.body))
        ground = self._ground_at_rest()
        A = np.zeros((2, 2))
        for k, dv in ((0, 1e-3 * U / reach), (1, 1e-3 * U)):
            if k not in columns:
                continue
            f = []
            for sign in (1.0, -1.0):
                obs = _AllLoads()
                VortexSolver(self.body, _RateStep(float(alpha), k, sign * dv, dt), speed=U, density=sc.density,
                             dt=dt, steps=3, start="steady", ground=ground,
                             shed_offset=sc.data["run"].get("shed_offset", 0.3),
                             core_radius=sc.data["run"].get("core_radius")).run([obs])
                f.append(np.array([[r["cm_pivot"] * q * c * c, r["cl"] * q * c] for r in obs.rows]))
            d = 0.5 * (f[0] - f[1])                     # (step, load) per unit sign, linear part
            A[:, k] = -(d[2] - d[3]) * dt / (2.0 * dv)
        return A

    def _elements(self, tail_turn, tail_flap=None):
        first = self.body[0] if isinstance(self.body, list) else self.body
        return [first] + build_elements(self.sc, tail_turn, tail_flap)[1:]

    def set_tail_turn(self, tail_turn, tail_flap=None):
        """March with the last element turned by ``tail_turn`` (rad) and, when given, its flap at
        ``tail_flap`` (rad): the trimmed tail (all-moving, or its flap)."""
        self.body = self._elements(tail_turn, tail_flap)

    def _march(self, observers):
        sc, run = self.sc, self.sc.data["run"]
        several = isinstance(self.body, list)
        self._pressure = (_SurfaceRows(sc.steps, self.body[0] if several else self.body) if self.thick
                          else _PressureRows(sc.steps, sc.elements))
        # several elements: the first one on surface panels keeps its Cp (the first element's, if thick)
        self._surface = (None if self.cp_element is None or not several else
                         self._pressure if self.thick else _SurfaceRows(sc.steps, self.body[self.cp_element - 1]))
        offset = run.get("shed_offset", 0.3)
        crit = lesp_criticals(sc.data["airfoil"])
        sites = None
        if any(c is not None for c in crit):
            # each body's trailing edge, then its leading edge if it may shed: a leading-edge site's
            # trial solve then holds every earlier body's vortices and its own body's trailing edge
            sites = []
            for b, c in enumerate(crit):
                sites.append(TrailingEdgeSite(b, offset))
                if c is not None:
                    sites.append(LeadingEdgeSite(b, c, offset))
        solver = VortexSolver(self.body, self.motion, speed=sc.speed, density=sc.density, dt=sc.dt,
                              steps=sc.steps, wake=run["wake"], start=run["start"], gust=self.gust,
                              shed_offset=offset, sites=sites,
                              core_radius=run.get("core_radius"), far_wake=run.get("far_wake"),
                              ground=self.ground)
        extra = [self._surface] if self._surface is not None and self._surface is not self._pressure else []
        solver.run([_Relay([self._pressure] + extra + list(observers))])

    def summary(self):
        run = self.sc.data["run"]
        out = {"dt": self.sc.dt, "wake": run["wake"], "start": run["start"],
               "elements": self.sc.elements, "far_wake_chords": run.get("far_wake")}
        if self.ground is not None:
            out["impulse_loads"] = ("not computed near the ground: the ground carries a share of the "
                                    "vortices' impulse")
        if self.thick:
            out["section_model"] = "surface panels (thick)"
        if isinstance(self.body, list) and self.cp_element is not None:
            out["thick_elements"] = [i for i, m in enumerate(self.body, start=1) if hasattr(m, "influence_matrix")]
            out["impulse_per_element"] = ("each element's own vortices (cl_impulse_<i>, cd_impulse_<i>): the "
                                          "force on it where the elements do not act on each other's vortices")
        return out

    def snapshot_extras(self):
        """``dcp`` (per step and element) and ``x_dcp`` (element mid-points, chord fractions)."""
        p = self._pressure
        surface = getattr(self, "_surface", None)
        if self.thick:                          # the first element on panels: dcp and x_dcp its own, as alone
            out = p.extras()
            if surface is not None:
                out["cp_element"] = np.int64(1)
            return out
        if surface is not None:                 # a further element on panels: its Cp, the first's dcp
            out = surface.extras()
            del out["dcp"], out["x_dcp"]
            out["cp_element"] = np.int64(self.cp_element)
            out.update(self._camber_dcp(p))
            return out
        return self._camber_dcp(p)

    def _camber_dcp(self, p):
        """``dcp`` and ``x_dcp`` of a first element on its camber line."""
        if self.sc.flap_law is None:
            x = camber_elements(self.sc.section, self.sc.elements).x_nodes
        else:                                   # the nodes with one on the hinge
            x = hinge_nodes(self.sc.elements, self.sc.data["airfoil"]["flap_hinge"])[0]
        dcp = p.dcp[:p.count] if p is not None else np.zeros((0, self.sc.elements), np.float32)
        return {"dcp": dcp, "x_dcp": x[:-1] + 0.5 * np.diff(x)}


# ---------------------------------------------------------------------------
# the linear (indicial) model
# ---------------------------------------------------------------------------

@register_model("linear")
class LinearModel(Model):
    """Classical indicial-response model (Wagner, Kuessner, Theodorsen): see :mod:`unsteady.linear.model`.

    All rows in one pass (rule 4b): prescribed motion is summed by FFT
    convolutions (:func:`~unsteady.linear.model.linear_loads`); with
    ``[aircraft]`` the loads drive the heave through the compiled march
    (:meth:`~unsteady.linear.model.LinearMarcher.run`).  The vortex-only
    columns get their linear equivalents: ``gamma_bound_m2_s`` is the
    circulation that carries the circulatory lift by Kutta-Joukowski
    (L = -rho U Gamma, counter-clockwise positive as in the vortex model),
    ``gamma_wake_m2_s`` the circulation shed since the start, ``wake_vortices``
    0; ``cl_circulatory`` is the circulatory lift (motion and gust).

    Parameters
    ----------
    sc, gust, motion
        As :class:`Model`.
    **march_options
        ``s_max``, ``tail``, ``compiled`` of
        :class:`~unsteady.linear.model.LinearMarcher` (free heave only; for
        tests and benchmarks).
    """

    COLUMNS = ("cl_circulatory", "lesp")

    def __init__(self, sc, gust, motion, **march_options):
        super().__init__(sc, gust, motion)
        if sc.flap_law is not None:
            self.COLUMNS = ("cl_circulatory", "lesp", "flap_deg", "ch")
        self.alpha_L0, self.cm0 = section_constants(sc.section)
        self.march_options = march_options
        self._trim_model = None
        self._gust_at_start = None

    # rate_difference: the base class's first-order difference, the plunge acceleration of the
    # march's apparent-mass terms (unsteady.linear.model.LinearMarcher)

    def heave_apparent_mass(self, alpha):
        """Theodorsen's apparent mass of the section in heave, pi rho b^2 per span (kg/m), from the
        march's own apparent-mass terms (:func:`unsteady.theory.apparent_mass`: the lift per unit
        h'', on the chord's q c); ``alpha`` is not needed (linear)."""
        from .. import theory
        sc = self.sc
        b, U = 0.5 * sc.chord, sc.speed
        q_c = 0.5 * sc.density * U * U * sc.chord
        return float(-q_c * theory.apparent_mass(-b / (U * U), 0.0, 0.0, 2.0 * sc.pivot - 1.0)[0])

    def steady_cl(self, alpha, alpha_dot):
        """The vortex model's steady lift (:meth:`VortexModel.steady_cl`), on purpose.

        Both models then trim an aircraft to one attitude, so that their
        load factors compare on the same aircraft (and the linear histories
        stay those of earlier versions).  The linear model's own steady lift,
        2 pi (alpha - alpha_L0) plus the pitch-rate terms, differs from it by
        the lumped-vortex discretisation, so the linear run does not start
        exactly level: n = 1.0002 to 1.0007 at t = 0 in the bundled drone
        scenarios (measured; trimmed on its own lift instead, the trim moves
        by under 0.004 degrees and n_max by about 1e-4).

        In a gust field that surrounds the airfoil at t = 0 (rule 3), the
        linear model's own steady gust lift at t = 0 is added: 2 pi w/U of
        the gust met at the leading edge (Kuessner's response settled), and
        a streamwise gust scales the lift by 1 + 2 u/U as in
        :func:`~unsteady.linear.model.linear_loads`; the run then starts
        level in turbulence too.
        """
        if self._trim_model is None:
            self._trim_model = VortexModel(self.sc, None, None)
        cl = self._trim_model.steady_cl(alpha, alpha_dot)
        if self._gust_at_start is None:        # (u, w) met at the leading edge at t = 0, or none
            gust = self.gust
            steady = gust is not None and linear.gust_start(self.sc.data["run"]["start"], gust) == "steady"
            u, w = (_gust_series(gust, -self.sc.pivot * self.sc.chord, np.zeros(1), np.zeros(1))
                    if steady else (np.zeros(1), np.zeros(1)))
            self._gust_at_start = (float(u[0]) if steady and gust.streamwise else 0.0, float(w[0]))
        u0, w0 = self._gust_at_start
        return (cl + 2.0 * np.pi * w0 / self.sc.speed) * (1.0 + 2.0 * u0 / self.sc.speed)

    def marcher(self):
        """The :class:`~unsteady.linear.model.LinearMarcher` of the free heave (``[aircraft]``), trimmed motion."""
        return linear.heave_marcher(self.sc, self.motion, self.gust, **self.march_options)

    def _march(self, observers):
        sc = self.sc
        if isinstance(self.motion, HeaveMotion):
            out = self.marcher().run()
            t, alpha, alpha_dot, h, h_dot = (out[k] for k in ("t", "alpha", "alpha_dot", "h", "h_dot"))
            if sc.flap_law is not None:
                out.update(self._heave_flap(out))
        else:
            t, alpha, alpha_dot, h, h_dot, out = self._prescribed()
        cl_c = out["cl_c"] + out["cl_gust"]
        gamma_b = -0.5 * sc.speed * sc.chord * cl_c     # L = -rho U Gamma, counter-clockwise positive
        gamma_0 = gamma_b[0] if sc.data["run"]["start"] == "steady" else 0.0
        loads = {"cl": out["cl"], "cd": out["cd"], "cm": out["cm"], "cm_pivot": out["cm_pivot"],
                 "cl_impulse": out["cl"], "cd_impulse": out["cd"], "cm_impulse": out["cm"],
                 "gamma_bound_m2_s": gamma_b, "gamma_wake_m2_s": gamma_0 - gamma_b,
                 "wake_vortices": np.zeros_like(t), "cl_circulatory": cl_c,
                 "lesp": self._lesp(cl_c, alpha_dot)}
        for k in ("flap_deg", "ch"):
            if k in out:
                loads[k] = out[k]
        self.deliver_rows(Rows(t, alpha, alpha_dot, h, h_dot, loads), observers)

    def _lesp(self, cl_c, alpha_dot):
        """The linear model's leading-edge suction parameter (A0) per row.

        Quasi-steady thin-airfoil theory (Abbott & von Doenhoff 1959, ch. 4)
        with the wake's lag carried by the circulatory lift, as for the
        model's drag (:func:`~unsteady.linear.model.leading_edge_a0`), plus the
        camber's share of A0: ``alpha_L0 - (1/pi) int dz/dx dtheta``, so that a
        steady cambered section gives ``alpha - (1/pi) int dz/dx dtheta``.
        """
        shift = self.alpha_L0 - _camber_a0_shift(self.sc.section)
        return linear.leading_edge_a0(cl_c, alpha_dot, speed=self.sc.speed, chord=self.sc.chord) + shift

    def _heave_flap(self, out):
        """``flap_deg`` and ``ch`` of a free-heave march: the hinge moment of
        :func:`~unsteady.linear.model.flap_terms` on the marched pitch rate, the
        prescribed pitch acceleration and the heave acceleration of the march."""
        sc = self.sc
        t = out["t"]
        law, hinge = sc.flap_law, sc.data["airfoil"]["flap_hinge"]
        h_ddot = out.get("h_ddot")
        if h_ddot is None:            # the Python march: the backward difference it used
            h_ddot = np.concatenate([[0.0], np.diff(out["h_dot"]) / sc.dt])
        alpha_ddot = np.broadcast_to(np.asarray(sc.kinematics.accel(t)[0], dtype=float), t.shape)
        fl = linear.flap_terms((hinge, law.value(t), law.rate(t), law.accel(t)), out["alpha_dot"],
                               alpha_ddot, h_ddot, speed=sc.speed, chord=sc.chord, pivot=sc.pivot)
        lagged = (out["cl_c"] + out["cl_gust"]) / (2.0 * np.pi)
        ch = (fl["Mh_nc"] + fl["mh_c"] * lagged) * fl["to_ch"] + flap_camber_ch(sc.section, hinge)
        return {"flap_deg": np.degrees(law.value(t)), "ch": ch}

    def _prescribed(self):
        """(t, alpha, alpha_dot, h, h_dot, loads) of a prescribed motion, summed in one pass."""
        sc, gust = self.sc, self.gust
        t = np.arange(sc.steps + 1) * sc.dt
        alpha, alpha_dot, h, h_dot = (np.broadcast_to(np.asarray(v, dtype=float), t.shape).copy()
                                      for v in self.motion.state(t))
        alpha_ddot, h_ddot = (np.broadcast_to(np.asarray(v, dtype=float), t.shape).copy()
                              for v in self.motion.accel(t))
        u_le = w_le = None
        if gust is not None:
            # the gust met by the leading edge (its path at zero pitch), m/s
            u_le, w_le = _gust_series(gust, -sc.pivot * sc.chord, t, h)
        flap = None
        if sc.flap_law is not None:
            law, hinge = sc.flap_law, sc.data["airfoil"]["flap_hinge"]
            flap = (hinge, law.value(t), law.rate(t), law.accel(t), flap_camber_ch(sc.section, hinge))
        out = linear_loads(t, alpha, alpha_dot, alpha_ddot, h_dot, h_ddot, speed=sc.speed,
                           chord=sc.chord, pivot=sc.pivot, alpha_L0=self.alpha_L0, cm0=self.cm0,
                           w_le=w_le, u_le=u_le if gust is not None and gust.streamwise else None,
                           start=sc.data["run"]["start"],
                           gust_start=linear.gust_start(sc.data["run"]["start"], gust), flap=flap)
        if flap is not None:
            out["flap_deg"] = np.degrees(flap[1])
        return t, alpha, alpha_dot, h, h_dot, out

    def summary(self):
        return {"dt": self.sc.dt, "start": self.sc.data["run"]["start"], "elements": self.sc.elements}


def flap_camber_ch(section, hinge):
    """The camber's own hinge moment at zero lift (:func:`unsteady.theory.flap.camber_hinge_moment`; 0 for a flat plate)."""
    from ..theory.flap import camber_hinge_moment
    p = getattr(section, "p", None)
    breaks = tuple(x for x in (p, hinge) if x)
    return camber_hinge_moment(section.slope, hinge, breaks=breaks)


def _camber_a0_shift(section):
    """(1/pi) int_0^pi dz/dx dtheta of a section's camber line (0 for a flat plate)."""
    from .. import theory
    p = getattr(section, "p", None)
    return -theory.steady_a0(0.0, section.slope, breaks=(p,) if p else ())


def linear_heave_marcher(sc, **options):
    """The linear model's free-heave marcher of a scenario with ``[aircraft]``, trimmed.

    ``options``: ``s_max``, ``tail``, ``compiled`` of :class:`unsteady.linear.model.LinearMarcher`.
    """
    gust = build_gust_field(sc) if sc.data.get("gust") else None
    model = LinearModel(sc, gust, HeaveMotion(sc, sc.kinematics), **options)
    model.motion.trim(model.steady_cl)
    model.motion.set_apparent_mass(model.heave_apparent_mass(model.motion.alpha_trim), model.rate_difference)
    return model.marcher()
