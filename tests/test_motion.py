"""Motion laws, their exact derivatives, sums, tables and input checks (unsteady.motion)."""

import math

import numpy as np
import pytest

from unsteady.core.errors import InputError
from unsteady.inputs.motion import LAWS, Kinematics, Law, SumLaw, build_law, law_problems, logcosh, register_law

DEG = math.pi / 180.0


def central_rate(law, t, h):
    """Central difference of the value (common practice)."""
    return (law.value(t + h) - law.value(t - h)) / (2 * h)


def central_accel(law, t, h):
    """Second central difference of the value (common practice)."""
    return (law.value(t + h) - 2 * law.value(t) + law.value(t - h)) / (h * h)


def assert_derivatives(law, t, h=1e-5, rtol=1e-6):
    """rate and accel against central finite differences (common practice).

    h is a step well below the law's shortest time scale: the truncation error
    of the differences is about (h / time scale)^2.
    """
    r, a = law.rate(t), law.accel(t)
    scale_r = max(np.max(np.abs(r)), 1e-300)
    scale_a = max(np.max(np.abs(a)), 1e-300)
    assert np.allclose(r, central_rate(law, t, h), rtol=rtol, atol=rtol * scale_r)
    # accel against differences of the exact rate (to rtol) and second differences of the value (looser:
    # they lose digits to rounding)
    assert np.allclose(a, (law.rate(t + h) - law.rate(t - h)) / (2 * h), rtol=rtol, atol=rtol * scale_a)
    assert np.allclose(a, central_accel(law, t, 10 * h), rtol=1e-4, atol=1e-4 * scale_a)


# --- the laws ---------------------------------------------------------------------------------

def test_registry_holds_the_scenario_names():
    assert list(LAWS) == ["constant", "step", "ramp", "sine", "table"]
    for name, cls in LAWS.items():
        assert issubclass(cls, Law) and cls.name == name and cls.__doc__


def test_constant():
    law = build_law({"law": "constant", "value": 4.0}, scale=DEG)
    t = np.linspace(-1, 1, 7)
    assert np.allclose(law.value(t), 4.0 * DEG) and np.all(law.rate(t) == 0) and np.all(law.accel(t) == 0)
    assert isinstance(law.value(0.3), float)
    assert law.value(np.zeros((2, 3))).shape == (2, 3)


def test_step_jumps_at_its_time_with_no_rate():
    law = build_law({"law": "step", "value": 0.02, "time": 0.5})
    assert law.value(0.4999) == 0.0 and law.value(0.5) == 0.02 and law.value(3.0) == 0.02
    t = np.linspace(0, 1, 11)
    assert np.all(law.rate(t) == 0) and np.all(law.accel(t) == 0)  # the impulse is not represented (documented)


def test_sharp_ramp_is_piecewise_linear():
    law = build_law({"law": "ramp", "from": 2.0, "to": 12.0, "start": 0.1, "duration": 0.2}, scale=DEG)
    assert law.value(0.0) == pytest.approx(2 * DEG, abs=0) and law.value(0.1) == pytest.approx(2 * DEG, rel=1e-15)
    assert law.value(0.2) == pytest.approx(7 * DEG, rel=1e-14) and law.value(0.3) == pytest.approx(12 * DEG, rel=1e-15)
    assert law.value(5.0) == 12 * DEG
    slope = 10 * DEG / 0.2
    assert law.rate(0.0999) == 0 and law.rate(0.1) == pytest.approx(slope) and law.rate(0.2999) == pytest.approx(slope)
    assert law.rate(0.30001) == 0 and np.all(law.accel(np.linspace(0, 1, 9)) == 0)
    t = np.linspace(0.12, 0.28, 9)  # away from the corners
    assert np.allclose(law.rate(t), central_rate(law, t, 1e-6), rtol=1e-6)


def test_logcosh_is_stable_and_matches_numpy():
    x = np.linspace(-20, 20, 401)
    assert np.allclose(logcosh(x), np.log(np.cosh(x)), rtol=1e-13, atol=1e-14)
    assert logcosh(1e5) == pytest.approx(1e5 - math.log(2), rel=1e-15)  # |x| - ln 2 for large |x|
    assert np.isfinite(logcosh(np.array([1e308, -1e308]))).all()


def eldredge_ramp(q0, q1, t0, D, sigma, t):
    """The log-cosh rounded ramp as published (Eldredge, Wang & Ol, AIAA 2009-3687), written literally."""
    t1 = t0 + D
    return q0 + (q1 - q0) * (0.5 + sigma / (2 * D) * np.log(np.cosh((t - t0) / sigma) / np.cosh((t - t1) / sigma)))


def test_smoothed_ramp_matches_the_published_formula():
    spec = {"law": "ramp", "from": -3.0, "to": 25.0, "start": 0.2, "duration": 0.5, "smoothing": 0.04}
    law = build_law(spec, scale=DEG)
    t = np.linspace(-0.5, 1.5, 801)  # |t - t0| / sigma < 40: the literal form does not overflow here
    assert np.allclose(law.value(t), DEG * eldredge_ramp(-3.0, 25.0, 0.2, 0.5, 0.04, t), rtol=1e-12, atol=1e-14)
    # symmetric about the middle of the ramp
    assert law.value(0.45) == pytest.approx(11 * DEG, rel=1e-13)


@pytest.mark.parametrize("sigma", [0.002, 0.02, 0.1, 0.6])
def test_smoothed_ramp_derivatives_are_exact(sigma):
    law = build_law({"law": "ramp", "from": 1.0, "to": 30.0, "start": 0.3, "duration": 0.4, "smoothing": sigma},
                    scale=DEG)
    t = np.linspace(-0.2, 1.2, 141)
    assert_derivatives(law, t, h=5e-4 * sigma)


def test_smoothed_ramp_tends_to_the_sharp_one():
    sharp = build_law({"law": "ramp", "from": 0.0, "to": 20.0, "start": 0.1, "duration": 0.3})
    t = np.linspace(-0.5, 1.0, 3001)
    deviations = []
    for sigma in (0.05, 0.01, 0.002, 0.0004):
        smooth = build_law({"law": "ramp", "from": 0.0, "to": 20.0, "start": 0.1, "duration": 0.3,
                            "smoothing": sigma})
        dev = np.max(np.abs(smooth.value(t) - sharp.value(t)))
        # the largest gap is |q1 - q0| sigma ln 2 / (2 D), at the corners (from the formula)
        assert dev <= 20.0 * sigma * math.log(2) / (2 * 0.3) * (1 + 1e-12)
        assert dev == pytest.approx(20.0 * sigma * math.log(2) / (2 * 0.3), rel=0.02)
        deviations.append(dev)
    assert all(b < a for a, b in zip(deviations, deviations[1:]))


def test_smoothed_ramp_reaches_from_and_to_exactly_far_away():
    law = build_law({"law": "ramp", "from": 0.1, "to": 0.3, "start": 1.0, "duration": 2.0, "smoothing": 0.01})
    assert law.value(-100.0) == 0.1 and law.value(0.0) == 0.1  # 100 sigma before the start
    assert law.value(4.0) == 0.3 and law.value(1e6) == 0.3
    assert law.rate(1e6) == 0.0 and law.accel(-1e6) == 0.0
    assert np.all(np.isfinite(law.accel(np.array([-1e300, 1e300]))))


def test_sine_with_frequency():
    law = build_law({"law": "sine", "amplitude": 5.0, "frequency": 2.0, "mean": 3.0, "phase": 30.0}, scale=DEG)
    t = np.linspace(0, 1, 101)
    omega = 2 * math.pi * 2.0
    # value = mean + amplitude sin(omega t + phase): scale on amplitude and mean, phase always in degrees
    assert np.allclose(law.value(t), DEG * (3.0 + 5.0 * np.sin(omega * t + math.radians(30.0))), rtol=1e-14)
    assert law.value(0.0) == pytest.approx(DEG * (3.0 + 2.5), rel=1e-14)
    assert_derivatives(law, t)


def test_sine_reduced_frequency_gives_omega():
    # k = omega c / (2 U) (Theodorsen, NACA Report 496) => omega = 2 U k / c
    U, c, k = 14.0, 0.25, 0.2
    law = build_law({"law": "sine", "amplitude": 0.01, "reduced_frequency": k}, speed=U, chord=c)
    assert law.omega == pytest.approx(2 * U * k / c, rel=1e-15)
    period = 2 * math.pi / law.omega
    assert law.value(period / 4) == pytest.approx(0.01, rel=1e-12)
    assert_derivatives(law, np.linspace(0, 2 * period, 51), h=1e-6)


def test_list_of_laws_is_summed():
    specs = [{"law": "constant", "value": 2.0},
             {"law": "ramp", "from": 0.0, "to": 5.0, "start": 0.1, "duration": 0.2, "smoothing": 0.01},
             {"law": "sine", "amplitude": 1.0, "frequency": 3.0}]
    total = build_law(specs, scale=DEG)
    parts = [build_law(s, scale=DEG) for s in specs]
    t = np.linspace(0, 1, 57)
    assert isinstance(total, SumLaw)
    for what in ("value", "rate", "accel"):
        assert np.allclose(getattr(total, what)(t), sum(getattr(p, what)(t) for p in parts), rtol=1e-14, atol=1e-16)
    assert_derivatives(total, t)
    assert total.resolved()[1] == {"law": "ramp", "from": 0.0, "to": 5.0, "start": 0.1, "duration": 0.2,
                                   "smoothing": 0.01}


def test_resolved_fills_defaults():
    law = build_law({"law": "ramp", "from": 0, "to": 10, "start": 0, "duration": 1})
    assert law.resolved() == {"law": "ramp", "from": 0, "to": 10, "start": 0, "duration": 1, "smoothing": 0.0}
    sine = build_law({"law": "sine", "amplitude": 1, "frequency": 2})
    assert sine.resolved() == {"law": "sine", "amplitude": 1, "frequency": 2, "mean": 0.0, "phase": 0.0}


def test_a_new_law_following_the_documented_contract_plugs_in():
    @register_law("cubic-for-test")
    class Cubic(Law):
        """q = c t^3 (a law of our own, only for this test)."""

        KEYS = ("c",)
        OPTIONAL = {"t0": 0.0}
        SCALED = ("c",)

        @classmethod
        def check(cls, spec):
            if spec["c"] == 0:
                raise InputError("c", "must not be 0")

        def _value(self, t):
            return self.scaled["c"] * (t - self.spec["t0"]) ** 3

        def _rate(self, t):
            return 3 * self.scaled["c"] * (t - self.spec["t0"]) ** 2

        def _accel(self, t):
            return 6 * self.scaled["c"] * (t - self.spec["t0"])

    try:
        law = build_law({"law": "cubic-for-test", "c": 2.0}, scale=0.5)
        assert law.value(2.0) == 8.0 and law.resolved() == {"law": "cubic-for-test", "c": 2.0, "t0": 0.0}
        assert_derivatives(law, np.linspace(-1, 1, 21), h=1e-4)
        assert [e.key for e in law_problems({"law": "cubic-for-test", "c": "two", "t00": 1})] == ["c", "t00"]
        assert law_problems({"law": "cubic-for-test", "c": 0})[0].message == "must not be 0"
        with pytest.raises(ValueError):
            register_law("cubic-for-test")(Cubic)  # one class per name
    finally:
        LAWS.pop("cubic-for-test", None)


# --- tables ------------------------------------------------------------------------------------

def write_csv(path, text):
    path.write_text(text)
    return path


def test_table_passes_through_its_points_with_consistent_derivatives(tmp_path):
    t_pts = np.array([0.0, 0.1, 0.25, 0.3, 0.5, 0.8])
    q_pts = np.array([0.0, 2.0, 8.0, 9.0, 4.0, 4.5])
    rows = "".join(f"{a},{b},extra\n" for a, b in zip(t_pts, q_pts))
    write_csv(tmp_path / "pitch.csv", "t, value ,note\n" + rows)
    law = build_law({"law": "table", "file": "pitch.csv"}, scale=DEG, base_dir=tmp_path)
    assert np.allclose(law.value(t_pts), DEG * q_pts, rtol=1e-14, atol=1e-16)
    t = np.linspace(0.01, 0.79, 157)
    t = t[np.min(np.abs(t[:, None] - t_pts[None, :]), axis=1) > 1e-3]  # away from the knots (accel has kinks there)
    assert_derivatives(law, t, h=1e-6)
    # outside the table the end values hold, with no rate (documented)
    assert law.value(-1.0) == 0.0 and law.value(2.0) == pytest.approx(4.5 * DEG)
    assert law.rate(-1.0) == 0.0 and law.rate(2.0) == 0.0 and law.accel(2.0) == 0.0


def test_two_row_table_is_a_straight_line(tmp_path):
    write_csv(tmp_path / "h.csv", "# plunge, metres\nt,value\n0,0\n\n2,0.04\n")
    law = build_law({"law": "table", "file": str(tmp_path / "h.csv")})
    assert law.value(0.5) == pytest.approx(0.01, rel=1e-14) and law.rate(1.0) == pytest.approx(0.02, rel=1e-14)
    assert law.accel(1.0) == pytest.approx(0.0, abs=1e-15)


@pytest.mark.parametrize("text,needle", [
    ("time,value\n0,1\n1,2\n", "no column 't'"),
    ("t,angle\n0,1\n1,2\n", "no column 'value'"),
    ("t,value\n0,1\n", "at least 2"),
    ("", "empty"),
    ("t,value\n0,1\n0.5,abc\n1,2\n", "row 2 (line 3)"),
    ("t,value\n0,1\n0.5\n1,2\n", "row 2 (line 3)"),
    ("t,value\n0,1\n0.5,nan\n1,2\n", "not finite"),
    ("t,value\n0,1\ninf,2\n", "not finite"),
    ("t,value\n0,1\n0.5,2\n0.5,3\n", "increase strictly"),
    ("t,value\n0,1\n0.5,2\n0.4,3\n", "row 3"),
])
def test_malformed_tables(tmp_path, text, needle):
    write_csv(tmp_path / "bad.csv", text)
    spec = {"law": "table", "file": "bad.csv"}
    with pytest.raises(InputError) as err:
        build_law(spec, base_dir=tmp_path)
    assert err.value.key == "file" and needle in err.value.message
    assert [e.key for e in law_problems(spec, base_dir=tmp_path)] == ["file"]


def test_missing_table_file(tmp_path):
    with pytest.raises(InputError, match="not found") as err:
        build_law({"law": "table", "file": "nowhere.csv"}, base_dir=tmp_path)
    assert err.value.key == "file"
    with pytest.raises(InputError) as err:
        build_law({"law": "table", "file": "  "})
    assert err.value.key == "file"


# --- input checks ------------------------------------------------------------------------------

RAMP = {"law": "ramp", "from": 0.0, "to": 10.0, "start": 0.0, "duration": 1.0}


@pytest.mark.parametrize("spec,key,needle", [
    ({"law": "rmap", "from": 0}, "law", "did you mean 'ramp'"),
    ({"law": "wobble"}, "law", "allowed: constant, step, ramp, sine, table"),
    ({"value": 1.0}, "law", "missing"),
    ({"law": 3}, "law", "unknown law"),
    ("ramp", "law", "law table"),
    ([], "law", "empty"),
    ({**RAMP, "durration": 2.0}, "durration", "did you mean 'duration'"),
    ({"law": "ramp", "from": 0.0, "to": 10.0, "start": 0.0}, "duration", "missing"),
    ({**RAMP, "to": "10"}, "to", "expected a number"),
    ({**RAMP, "to": True}, "to", "expected a number"),
    ({**RAMP, "start": float("nan")}, "start", "finite"),
    ({**RAMP, "from": float("inf")}, "from", "finite"),
    ({**RAMP, "duration": 0.0}, "duration", "above 0"),
    ({**RAMP, "duration": -1.0}, "duration", "above 0"),
    ({**RAMP, "smoothing": -0.1}, "smoothing", "positive"),
    ({"law": "sine", "amplitude": 1.0}, "frequency", "exactly one"),
    ({"law": "sine", "amplitude": 1.0, "frequency": 1.0, "reduced_frequency": 0.1}, "reduced_frequency", "exactly one"),
    ({"law": "sine", "amplitude": 1.0, "frequency": 0.0}, "frequency", "above 0"),
    ({"law": "sine", "amplitude": 1.0, "reduced_frequency": -0.2}, "reduced_frequency", "above 0"),
    ({"law": "sine", "amplitude": 1.0, "reduced_frequency": 0.2}, "reduced_frequency", "speed"),
    ({"law": "step", "value": 1.0}, "time", "missing"),
    ({"law": "table", "file": 5}, "file", "text"),
    ([RAMP, {**RAMP, "duration": -2.0}], "[1].duration", "above 0"),
    ([RAMP, {"law": "constant"}], "[1].value", "missing"),
    ([RAMP, "x"], "[1].law", "law table"),
])
def test_bad_input_names_the_key(spec, key, needle):
    with pytest.raises(InputError) as err:
        build_law(spec)
    assert err.value.key == key and needle in err.value.message
    problems = law_problems(spec)
    assert problems and problems[0].key == key


def test_law_problems_collects_everything_and_accepts_good_input():
    spec = [{"law": "ramp", "form": 0.0, "to": "x", "start": False, "duration": 1.0},
            {"law": "sine", "amplitude": 1.0, "frequency": -1.0},
            {"law": "constant", "value": 2.0}]
    keys = [e.key for e in law_problems(spec)]
    assert keys == ["[0].form", "[0].to", "[0].start", "[0].from", "[1].frequency"]
    assert law_problems(RAMP) == []
    assert law_problems({"law": "sine", "amplitude": 2.0, "reduced_frequency": 0.1}, speed=10.0, chord=0.3) == []
    assert law_problems([RAMP, {"law": "constant", "value": 1}]) == []


def test_messages_are_one_line():
    for spec in ({"law": "rmap"}, {**RAMP, "durration": 1}, {**RAMP, "duration": -1}):
        assert "\n" not in law_problems(spec)[0].message


# --- kinematics --------------------------------------------------------------------------------

def test_kinematics_state_and_accel():
    pitch = build_law({"law": "sine", "amplitude": 6.0, "frequency": 1.5}, scale=DEG)
    plunge = build_law({"law": "ramp", "from": 0.0, "to": 0.05, "start": 0.1, "duration": 0.4, "smoothing": 0.05})
    kin = Kinematics(0.25, pitch, plunge)
    t = np.linspace(0, 1, 21)
    alpha, alpha_dot, h, h_dot = kin.state(t)
    alpha_ddot, h_ddot = kin.accel(t)
    assert np.allclose(alpha, pitch.value(t)) and np.allclose(alpha_dot, pitch.rate(t))
    assert np.allclose(h, plunge.value(t)) and np.allclose(h_dot, plunge.rate(t))
    assert np.allclose(alpha_ddot, pitch.accel(t)) and np.allclose(h_ddot, plunge.accel(t))
    assert kin.pivot == 0.25


def test_missing_motion_is_zero():
    kin = Kinematics(0.5)
    assert kin.state(0.3) == (0.0, 0.0, 0.0, 0.0) and kin.accel(0.3) == (0.0, 0.0)
    kin = Kinematics(0.0, plunge=build_law({"law": "constant", "value": 0.1}))
    assert kin.state(1.0) == (0.0, 0.0, 0.1, 0.0)
    with pytest.raises(InputError) as err:
        Kinematics(float("nan"))
    assert err.value.key == "pivot"


@pytest.mark.parametrize("interp", ["monotone", "linear"])
def test_table_law_does_not_overshoot_a_step_in_the_data(tmp_path, interp):
    # 0, 0, 10, 10 degrees: a not-a-knot cubic spline gave 11.2 and -3.0; a
    # shape-preserving interpolant (Fritsch & Carlson 1980) stays within the data
    f = tmp_path / "pitch.csv"
    f.write_text("t,value\n0,0\n1,0\n2,10\n3,10\n")
    law = build_law({"law": "table", "file": str(f), "interpolation": interp}, scale=1.0)
    t = np.linspace(-0.5, 3.5, 4001)
    q = law.value(t)
    assert q.min() >= -1e-12 and q.max() <= 10 + 1e-12
    assert law.value(1.5) == pytest.approx(5.0)
    # the rate is the interpolant's own derivative (central differences away from the points)
    tt = np.array([0.3, 1.25, 1.7, 2.4])
    fd = (law.value(tt + 1e-6) - law.value(tt - 1e-6)) / 2e-6
    assert np.allclose(law.rate(tt), fd, atol=1e-5)


def test_table_law_refuses_an_unknown_interpolation(tmp_path):
    f = tmp_path / "pitch.csv"
    f.write_text("t,value\n0,0\n1,1\n")
    problems = law_problems({"law": "table", "file": str(f), "interpolation": "cubic"})
    assert [p.key for p in problems] == ["interpolation"] and "monotone" in problems[0].message
