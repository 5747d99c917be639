"""surface-pressure.png: the pressure coefficient on both surfaces of a thick section (surface panels)."""

from __future__ import annotations

import numpy as np

from .pictures import (LOOK, finish_figure, house_legend, house_style, new_figure, picture, pressure_instants,
                       run_title, warning_notes)


#: Most instants one surface-pressure picture shows.
MAX_INSTANTS = 6


def has_surface_pressure(result):
    """Whether the run holds surface pressures (a thick section)."""
    s = result.snapshots
    return "cp" in s and "x_surface" in s and len(s["cp"]) > 0


def rows_at(result, times):
    """History rows nearest to each time (s), in the given order."""
    t = np.asarray(result.history["t"], dtype=float)[:len(result.snapshots["cp"])]
    return [int(np.argmin(np.abs(t - float(x)))) for x in times]


@picture("surface-pressure.png")
def plot_surface_pressure(result, path, times=None):
    """Cp on the upper (solid) and lower (dashed) surface along the chord at a few instants.

    Drawn with negative Cp upwards, as the trade draws it (the axis says so);
    the instants are ``times`` (s, the nearest steps; ``unsteady pictures
    --surface-pressure-at``) or those of the pressure-jump picture (start,
    highest and lowest lift, end).  Only runs with ``[airfoil] thick = true``
    have it.
    """
    s = result.snapshots
    if not has_surface_pressure(result):
        return False
    cp = np.asarray(s["cp"], dtype=float)
    x = np.asarray(s["x_surface"], dtype=float)
    half = x.shape[0] // 2
    lower, upper = slice(0, half), slice(half, x.shape[0])
    h = result.history
    rows = rows_at(result, times) if times else [i for i in pressure_instants(h) if i < len(cp)]
    fig = new_figure(7.0, 4.6)
    ax = house_style(fig.add_subplot(111))
    colors = [LOOK["trace"], LOOK["ccw"], LOOK["cw"], LOOK["second"], LOOK["gust_up"], LOOK["muted"]]
    for c, i in zip(colors, rows):
        ax.plot(x[upper], cp[i, upper], color=c, lw=1.3,
                label=f"t = {h['t'][i]:.4g} s (cl = {h['cl'][i]:.3f}, pitch {h['pitch_deg'][i]:.1f} deg)")
        ax.plot(x[lower], cp[i, lower], color=c, lw=1.1, ls="--", label="_lower")
    ax.plot([], [], color=LOOK["muted"], lw=1.3, label="upper surface")
    ax.plot([], [], color=LOOK["muted"], lw=1.1, ls="--", label="lower surface")
    vals = cp[rows][np.isfinite(cp[rows])] if rows else np.zeros(1)
    lo, hi = (min(-1.0, float(vals.min())), max(1.0, float(vals.max()))) if vals.size else (-1.0, 1.0)
    pad = 0.06 * (hi - lo)
    ax.set_ylim(hi + pad, lo - pad)            # negative up
    ax.axhline(0.0, color=LOOK["muted"], lw=0.6)
    ax.set_xlim(0, 1)
    ax.set_xlabel("position along the chord x/c (leading edge 0, trailing edge 1)", fontsize=9)
    ax.set_ylabel("pressure coefficient Cp\n(negative up: suction at the top)", fontsize=9)
    house_legend(ax, loc="lower right")
    notes = ["outside pressure at each surface panel, unsteady Bernoulli equation (inviscid: no "
             "boundary layer, no separation; real peaks are lower and a real section stalls)"]
    notes += warning_notes(result)
    what = "pressure on both surfaces"
    if "cp_element" in s:                      # several elements: the one whose Cp was kept
        what += f" of element {int(s['cp_element'])}"
        notes.append("history cl: the whole assembly's; each element's own lift is cl_<i>")
    return finish_figure(fig, path, run_title(result, what), notes, left=0.9)
