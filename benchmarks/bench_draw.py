"""How much drawing a scheme costs, against baselines measured in the same run.

1. Our whole scheme to SVG (layout, structures, curved arrows, reaction arrows, text) against
   RDKit's own MolDraw2DSVG drawing the same states, one drawer per state, coordinates computed
   by RDKit as it draws (target: at most 2x).
2. PDF export: our SVG -> PDF step against a bare cairosvg.svg2pdf of the same SVG (target: no
   more than cairosvg's own conversion).

Usage: python benchmarks/bench_draw.py [MECH ...]   (default: gallery/*.mech)
Prints one line per mechanism and the totals; times are the median of several runs of the CPU
time of this process (time.process_time), which other programs on a shared machine disturb less
than wall-clock time.
"""
from __future__ import annotations

import statistics
import sys
import time
from pathlib import Path

import cairosvg
from rdkit import Chem
from rdkit.Chem.Draw import rdMolDraw2D

import arrows
from arrows.draw import STYLES, build_scene
from arrows.draw.export import convert
from arrows.draw.scheme import _panel_sources
from arrows.draw.svg import scene_to_svg

ROOT = Path(__file__).resolve().parents[1]
REPEAT = 7


def median_time(job, repeat: int = REPEAT) -> float:
    job()   # warm caches (fonts, RDKit templates) outside the timing
    times = []
    for _ in range(repeat):
        start = time.process_time()
        job()
        times.append(time.process_time() - start)
    return statistics.median(times)


def rdkit_drawing(states) -> None:
    """RDKit draws each state on its own canvas, as a user of RDKit alone would."""
    for state in states:
        mol = Chem.Mol(state.mol)
        for atom in mol.GetAtoms():
            atom.SetAtomMapNum(0)
        mol.RemoveAllConformers()
        drawer = rdMolDraw2D.MolDraw2DSVG(300, 200)
        drawer.DrawMolecule(mol)
        drawer.FinishDrawing()
        drawer.GetDrawingText()


def main(paths: list[Path]) -> int:
    style = STYLES["two-column"]
    rows = []
    print(f"{'mechanism':38} {'panels':>6} {'ours ms':>8} {'RDKit ms':>9} {'ratio':>6}   "
          f"{'to PDF ms':>9} {'cairosvg ms':>11} {'ratio':>6}")
    for path in paths:
        trace, diags = arrows.check_file(path)
        if trace is None or trace.initial is None or any(d.severity == "error" for d in diags):
            print(f"{path.name:38} skipped: does not replay cleanly")
            continue
        states = [s.state for s in _panel_sources(trace)]
        ours = median_time(lambda: scene_to_svg(build_scene(trace, style, diags)))
        theirs = median_time(lambda: rdkit_drawing(states))
        svg = scene_to_svg(build_scene(trace, style, diags))
        data = svg.encode("utf-8")
        export = median_time(lambda: convert(svg, "pdf"), repeat=5)
        bare = median_time(lambda: cairosvg.svg2pdf(bytestring=data), repeat=5)
        rows.append((ours, theirs, export, bare))
        print(f"{path.name:38} {len(states):6d} {ours * 1e3:8.1f} {theirs * 1e3:9.1f} {ours / theirs:6.2f}   "
              f"{export * 1e3:9.1f} {bare * 1e3:11.1f} {export / bare:6.2f}")
    if not rows:
        return 1
    ours, theirs, export, bare = (sum(col) for col in zip(*rows))
    print(f"{'total':38} {'':6} {ours * 1e3:8.1f} {theirs * 1e3:9.1f} {ours / theirs:6.2f}   "
          f"{export * 1e3:9.1f} {bare * 1e3:11.1f} {export / bare:6.2f}")
    print(f"scheme to SVG costs {ours / theirs:.2f}x RDKit's MolDraw2DSVG of the same states (target <= 2); "
          f"PDF export costs {export / bare:.2f}x a bare cairosvg.svg2pdf (target <= 1, within noise)")
    return 0


if __name__ == "__main__":
    args = [Path(a) for a in sys.argv[1:]] or sorted((ROOT / "gallery").glob("*.mech"))
    sys.exit(main(args))
