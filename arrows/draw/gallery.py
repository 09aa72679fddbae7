"""Render the gallery: `python -m arrows.draw.gallery [FOLDER] [--style NAME]` writes NAME.svg
beside every NAME.mech in FOLDER (default: gallery). The output depends only on the mechanism,
the style and the fonts of the machine, so running it twice gives the same bytes."""
from __future__ import annotations

import argparse
import sys
from pathlib import Path

from ..api import check_file
from ..diagnostics import ERROR
from . import STYLES, render_svg
from ..atomic import write_bytes as write_atomic


def render_folder(folder: Path, style: str = "two-column") -> list[tuple[Path, str]]:
    """(mechanism, problem) for each mechanism that could not be drawn; the rest are written."""
    problems = []
    for source in sorted(folder.glob("*.mech")):
        trace, diags = check_file(source)
        if trace is None or trace.initial is None:
            problems.append((source, "the mechanism could not be read"))
            continue
        errors = [d for d in diags if d.severity == ERROR]
        if errors:
            problems.append((source, errors[0].to_text()))
            continue
        svg = render_svg(trace, style=STYLES[style], diagnostics=diags)
        write_atomic(source.with_suffix(".svg"), svg.encode("utf-8"))
    return problems


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(prog="python -m arrows.draw.gallery", description=__doc__.split("\n\n")[0])
    parser.add_argument("folder", nargs="?", default="gallery", type=Path)
    parser.add_argument("--style", choices=sorted(STYLES), default="two-column")
    args = parser.parse_args(argv)
    if not args.folder.is_dir():
        print(f"{args.folder}: no such folder", file=sys.stderr)
        return 2
    problems = render_folder(args.folder, args.style)
    drawn = len(list(args.folder.glob("*.mech"))) - len(problems)
    for source, problem in problems:
        print(f"{source}: not drawn: {problem}", file=sys.stderr)
    print(f"{drawn} figure{'s' if drawn != 1 else ''} written to {args.folder}", file=sys.stderr)
    return 1 if problems else 0


if __name__ == "__main__":
    sys.exit(main())
