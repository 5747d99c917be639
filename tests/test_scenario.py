"""Scenario loading: defaults, overrides, and one clear line per problem."""

import math

import pytest

from unsteady.inputs.scenario import ScenarioError, load_scenario, default_dt

BASE = {
    "flow": {"speed": 12.0, "density": 1.2},
    "airfoil": {"shape": "naca2412", "chord": 0.25},
    "run": {"duration": 0.5},
}


def problems(d, overrides=None):
    with pytest.raises(ScenarioError) as ei:
        load_scenario(d, overrides)
    return {p.key: p.message for p in ei.value.problems}


def test_defaults_filled():
    sc = load_scenario(BASE)
    d = sc.data
    assert d["airfoil"]["elements"] == 40 and d["motion"]["pivot"] == 0.25
    assert d["run"]["wake"] == "free" and d["run"]["start"] == "steady"
    # default step: the air travels one mean element length (U dt = c / N)
    assert sc.dt == pytest.approx(0.25 / (12.0 * 40))
    assert sc.steps == math.ceil(0.5 / sc.dt - 1e-9)
    assert d["output"]["dir"] == "runs/scenario"


def test_chords_and_altitude_resolve():
    sc = load_scenario({"flow": {"speed": 10.0, "altitude": 1000.0},
                        "airfoil": {"chord": 0.2}, "run": {"chords": 5}})
    # U.S. Standard Atmosphere 1976 at 1000 m: 1.1117 kg/m^3 (from memory)
    assert sc.density == pytest.approx(1.1117, rel=1e-3)
    assert sc.duration == pytest.approx(5 * 0.2 / 10.0)


def test_fast_sine_refines_default_step():
    d = dict(BASE, motion={"pitch": {"law": "sine", "amplitude": 1.0, "reduced_frequency": 2.0}})
    sc = load_scenario(d)
    f = 2.0 * 12.0 / (math.pi * 0.25)
    assert sc.dt == pytest.approx(default_dt(0.25, 12.0, 40, f)) and sc.dt < 0.25 / (12.0 * 40)
    assert sc.dt * f == pytest.approx(1 / 120)


def test_overrides_parse_toml_values():
    sc = load_scenario(BASE, ["airfoil.elements=80", "run.wake=frozen", 'airfoil.shape="flat"'])
    assert sc.elements == 80 and sc.data["run"]["wake"] == "frozen" and sc.data["airfoil"]["shape"] == "flat"


def test_unknown_key_suggests_nearest():
    p = problems({**BASE, "flow": {"sped": 12.0, "density": 1.2}})
    assert "flow.sped" in p and "did you mean 'speed'" in p["flow.sped"]
    assert "flow.speed" not in p          # the missing speed is the misspelt key: one line, not two


@pytest.mark.parametrize("section,key,value", [
    ("flow", "speed", -3.0), ("flow", "speed", "fast"), ("flow", "speed", float("nan")),
    ("airfoil", "chord", 0.0), ("airfoil", "elements", 3), ("airfoil", "elements", 10.5),
    ("run", "duration", -1.0), ("run", "wake", "rolling"), ("run", "start", True),
])
def test_bad_values_named(section, key, value):
    d = {k: dict(v) for k, v in BASE.items()}
    d[section][key] = value
    p = problems(d)
    assert f"{section}.{key}" in p


def test_pivot_far_off_chord():
    assert "motion.pivot" in problems({**BASE, "motion": {"pivot": 3.0}})


def test_exactly_one_of_pairs():
    p = problems({**BASE, "flow": {"speed": 10.0, "density": 1.2, "altitude": 100.0}})
    assert "flow.density" in p and "exactly one" in p["flow.density"]
    p = problems({**BASE, "run": {}})
    assert "run.duration" in p


def test_all_problems_reported_together():
    p = problems({"flow": {"speed": -1}, "airfoil": {"chord": -1, "elements": 2}, "run": {"duration": 0}})
    assert {"flow.speed", "flow.density", "airfoil.chord", "airfoil.elements", "run.duration"} <= set(p)


def test_problem_line_format(tmp_path):
    f = tmp_path / "bad.toml"
    f.write_text("[flow]\nspeed = 0\ndensity = 1.2\n[airfoil]\nchord = 0.2\n[run]\nduration = 1\n")
    with pytest.raises(ScenarioError) as ei:
        load_scenario(f)
    line = ei.value.problems[0].line()
    assert line.startswith(f"error: {f}: flow.speed: ") and "\n" not in line


def test_malformed_toml(tmp_path):
    f = tmp_path / "broken.toml"
    f.write_text("[flow\nspeed = 3\n")
    with pytest.raises(ScenarioError) as ei:
        load_scenario(f)
    assert "not valid TOML" in str(ei.value)


def test_resolved_scenario_round_trips(tmp_path):
    sc = load_scenario(BASE, ["motion.pitch={law='ramp', from=0, to=5, start=0.1, duration=0.1}"])
    f = tmp_path / "resolved.toml"
    f.write_text(sc.to_toml())
    again = load_scenario(f)
    assert again.dt == sc.dt and again.data["motion"] == sc.data["motion"]


def test_override_one_of_a_pair_drops_the_other():
    # run.duration/run.chords and flow.density/flow.altitude: exactly one of each is
    # given, so --set of one replaces the other instead of failing
    sc = load_scenario(BASE, ["run.chords=5", "flow.altitude=1000"])
    assert sc.duration == pytest.approx(5 * 0.25 / 12.0)
    assert "altitude" in sc.data["flow"] and sc.density < 1.2
