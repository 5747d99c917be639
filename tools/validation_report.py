"""Run the validation cases of unsteady and write a Markdown report with pictures and an error table.

Usage: python tools/validation_report.py [OUT_DIR] [--skip-tests]   (default docs/validation)

It computes the model-against-reference cases below itself (pictures and
errors: Wagner, Kuessner, Theodorsen, the steady flap, a thick section, leading-edge
shedding, the ground), then
runs every test under tests/validation and lists each result, so the report
covers the core, gust, linear-model, leading-edge shedding, flap and ground,
thick-section and turbulence-statistics checks alike (each from its test).
"""

import math
import os
import shutil
import subprocess
import sys
import tempfile
import time
import xml.etree.ElementTree as ET
from pathlib import Path

import numpy as np

ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT))

import matplotlib  # noqa: E402

matplotlib.use("Agg")
import matplotlib.pyplot as plt  # noqa: E402

from unsteady import load_scenario, theory  # noqa: E402
from unsteady.core.cautions import MODEL_CAUTION  # noqa: E402
from unsteady.simulation.runner import simulate  # noqa: E402

U, C, RHO = 10.0, 0.2, 1.2


def _sc(extra, model="vortex", elements=40, chords=20.0, wake="frozen"):
    d = {"flow": {"speed": U, "density": RHO},
         "airfoil": {"shape": "flat", "chord": C, "elements": elements},
         "motion": {"pivot": 0.25},
         "run": {"chords": chords, "model": model, "wake": wake}}
    for k, v in extra.items():
        if k in d:
            d[k].update(v)
        else:
            d[k] = v
    return load_scenario(d)


def case_wagner(out):
    """Sudden start at 2 deg: cl / (2 pi alpha) against Wagner's phi (Wagner 1925; exact values per Garrick 1938)."""
    rows, fig = [], plt.figure(figsize=(7, 4))
    amp = 2.0
    for model, col in (("vortex", "#23395b"), ("linear", "#c0392b")):
        sc = _sc({"motion": {"pitch": {"law": "constant", "value": amp}},
                  "run": {"start": "impulsive", "chords": 15.5}}, model=model)
        h = simulate(sc).history
        s = 2 * U * h["t"] / C
        sel = (s >= 1.0) & (s <= 30.0)
        ratio = h["cl"] / (2 * math.pi * math.radians(amp))
        err = float(np.max(np.abs(ratio[sel] / theory.wagner(s[sel]) - 1.0)))
        rows.append((f"Wagner function, sudden start, {model} model",
                     "max abs(cl/(2 pi alpha) / phi(s) - 1), s = 1-30",
                     err, 0.002 if model == "linear" else 0.005, "H. Wagner, ZAMM 5 (1925); Garrick, NACA Rep. 629"))
        plt.plot(s[sel], ratio[sel], color=col, lw=1.2, label=f"{model} model")
    ss = np.linspace(0, 40, 400)
    plt.plot(ss, theory.wagner(ss), "k--", lw=1, label="Wagner phi(s) (exact)")
    _finish(fig, out / "wagner.png", "s = 2Ut/c (semichords)", "cl / (2 pi alpha)", "Sudden start at 2 deg")
    return rows, "wagner.png"


def _finish(fig, path, xlabel, ylabel, title):
    """Label the one axis of ``fig``, give it a legend and grid, save it to ``path`` and close it."""
    plt.xlabel(xlabel)
    plt.ylabel(ylabel)
    plt.legend(fontsize=8)
    plt.grid(alpha=0.3)
    plt.title(title)
    fig.tight_layout()
    fig.savefig(path, dpi=100)
    plt.close(fig)


def case_kuessner(out):
    """Sharp-edged gust: cl / (2 pi w0/U) against Kuessner's psi (Kuessner 1936)."""
    rows, fig = [], plt.figure(figsize=(7, 4))
    w0, arrival = 0.2, 0.02
    for model, col in (("vortex", "#23395b"), ("linear", "#c0392b")):
        sc = _sc({"gust": {"profile": "sharp-edged", "amplitude": w0, "arrival": arrival}}, model=model)
        h = simulate(sc).history
        s = 2 * U * (h["t"] - arrival) / C
        sel = s > 2.0
        ratio = h["cl"] / (2 * math.pi * w0 / U)
        err = float(np.max(np.abs(ratio[sel] - theory.kuessner(s[sel]))))
        rows.append((f"Kuessner sharp-edged gust, {model} model", "max abs(cl/(2 pi w0/U) - psi(s)), s > 2",
                     err, 0.01, "H. G. Kuessner, Luftfahrtforschung 13 (1936)"))
        plt.plot(s[s > 0], ratio[s > 0], color=col, lw=1.2, label=f"{model} model")
    ss = np.linspace(0, 40, 400)
    plt.plot(ss, theory.kuessner(ss), "k--", lw=1, label="Kuessner psi(s) (exact)")
    _finish(fig, out / "kuessner.png", "s since the front met the leading edge (semichords)", "cl / (2 pi w0 / U)", "Sharp-edged gust")
    return rows, "kuessner.png"


def _first_harmonic(t, y, omega, periods):
    sel = t > t[-1] - periods * 2 * math.pi / omega
    return 2 * np.mean(y[sel] * np.exp(-1j * omega * t[sel]))


def case_theodorsen(out):
    """Harmonic pitch about the quarter chord: |cl| and phase against Theodorsen (NACA Rep. 496)."""
    rows = []
    ks = [0.05, 0.1, 0.2, 0.5, 1.0, 2.0]
    amp = math.radians(1.0)
    res = {"linear": [], "vortex": []}
    for model in res:
        for k in ks:
            if model == "vortex" and k not in (0.1, 0.5):
                res[model].append(np.nan)
                continue
            period_chords = math.pi / k
            n_per = 6 if model == "linear" else 3
            sc = _sc({"motion": {"pitch": {"law": "sine", "amplitude": 1.0, "reduced_frequency": k}}},
                     model=model, elements=20, chords=n_per * period_chords)
            if model == "linear":      # a whole number of samples per period
                sc = sc.with_overrides({"run.dt": 2 * math.pi / (2 * U * k / C) / 200})
            h = simulate(sc).history
            omega = 2 * U * k / C
            cl_hat = _first_harmonic(h["t"], h["cl"], omega, 1)
            ref, _ = theory.theodorsen_loads(k, -1j * amp, 0.0, 0.25)
            res[model].append(cl_hat / ref)
            rows.append((f"Theodorsen pitch k = {k:g}, {model} model", "abs(amplitude ratio - 1)",
                         abs(abs(cl_hat) / abs(ref) - 1), 0.005 if model == "linear" else 0.02,
                         "T. Theodorsen, NACA Report 496 (1935)"))
            rows.append((f"Theodorsen pitch k = {k:g}, {model} model", "abs(phase error) (deg)",
                         abs(math.degrees(np.angle(cl_hat / ref))), 0.5 if model == "linear" else 2.0,
                         "T. Theodorsen, NACA Report 496 (1935)"))
    kk = np.geomspace(0.03, 3, 200)
    ref, _ = theory.theodorsen_loads(kk, -1j * amp, 0.0, 0.25)
    fig, (a1, a2) = plt.subplots(1, 2, figsize=(9, 3.6))
    a1.semilogx(kk, np.abs(ref) / amp, "k--", lw=1, label="Theodorsen")
    a2.semilogx(kk, np.degrees(np.angle(ref / (-1j * amp))), "k--", lw=1)
    for model, mk in (("linear", "o"), ("vortex", "s")):
        r = np.array(res[model])
        ref_k, _ = theory.theodorsen_loads(np.array(ks), -1j * amp, 0.0, 0.25)
        z = r * ref_k
        a1.semilogx(ks, np.abs(z) / amp, mk, label=f"{model} model")
        a2.semilogx(ks, np.degrees(np.angle(z / (-1j * amp))), mk)
    a1.set_xlabel("k")
    a1.set_ylabel("|cl| per radian")
    a2.set_xlabel("k")
    a2.set_ylabel("phase of cl over alpha (deg)")
    a1.legend(fontsize=8)
    for a in (a1, a2):
        a.grid(alpha=0.3)
    fig.tight_layout()
    fig.savefig(out / "theodorsen.png", dpi=100)
    plt.close(fig)
    return rows, "theodorsen.png"


def case_flap(out):
    """Steady plain flap deflected 2 deg, hinge at 60, 75, 90 % of the chord (80 elements): dcl/dbeta
    against thin-airfoil theory, 2 (pi - theta_h + sin theta_h), cos theta_h = 1 - 2 x_h (H. Glauert,
    The Elements of Aerofoil and Airscrew Theory, 1926)."""
    rows, got = [], []
    beta = 2.0
    hinges = (0.6, 0.75, 0.9)
    for xh in hinges:
        sc = _sc({"airfoil": {"flap_hinge": xh}, "motion": {"flap": {"law": "constant", "value": beta}},
                  "run": {"start": "steady", "chords": 0.5}}, elements=80)
        cl0 = float(simulate(sc).history["cl"][0])
        th = math.acos(1.0 - 2.0 * xh)
        ref = 2.0 * (math.pi - th + math.sin(th))
        got.append(cl0 / math.radians(beta))
        rows.append((f"steady flap, hinge at {xh:g} c, vortex model", "abs(dcl/dbeta / Glauert - 1)",
                     abs(got[-1] / ref - 1.0), 0.02, "H. Glauert (1926); Abbott & von Doenhoff (1959)"))
    xx = np.linspace(0.5, 0.98, 100)
    th = np.arccos(1.0 - 2.0 * xx)
    fig = plt.figure(figsize=(7, 4))
    plt.plot(xx, 2.0 * (np.pi - th + np.sin(th)), "k--", lw=1, label="thin-airfoil theory (Glauert)")
    plt.plot(hinges, got, "o", color="#23395b", label="vortex model, 80 elements")
    _finish(fig, out / "flap.png", "hinge position x_h / c", "dcl / dbeta (per radian)", "Steady plain flap")
    return rows, "flap.png"


def case_thick(out):
    """Thick section on surface panels: NACA 2412 at 10 deg, 300 panels, steady; cl against the
    inviscid value 1.456 commonly quoted in the trade (from memory, no single source), and the
    surface pressure the model computes."""
    d = {"flow": {"speed": U, "density": RHO},
         "airfoil": {"shape": "naca2412", "chord": C, "thick": True, "elements": 300},
         "motion": {"pivot": 0.25, "pitch": {"law": "constant", "value": 10.0}},
         "run": {"chords": 0.3, "start": "steady"}, "output": {"plots": False}}
    res = simulate(load_scenario(d))
    cl0 = float(res.history["cl"][0])
    rows = [("NACA 2412 at 10 deg, thick (300 panels)", "abs(cl / 1.456 - 1)", abs(cl0 / 1.456 - 1.0), 0.02,
             "commonly quoted inviscid cl (common practice)")]
    sn = res.snapshots
    fig = plt.figure(figsize=(7, 4))
    plt.plot(np.asarray(sn["x_surface"]), np.asarray(sn["cp"][0], float), color="#23395b", lw=1.2,
             label=f"vortex model, surface panels: cl = {cl0:.4f}")
    plt.gca().invert_yaxis()
    _finish(fig, out / "thick.png", "x / c", "Cp (upward: suction)", "NACA 2412 at 10 deg, inviscid surface pressure")
    return rows, "thick.png"


def case_lev(out):
    """Leading-edge shedding: a flat plate pitched 45 deg about its leading edge at alpha_dot c / (2U)
    = 0.2, then held (40 elements, free wake, lesp_critical 0.18), against the same run with the
    leading edge kept attached. While it sheds, |LESP| is held at the critical value (the criterion
    of K. Ramesh et al., J. Fluid Mech. 751, 2014); the steady LESP of a flat plate at 4 deg against
    thin-airfoil A0 = alpha (Abbott & von Doenhoff, 1959)."""
    k, crit, dt, chords = 0.2, 0.18, 3.125e-4, 8.0
    ramp = math.radians(45.0) / (2.0 * k * U / C)

    def run(critical, pitch, n_chords, pivot=0.0):
        d = {"flow": {"speed": U, "density": RHO}, "airfoil": {"chord": C, "elements": 40},
             "motion": {"pivot": pivot, "pitch": pitch}, "run": {"chords": n_chords, "dt": dt, "wake": "free"},
             "output": {"plots": False}}
        if critical is not None:
            d["airfoil"]["lesp_critical"] = critical
        return simulate(load_scenario(d))

    law = {"law": "ramp", "from": 0.0, "to": 45.0, "start": 0.0, "duration": ramp, "smoothing": 0.01}
    lev, att = run(crit, law, chords), run(None, law, chords)
    h = lev.history
    shed = np.diff(h["gamma_lev"], prepend=0.0) != 0.0
    held_err = float(np.abs(np.abs(h["lesp"][shed]) - crit).max() / crit)
    steady = float(run(None, {"law": "constant", "value": 4.0}, 0.05, pivot=0.25).history["lesp"][0])
    rows = [("flat plate at 4 deg, steady, vortex model", "abs(LESP / A0 - 1), A0 = alpha",
             abs(steady / math.radians(4.0) - 1.0), 0.01, "Abbott & von Doenhoff (1959), ch. 4"),
            ("45-deg pitch-up, k = 0.2, while shedding", "max abs(abs(LESP) / critical - 1)",
             held_err, 0.01, "Ramesh et al. (2014), the shedding criterion")]
    onset = lev.summary["lev_onset_t"]
    fig, (ax, bx) = plt.subplots(2, 1, figsize=(7, 6), sharex=True)
    s_l, s_a = h["chords"], att.history["chords"]
    ax.plot(s_a, att.history["cl"], "k--", lw=1, label="leading edge kept attached")
    ax.plot(s_l, h["cl"], color="#23395b", lw=1.2, label=f"shedding, lesp_critical = {crit:g}")
    if onset is not None:
        s_on = float(np.interp(onset, h["t"], s_l))
        for a in (ax, bx):
            a.axvline(s_on, color="#b5523b", lw=0.8, ls=":")
        ax.annotate("onset", (s_on, ax.get_ylim()[1] * 0.9), color="#b5523b", fontsize=8,
                    xytext=(4, 0), textcoords="offset points")
    ax.set_ylabel("cl")
    ax.legend(fontsize=8)
    ax.grid(alpha=0.3)
    ax.set_title("45-deg pitch-up about the leading edge, k = 0.2, then held")
    bx.plot(s_a, att.history["lesp"], "k--", lw=1)
    bx.plot(s_l, h["lesp"], color="#23395b", lw=1.2)
    bx.axhline(crit, color="#b5523b", lw=0.8)
    bx.set_ylabel("LESP")
    bx.set_xlabel("chords travelled")
    bx.grid(alpha=0.3)
    fig.tight_layout()
    fig.savefig(out / "leading-edge.png", dpi=100)
    plt.close(fig)
    return rows, "leading-edge.png"


def case_ground(out):
    """Flat ground by the method of images: one lumped-vortex element (vortex at c/4, no-penetration
    at 3c/4) parallel to the ground at height h carries Gamma_g / Gamma_inf = (1/4 + 4 (h/c)^2) /
    (4 (h/c)^2) (the image's downwash at the three-quarter point; J. Katz & A. Plotkin, Low-Speed
    Aerodynamics, 2001, sec. 11.1, worked out in tests/validation/test_ground_classical.py); the
    40-element plate at 4 deg rises less: the image's upwash varies about linearly along the chord
    about the quarter chord, which a continuous plate's lift hardly feels (thin-airfoil theory) but
    the lumped element's one point at 3c/4 does (no closed form for it here, shown for comparison)."""
    rows = []
    hc = np.array([0.25, 0.35, 0.5, 0.75, 1.0, 1.5, 2.0])
    ratio = (0.25 + 4 * hc ** 2) / (4 * hc ** 2)

    def cl(elements, alpha, height):
        d = {"flow": {"speed": U, "density": RHO}, "airfoil": {"chord": C, "elements": elements},
             "motion": {"pivot": 0.25, "pitch": {"law": "constant", "value": alpha}},
             "run": {"chords": 0.05, "start": "steady"}, "output": {"plots": False}}
        if height is not None:
            d["ground"] = {"height": height}
        return float(simulate(load_scenario(d)).history["cl"][0])

    def lumped(height):
        """Bound circulation of one element (2 nodes) held at 0.3 deg, the ground ``height`` below c/4."""
        from unsteady.vortex.bodies import Body
        from unsteady.vortex.ground import Ground
        from unsteady.vortex.solver import VortexSolver
        got = []

        class Held:
            def state(self, t):
                return (math.radians(0.3), 0.0, 0.0, 0.0)

            def after_step(self, *a):
                pass

        class Last:
            def on_step(self, st):
                got.append(float(st.gamma_bound.sum()))

        VortexSolver([Body.from_nodes(np.array([0.0, 1.0]), np.zeros(2), C, 0.25)], Held(), speed=U,
                     density=RHO, dt=0.002, steps=0,
                     ground=None if height is None else Ground(-height)).run([Last()])
        return got[0]

    one = np.array([lumped(x * C) for x in hc]) / lumped(None)
    many = np.array([cl(40, 4.0, x * C) for x in hc]) / cl(40, 4.0, None)
    for x, got, ref in zip(hc, one, ratio):
        if x in (0.5, 1.0, 2.0):
            rows.append((f"one lumped-vortex element at h/c = {x:g}, 0.3 deg", "abs(cl ratio / formula - 1)",
                         abs(got / ref - 1.0), 0.002, "Katz & Plotkin (2001), sec. 11.1 (method of images)"))
    fig = plt.figure(figsize=(7, 4))
    fine = np.linspace(0.22, 2.1, 200)
    plt.plot(fine, (0.25 + 4 * fine ** 2) / (4 * fine ** 2), "k--", lw=1, label="one lumped vortex, image formula")
    plt.plot(hc, one, "o", color="#23395b", label="vortex model, 1 element, 0.3 deg")
    plt.plot(hc, many, "s-", color="#7a8b99", ms=4, lw=1, label="vortex model, 40 elements, 4 deg")
    _finish(fig, out / "ground.png", "height of the quarter chord above the ground, h / c", "cl in ground effect / cl in free air", "Flat plate near a flat ground (method of images)")
    return rows, "ground.png"


def run_validation_tests(out):
    """Run pytest on tests/validation; one row per test (pass/fail, time)."""
    xml = out / "junit.xml"
    subprocess.run([sys.executable, "-m", "pytest", "-q", "-p", "no:cacheprovider",
                    str(ROOT / "tests" / "validation"), f"--junitxml={xml}"],
                   cwd=ROOT, capture_output=True, text=True)
    rows = []
    if xml.exists():
        for tc in ET.parse(xml).getroot().iter("testcase"):
            failed = tc.find("failure") is not None or tc.find("error") is not None
            rows.append((tc.get("classname", "").split(".")[-1], tc.get("name"),
                         "FAIL" if failed else ("skip" if tc.find("skipped") is not None else "pass"),
                         float(tc.get("time", 0))))
        xml.unlink()
    return rows


def main(argv):
    args = [a for a in argv[1:] if not a.startswith("--")]
    out = Path(args[0]) if args else ROOT / "docs" / "validation"
    out.parent.mkdir(parents=True, exist_ok=True)
    tmp = Path(tempfile.mkdtemp(prefix=f".{out.name}.", dir=out.parent))
    try:
        t0 = time.perf_counter()
        sections, rows = [], []
        for case in (case_wagner, case_kuessner, case_theodorsen, case_flap, case_thick, case_lev,
                     case_ground):
            if sys.stderr.isatty():
                print(f"validation: {case.__name__} ...", file=sys.stderr)
            r, png = case(tmp)
            rows += r
            sections.append((" ".join(case.__doc__.split()), png))
        tests = [] if "--skip-tests" in argv else run_validation_tests(tmp)
        lines = ["# Validation report of `unsteady`", "",
                 f"Generated by `tools/validation_report.py` in {time.perf_counter() - t0:.0f} s.", "",
                 f"> {MODEL_CAUTION}", "",
                 "## Errors against published references", "",
                 "| case | measure | error | target | source | ok |", "|---|---|---|---|---|---|"]
        for name, measure, err, target, src in rows:
            lines.append(f"| {name} | {measure} | {err:.3g} | {target:g} | {src} | "
                         f"{'yes' if err <= target else '**no**'} |")
        lines += ["", "## Pictures", ""]
        for title, png in sections:
            lines += [f"### {title}", "", f"![{title}]({png})", ""]
        lines += ["## Every test under tests/validation", "",
                  "| file | test | result | time (s) |", "|---|---|---|---|"]
        lines += [f"| {f} | `{n}` | {r} | {tt:.2f} |" for f, n, r, tt in tests]
        (tmp / "README.md").write_text("\n".join(lines) + "\n")
        if out.exists():
            shutil.rmtree(out)
        os.rename(tmp, out)
    except BaseException:
        shutil.rmtree(tmp, ignore_errors=True)
        raise
    print(f"{out / 'README.md'}: {sum(e <= t for *_, e, t, _s in rows)}/{len(rows)} reference checks "
          f"within target; {sum(r == 'pass' for _f, _n, r, _t in tests)}/{len(tests)} validation tests pass")


if __name__ == "__main__":
    main(sys.argv)
