"""Scenes of the gallery and the textbook corpus, and the rows they wrap into, for the draw tests."""
from __future__ import annotations

import math
from pathlib import Path

import arrows
from arrows.draw import STYLES, build_scene
from textbook_mechanisms import TEXTBOOK

ROOT = Path(__file__).resolve().parents[1]


def scene_of(name: str, style: str, **options):
    """The scene of a gallery file (NAME.mech) or a textbook corpus entry, in a preset style
    (with options such as color=True, numbers=True)."""
    if name.endswith(".mech"):
        path = ROOT / "gallery" / name
        trace, diags = arrows.check_text(path.read_text(encoding="utf-8"), path.name)
    else:
        trace, diags = arrows.check_text(TEXTBOOK[name][0], f"{name}.mech")
    return build_scene(trace, STYLES[style].with_options(**options) if options else STYLES[style], diags)


def half_loops(panel):
    """The curved arrows of a panel that take electrons from a bond to one of its own atoms."""
    return [a for a in panel.arrows if a.source_kind == "bond" and len(a.sink_atoms) == 1
            and a.sink_atoms[0] in a.source_atoms]


def path_length(arrow) -> float:
    """The length of an arrow's path (shaft and head), in points."""
    points = arrow.path_points(40)
    return sum(math.dist(p, q) for p, q in zip(points, points[1:]))


def panels_per_row(scene) -> list[int]:
    """How many panels each row of a scene holds (panels whose boxes share height are one row)."""
    rows: list[list[float]] = []
    for top, bottom in sorted((p.origin[1] + p.box.y0, p.origin[1] + p.box.y1) for p in scene.panels):
        if rows and top < rows[-1][1] - 1e-6:
            rows[-1][1], rows[-1][2] = max(rows[-1][1], bottom), rows[-1][2] + 1
        else:
            rows.append([top, bottom, 1])
    return [count for _, _, count in rows]
