"""Sections, coordinate files, cosine spacing and camber-line elements (unsteady.geometry)."""

import math

import numpy as np
import pytest
from scipy.integrate import quad

from unsteady.core.errors import InputError
from unsteady.inputs.sections import (
    CamberPanels,
    CoordinateSection,
    FlatPlate,
    Naca4,
    camber_elements,
    cosine_nodes,
    naca4_half_thickness,
    section_from_shape,
)


# --- the published equations, written out independently of the module -------------------

def report460_mean_line(m, p, x):
    """NACA 4-digit mean line, Jacobs, Ward & Pinkerton, NACA Report 460 (1933), one point at a time."""
    if m == 0 or p == 0:
        return 0.0
    if x < p:
        return m / p**2 * (2 * p * x - x**2)
    return m / (1 - p) ** 2 * ((1 - 2 * p) + 2 * p * x - x**2)


def report460_thickness(t, x, a4=-0.1036):
    """NACA 4-digit half-thickness, NACA Report 460 (a4 = -0.1015 as published; -0.1036 closes the trailing edge)."""
    return 5 * t * (0.2969 * math.sqrt(x) - 0.1260 * x - 0.3516 * x**2 + 0.2843 * x**3 + a4 * x**4)


def naca_surfaces(m, p, t, n=81, a4=-0.1036):
    """Upper and lower surface points, thickness laid off perpendicular to the mean line (Report 460)."""
    xu, zu, xl, zl = [], [], [], []
    h = 1e-7
    for i in range(n):
        x = 0.5 * (1 - math.cos(math.pi * i / (n - 1)))
        zc = report460_mean_line(m, p, x)
        a, b = max(x - h, 0.0), min(x + h, 1.0)
        theta = math.atan((report460_mean_line(m, p, b) - report460_mean_line(m, p, a)) / (b - a))
        yt = report460_thickness(t, x, a4)
        xu.append(x - yt * math.sin(theta))
        zu.append(zc + yt * math.cos(theta))
        xl.append(x + yt * math.sin(theta))
        zl.append(zc - yt * math.cos(theta))
    return np.array(xu), np.array(zu), np.array(xl), np.array(zl)


def write_points(path, x, z, head="", sep=" ", digits=6):
    path.write_text(head + "".join(f"{a:.{digits}f}{sep}{b:.{digits}f}\n" for a, b in zip(x, z)))
    return path


def loop_order(xu, zu, xl, zl):
    """Trailing edge -> upper -> leading edge -> lower -> trailing edge."""
    return np.r_[xu[::-1], xl[1:]], np.r_[zu[::-1], zl[1:]]


X_CHECK = np.linspace(0.0, 1.0, 1001)


# --- NACA 4-digit ---------------------------------------------------------------------------

@pytest.mark.parametrize("digits", ["2412", "4415", "6309", "1408", "2312"])
def test_naca_mean_line_matches_report460(digits):
    sec = Naca4.from_digits(digits)
    m, p = int(digits[0]) / 100, int(digits[1]) / 10
    expected = [report460_mean_line(m, p, x) for x in X_CHECK]  # Report 460 mean line
    assert np.allclose(sec.camber(X_CHECK), expected, atol=1e-15, rtol=1e-13)


def test_naca2412_mean_line_hand_values():
    # evaluated by hand from the Report 460 equations: m = 0.02, p = 0.4
    sec = Naca4.from_digits("2412")
    assert sec.camber(0.4) == pytest.approx(0.02, abs=1e-15)  # the maximum camber m at x = p
    assert sec.camber(0.2) == pytest.approx(0.02 / 0.16 * (0.08 * 2 - 0.04), abs=1e-15)  # 0.015
    assert sec.camber(0.7) == pytest.approx(0.02 / 0.36 * (0.2 + 0.56 - 0.49), abs=1e-15)  # 0.015
    assert sec.camber(0.0) == 0.0 and sec.camber(1.0) == pytest.approx(0.0, abs=1e-16)
    assert sec.name == "NACA 2412" and sec.thickness == 0.12


@pytest.mark.parametrize("digits", ["2412", "4415", "6309", "9512"])
def test_naca_slope_matches_central_differences(digits):
    sec = Naca4.from_digits(digits)
    m, p = int(digits[0]) / 100, int(digits[1]) / 10
    h = 1e-6
    x = np.linspace(0.01, 0.99, 197)
    x = x[np.abs(x - p) > 2 * h]
    fd = np.array([(report460_mean_line(m, p, xi + h) - report460_mean_line(m, p, xi - h)) / (2 * h) for xi in x])
    assert np.allclose(sec.slope(x), fd, rtol=1e-6, atol=1e-8)  # common practice: central differences
    # the slope is continuous through x = p, where it vanishes (Report 460: maximum camber at p)
    assert sec.slope(p - 1e-12) == pytest.approx(0.0, abs=1e-9) and sec.slope(p) == pytest.approx(0.0, abs=1e-12)


@pytest.mark.parametrize("digits", ["0012", "0006", "2012", "0412"])
def test_symmetric_sections_have_a_flat_mean_line(digits):
    # m = 0 or p = 0: a symmetrical section (Report 460)
    sec = Naca4.from_digits(digits)
    assert np.all(sec.camber(X_CHECK) == 0.0) and np.all(sec.slope(X_CHECK) == 0.0)


def test_thin_airfoil_zero_lift_angle_of_naca2412():
    # alpha_L0 = -(1/pi) int_0^pi dz/dx (cos th - 1) dth (Abbott & von Doenhoff 1959, ch. 4);
    # about -2.08 deg for the NACA 2412 mean line (from memory)
    sec = Naca4.from_digits("2412")
    th_p = math.acos(1 - 2 * sec.p)
    val = -quad(lambda th: sec.slope(0.5 * (1 - math.cos(th))) * (math.cos(th) - 1), 0, math.pi, points=[th_p])[0] / math.pi
    assert math.degrees(val) == pytest.approx(-2.08, abs=0.01)


def test_naca_thickness_equation():
    t = 0.12
    x = np.linspace(0.0, 1.0, 2001)
    assert np.allclose(naca4_half_thickness(x, t), [report460_thickness(t, xi) for xi in x], atol=1e-15)
    assert np.allclose(naca4_half_thickness(x, t, closed=False), [report460_thickness(t, xi, -0.1015) for xi in x],
                       atol=1e-15)
    # maximum thickness t at 30 % chord (Report 460)
    yt = naca4_half_thickness(x, t)
    assert 2 * yt.max() == pytest.approx(t, rel=2e-3) and x[np.argmax(yt)] == pytest.approx(0.30, abs=0.01)
    # closed trailing edge with -0.1036 (common practice); 2 y_t(1) = 10 t * 0.0021 with the published -0.1015
    assert naca4_half_thickness(1.0, t) == pytest.approx(0.0, abs=1e-15)
    assert 2 * naca4_half_thickness(1.0, t, closed=False) == pytest.approx(0.021 * t, rel=1e-9)
    # leading-edge radius r = 1.1019 t^2 (Abbott & von Doenhoff 1959, from memory): y_t^2 -> 2 r x as x -> 0
    xs = 1e-10
    assert naca4_half_thickness(xs, t) ** 2 / (2 * xs) == pytest.approx(1.1019 * t**2, rel=1e-4)


def test_naca_outline_lays_thickness_perpendicular_to_mean_line():
    # Report 460 construction: upper and lower points at +-y_t along the mean-line normal
    sec = Naca4.from_digits("4412")
    xu, zu, xl, zl = sec.outline(101)
    x = cosine_nodes(100)
    assert len(xu) == 101
    assert np.allclose(0.5 * (xu + xl), x, atol=1e-15) and np.allclose(0.5 * (zu + zl), sec.camber(x), atol=1e-15)
    assert np.allclose(0.5 * np.hypot(xu - xl, zu - zl), naca4_half_thickness(x, 0.12), atol=1e-15)
    # the segment from lower to upper point is perpendicular to the mean-line tangent
    tangent = np.stack([np.ones_like(x), sec.slope(x)])
    assert np.allclose((xu - xl) * tangent[0] + (zu - zl) * tangent[1], 0.0, atol=1e-15)


def test_flat_plate_outline_is_one_percent_thick():
    plate = FlatPlate()
    assert np.all(plate.camber(X_CHECK) == 0.0) and np.all(plate.slope(X_CHECK) == 0.0)
    xu, zu, xl, zl = plate.outline()
    assert len(xu) == 121 and xu[0] == 0.0 and xu[-1] == 1.0
    assert np.max(zu - zl) == pytest.approx(0.01, rel=2e-3)  # a 1 % thick picture
    assert np.all(zu >= zl)


def test_naca_rejects_out_of_range_parameters():
    with pytest.raises(InputError) as err:
        Naca4(0.02, 1.2, 0.12)
    assert err.value.key == "shape"
    with pytest.raises(InputError):
        Naca4(float("nan"), 0.4, 0.12)


# --- section_from_shape ------------------------------------------------------------------------

@pytest.mark.parametrize("shape,name", [("flat", "flat plate"), ("FLAT", "flat plate"), ("naca2412", "NACA 2412"),
                                        ("NACA0012", "NACA 0012"), ("Naca4415", "NACA 4415"),
                                        ("NACA 2412", "NACA 2412")])
def test_shape_names(shape, name):
    assert section_from_shape(shape).name == name


@pytest.mark.parametrize("shape", ["naca241", "naca24120", "nacaXXXX", "plate-ish", "", "   ", 2412, None,
                                   "missing-file.dat"])
def test_unknown_shapes_are_input_errors(shape):
    with pytest.raises(InputError) as err:
        section_from_shape(shape)
    assert err.value.key == "shape"
    assert '"flat"' in err.value.message and "NACA 4-digit" in err.value.message


def test_near_miss_of_flat_is_suggested():
    with pytest.raises(InputError, match='did you mean "flat"'):
        section_from_shape("flatt")


def test_shape_path_is_relative_to_base_dir(tmp_path):
    xs, zs = loop_order(*naca_surfaces(0.02, 0.4, 0.12))
    sub = tmp_path / "wing"
    sub.mkdir()
    write_points(sub / "root.dat", xs, zs, head="Root section\n")
    sec = section_from_shape("root.dat", base_dir=sub)
    assert isinstance(sec, CoordinateSection) and sec.name == "Root section"
    with pytest.raises(InputError):
        section_from_shape("root.dat", base_dir=tmp_path)


# --- coordinate files ---------------------------------------------------------------------------

def _max_camber_error(sec, m, p):
    expected = np.array([report460_mean_line(m, p, x) for x in X_CHECK])
    return float(np.max(np.abs(sec.camber(X_CHECK) - expected)))


@pytest.mark.parametrize("layout", ["loop", "loop-title", "blocks-counts", "blocks", "blocks-csv", "lower-first"])
@pytest.mark.parametrize("digits", ["2412", "4415", "6309"])
def test_coordinate_file_recovers_naca_mean_line(tmp_path, layout, digits):
    m, p, t = int(digits[0]) / 100, int(digits[1]) / 10, int(digits[2:]) / 100
    xu, zu, xl, zl = naca_surfaces(m, p, t, n=81)
    f = tmp_path / f"naca{digits}.dat"
    if layout == "loop":
        write_points(f, *loop_order(xu, zu, xl, zl))
    elif layout == "loop-title":
        write_points(f, *loop_order(xu, zu, xl, zl), head=f"NACA {digits} from Report 460\n")
    elif layout == "blocks-counts":
        write_points(f, np.r_[xu, xl], np.r_[zu, zl], head=f"NACA {digits}\n       81.       81.\n\n")
    elif layout == "blocks":
        write_points(f, np.r_[xu, xl], np.r_[zu, zl])
    elif layout == "blocks-csv":
        write_points(f, np.r_[xu, xl], np.r_[zu, zl], head="x,z\n", sep=",")
    else:  # trailing edge -> lower -> leading edge -> upper -> trailing edge
        write_points(f, np.r_[xl[::-1], xu[1:]], np.r_[zl[::-1], zu[1:]])
    sec = CoordinateSection(f)
    # the brief: camber line within 1e-3 chord of Report 460 (we get a few 1e-4)
    assert _max_camber_error(sec, m, p) < 1e-3
    # slope of the smooth fit against the exact Report 460 slope, away from the nose
    x = np.linspace(0.05, 0.95, 91)
    assert np.max(np.abs(sec.slope(x) - Naca4(m, p, t).slope(x))) < 0.02
    assert sec.camber(0.0) == pytest.approx(0.0, abs=1e-12) and sec.camber(1.0) == pytest.approx(0.0, abs=1e-12)
    assert sec.thickness == pytest.approx(t, abs=2e-3)
    if "title" in layout or "counts" in layout:
        assert sec.name.startswith(f"NACA {digits}")


def test_coordinate_file_slope_is_the_derivative_of_its_camber(tmp_path):
    f = write_points(tmp_path / "s.dat", *loop_order(*naca_surfaces(0.04, 0.4, 0.12, n=61)))
    sec = CoordinateSection(f)
    h = 1e-6
    x = np.linspace(0.002, 0.998, 300)
    fd = (sec.camber(x + h) - sec.camber(x - h)) / (2 * h)  # common practice: central differences
    assert np.allclose(sec.slope(x), fd, rtol=1e-5, atol=1e-6)


def test_coordinate_file_zero_lift_angle_close_to_the_equations(tmp_path):
    # thin-airfoil alpha_L0 (Abbott & von Doenhoff 1959, ch. 4) from the file's camber vs. Report 460's
    f = write_points(tmp_path / "s.dat", *loop_order(*naca_surfaces(0.02, 0.4, 0.12, n=81)))
    sec = CoordinateSection(f)

    def alpha_l0(s):
        g = lambda th: s.slope(0.5 * (1 - math.cos(th))) * (math.cos(th) - 1)  # noqa: E731
        return -quad(g, 0, math.pi, points=[math.acos(0.2)], limit=200)[0] / math.pi

    assert math.degrees(alpha_l0(sec)) == pytest.approx(math.degrees(alpha_l0(Naca4(0.02, 0.4, 0.12))), abs=0.02)


def test_symmetric_coordinate_file_is_flat(tmp_path):
    f = write_points(tmp_path / "s.dat", *loop_order(*naca_surfaces(0.0, 0.0, 0.12, n=81)))
    sec = CoordinateSection(f)
    assert np.max(np.abs(sec.camber(X_CHECK))) < 1e-6
    assert sec.incidence == pytest.approx(0.0, abs=1e-6) and sec.chord == pytest.approx(1.0, abs=1e-6)


@pytest.mark.parametrize("angle_deg", [-7.0, 12.0, 30.0])
def test_scaled_shifted_rotated_file_is_normalised(tmp_path, angle_deg):
    xs, zs = loop_order(*naca_surfaces(0.02, 0.4, 0.12, n=81))
    plain = CoordinateSection(write_points(tmp_path / "plain.dat", xs, zs, digits=8))
    a, c, x0, z0 = math.radians(angle_deg), 250.0, 1200.0, -35.0  # millimetres, chord tilted nose-up by angle
    xr = x0 + c * (xs * math.cos(a) + zs * math.sin(a))
    zr = z0 + c * (-xs * math.sin(a) + zs * math.cos(a))
    sec = CoordinateSection(write_points(tmp_path / "tilted.dat", xr, zr, digits=6))
    assert np.max(np.abs(sec.camber(X_CHECK) - plain.camber(X_CHECK))) < 1e-6
    assert sec.chord == pytest.approx(c * plain.chord, rel=1e-7)
    assert math.degrees(sec.incidence - plain.incidence) == pytest.approx(angle_deg, abs=1e-5)
    assert _max_camber_error(sec, 0.02, 0.4) < 1e-3  # Report 460 mean line


def test_open_trailing_edge_and_coarse_files(tmp_path):
    # published thickness coefficient -0.1015: a small open trailing edge (Report 460)
    f = write_points(tmp_path / "open.dat", *loop_order(*naca_surfaces(0.02, 0.4, 0.12, n=81, a4=-0.1015)))
    assert _max_camber_error(CoordinateSection(f), 0.02, 0.4) < 1e-3
    # 6 points a surface, 11 in all: still a usable camber line
    f = write_points(tmp_path / "coarse.dat", *loop_order(*naca_surfaces(0.02, 0.4, 0.12, n=6)))
    assert _max_camber_error(CoordinateSection(f), 0.02, 0.4) < 1e-3


def test_zero_thickness_file_gives_its_line(tmp_path):
    x = cosine_nodes(60)
    z = np.array([report460_mean_line(0.04, 0.4, xi) for xi in x])
    sec = CoordinateSection(write_points(tmp_path / "sail.dat", np.r_[x[::-1], x[1:]], np.r_[z[::-1], z[1:]]))
    assert _max_camber_error(sec, 0.04, 0.4) < 1e-4
    assert sec.thickness < 1e-6
    xu, zu, xl, zl = sec.outline(50)
    assert len(xu) == 50


def test_coordinate_outline_is_the_file_normalised(tmp_path):
    xu0, zu0, xl0, zl0 = naca_surfaces(0.0, 0.0, 0.12, n=81)
    sec = CoordinateSection(write_points(tmp_path / "s.dat", *loop_order(xu0, zu0, xl0, zl0)))
    xu, zu, xl, zl = sec.outline(41)
    assert np.allclose(zu, [report460_thickness(0.12, x) for x in xu], atol=2e-5)  # NACA 0012, Report 460
    assert np.allclose(zl, [-report460_thickness(0.12, x) for x in xl], atol=2e-5)



def _good_lines():
    xs, zs = loop_order(*naca_surfaces(0.02, 0.4, 0.12, n=21))
    return [f"{a:.6f} {b:.6f}" for a, b in zip(xs, zs)]


@pytest.mark.parametrize("name,text,needle", [
    ("empty", "", "no x z points"),
    ("title-only", "My section\n", "no x z points"),
    ("few", "\n".join(_good_lines()[:9]), "at least 10"),
    ("words", "\n".join(_good_lines()[:5] + ["0.5 abc"] + _good_lines()[5:]), "line 6"),
    ("three", "\n".join(_good_lines()[:5] + ["0.5 0.1 0.2"] + _good_lines()[5:]), "line 6"),
    ("nan", "\n".join(_good_lines()[:7] + ["nan 0.1"] + _good_lines()[7:]), "line 8"),
    ("upper-only", "\n".join(_good_lines()[:21]), "not closed"),
    ("shuffled", "\n".join(np.random.default_rng(3).permutation(_good_lines())), "cannot be told apart"),
])
def test_malformed_coordinate_files(tmp_path, name, text, needle):
    f = tmp_path / f"{name}.dat"
    f.write_text(text)
    with pytest.raises(InputError) as err:
        CoordinateSection(f)
    assert err.value.key == "shape" and needle in err.value.message


def test_missing_and_unreadable_files(tmp_path):
    with pytest.raises(InputError, match="not found"):
        CoordinateSection(tmp_path / "nowhere.dat")
    with pytest.raises(InputError, match="folder"):
        CoordinateSection(tmp_path)
    f = tmp_path / "binary.dat"
    f.write_bytes(b"\xff\xfe\x00\x81\x92" * 20)
    with pytest.raises(InputError) as err:
        CoordinateSection(f)
    assert err.value.key == "shape"


def test_crossing_surfaces_are_refused(tmp_path):
    x = cosine_nodes(40)
    zu = 0.05 * np.sin(2 * math.pi * x)  # a figure of eight: the surfaces swap at mid-chord
    f = write_points(tmp_path / "eight.dat", np.r_[x[::-1], x[1:]], np.r_[zu[::-1], -zu[1:]])
    with pytest.raises(InputError, match="cross") as err:
        CoordinateSection(f)
    assert err.value.key == "shape"


def test_blocks_that_do_not_share_a_leading_edge_are_refused(tmp_path):
    xu, zu, xl, zl = naca_surfaces(0.02, 0.4, 0.12, n=21)
    f = write_points(tmp_path / "b.dat", np.r_[xu, xl[::-1]], np.r_[zu, zl[::-1]], head="NACA 2412\n21 21\n")
    with pytest.raises(InputError, match="leading edge"):
        CoordinateSection(f)


# --- cosine spacing and elements ----------------------------------------------------------------

@pytest.mark.parametrize("n", [1, 2, 7, 40, 41, 200])
def test_cosine_nodes(n):
    x = cosine_nodes(n)
    i = np.arange(n + 1)
    assert len(x) == n + 1 and x[0] == 0.0 and x[-1] == 1.0
    assert np.allclose(x, 0.5 * (1 - np.cos(np.pi * i / n)), atol=1e-15)  # x_i = (1 - cos(pi i / n)) / 2
    assert np.all(x + x[::-1] == 1.0)  # symmetric about mid-chord, exactly
    assert np.all(np.diff(x) > 0)


@pytest.mark.parametrize("n", [0, -3, 2.5, True, "40"])
def test_cosine_nodes_needs_a_whole_number(n):
    with pytest.raises(InputError) as err:
        cosine_nodes(n)
    assert err.value.key == "elements"


@pytest.mark.parametrize("shape", ["flat", "naca2412", "naca6309"])
def test_panels_geometry(shape):
    sec = section_from_shape(shape)
    n = 40
    p = camber_elements(sec, n)
    assert isinstance(p, CamberPanels) and p.n == n
    assert np.allclose(p.z_nodes, sec.camber(p.x_nodes), atol=0)  # nodes on the camber line
    assert np.allclose(np.hypot(p.tx, p.tz), 1.0, atol=1e-15) and np.allclose(np.hypot(p.nx, p.nz), 1.0, atol=1e-15)
    assert np.allclose(p.tx * p.nx + p.tz * p.nz, 0.0, atol=1e-15)  # orthogonal
    assert np.all(p.tx > 0) and np.all(p.nz > 0)  # tangent towards the trailing edge, normal to the upper side
    assert np.allclose(p.tx * p.nz - p.tz * p.nx, 1.0)  # n is t turned +90 deg: (-tz, tx)
    dx, dz = np.diff(p.x_nodes), np.diff(p.z_nodes)
    assert np.allclose(p.ds, np.hypot(dx, dz), atol=1e-16)
    # the chords of the elements add up to just under the arc length of the camber line (common practice)
    arc = quad(lambda x: math.hypot(1.0, float(sec.slope(x))), 0, 1, points=[0.3, 0.4], limit=200)[0]
    assert arc - 1e-4 < p.ds.sum() <= arc + 1e-12
    # lumped-vortex element: vortex at 1/4, collocation point at 3/4 (Katz & Plotkin 2001, sec. 11.1)
    assert np.allclose(p.xv, p.x_nodes[:-1] + 0.25 * dx, atol=1e-16) and np.allclose(p.zv, p.z_nodes[:-1] + 0.25 * dz)
    assert np.allclose(p.xc, p.x_nodes[:-1] + 0.75 * dx, atol=1e-16) and np.allclose(p.zc, p.z_nodes[:-1] + 0.75 * dz)
    with pytest.raises(ValueError):
        p.xv[0] = 1.0  # read-only


def test_flat_plate_panels_point_straight_up():
    p = camber_elements(FlatPlate(), 8)
    assert np.all(p.nx == 0.0) and np.all(p.nz == 1.0) and np.all(p.tz == 0.0) and np.all(p.zv == 0.0)
    one = camber_elements(FlatPlate(), 1)
    assert one.xv[0] == 0.25 and one.xc[0] == 0.75  # the single lumped vortex (Katz & Plotkin 2001, sec. 11.1)
