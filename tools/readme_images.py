"""Write the two small pictures the README shows: a film frame and a screenshot of a report page.

Usage: .venv/bin/python tools/readme_images.py [--scenario FILE] [--out docs]

- ``docs/film-frame.png``: one frame of the film of a bundled scenario (default
  scenarios/drone-gust-1cos.toml), 800x450, a little after the peak of its trace;
- ``docs/report-page.png``: the top of that run's report page, taken with headless Chromium.
Both are reduced to a palette of 128 colours to stay under about 150 KB each.
"""

from __future__ import annotations

import argparse
import shutil
import subprocess
import sys
import tempfile
from pathlib import Path

import numpy as np
from PIL import Image

import unsteady
from unsteady.outputs import report
from unsteady.outputs.films import Film, FilmOptions, FilmRenderer, load_run

ROOT = Path(__file__).resolve().parents[1]
LIMIT = 150 * 1024


def save_small(rgb, path, width=None):
    """Save an RGB array as a PNG of at most 128 colours (scaled to ``width`` pixels when given)."""
    img = Image.fromarray(np.ascontiguousarray(rgb[..., :3]).astype(np.uint8))
    if width and img.width > width:
        img = img.resize((width, round(img.height * width / img.width)), Image.LANCZOS)
    img.quantize(colors=128, method=Image.Quantize.MEDIANCUT, dither=Image.Dither.NONE).save(path, optimize=True)
    size = path.stat().st_size
    print(f"{path}: {img.width}x{img.height}, {size / 1024:.0f} KB" + ("" if size <= LIMIT else "  (over 150 KB)"))


def film_frame(run, path):
    """The frame a little after the peak of the traced quantity (gust and peak mark both in view)."""
    film = Film(load_run(run), FilmOptions(width=800, height=450, frames=60))
    renderer = FilmRenderer(film)
    peak = renderer.peak
    t = peak[0] + 0.12 * (film.t1 - film.t0) if peak is not None else film.t0 + 0.66 * (film.t1 - film.t0)
    save_small(renderer.frame(int(np.argmin(np.abs(film.times - t)))), path)


def page_shot(run, path, chromium):
    page, _, _ = report.write_report(run, film=True)
    with tempfile.TemporaryDirectory() as tmp:
        shot, profile = Path(tmp) / "shot.png", Path(tmp) / "profile"
        subprocess.run([chromium, "--headless", "--no-sandbox", "--disable-gpu", "--hide-scrollbars",
                        "--no-first-run", f"--user-data-dir={profile}", "--window-size=1000,1250",
                        f"--screenshot={shot}", page.resolve().as_uri()],
                       check=True, stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL, timeout=120)
        save_small(np.asarray(Image.open(shot).convert("RGB")), path, width=800)


def main(argv=None):
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--scenario", default=str(ROOT / "scenarios" / "drone-gust-1cos.toml"))
    ap.add_argument("--out", default=str(ROOT / "docs"))
    a = ap.parse_args(argv)
    chromium = shutil.which("chromium") or shutil.which("chromium-browser")
    if chromium is None:
        print("error: -: chromium: not installed; apt-get install chromium", file=sys.stderr)
        return 2
    out = Path(a.out)
    out.mkdir(parents=True, exist_ok=True)
    with tempfile.TemporaryDirectory() as tmp:
        run = unsteady.simulate(unsteady.load_scenario(a.scenario)).save(Path(tmp) / "run")
        film_frame(run, out / "film-frame.png")
        page_shot(run, out / "report-page.png", chromium)
    return 0


if __name__ == "__main__":
    sys.exit(main())
