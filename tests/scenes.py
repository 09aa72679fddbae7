"""Scenes of the gallery and the textbook corpus, and the rows they wrap into, for the draw tests."""
from __future__ import annotations

from pathlib import Path

import arrows
from arrows.draw import STYLES, build_scene
from textbook_mechanisms import TEXTBOOK

ROOT = Path(__file__).resolve().parents[1]


def scene_of(name: str, style: str):
    """The scene of a gallery file (NAME.mech) or a textbook corpus entry, in a preset style."""
    if name.endswith(".mech"):
        path = ROOT / "gallery" / name
        trace, diags = arrows.check_text(path.read_text(encoding="utf-8"), path.name)
    else:
        trace, diags = arrows.check_text(TEXTBOOK[name][0], f"{name}.mech")
    return build_scene(trace, STYLES[style], diags)


def panels_per_row(scene) -> list[int]:
    """How many panels each row of a scene holds (panels whose boxes share height are one row)."""
    rows: list[list[float]] = []
    for top, bottom in sorted((p.origin[1] + p.box.y0, p.origin[1] + p.box.y1) for p in scene.panels):
        if rows and top < rows[-1][1] - 1e-6:
            rows[-1][1], rows[-1][2] = max(rows[-1][1], bottom), rows[-1][2] + 1
        else:
            rows.append([top, bottom, 1])
    return [count for _, _, count in rows]
