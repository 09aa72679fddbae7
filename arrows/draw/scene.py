"""The Scene: a figure as plain data, in points at print size, y growing downwards.

Everything the SVG shows is here with its final geometry (no renderer decides a position), so
tests and other tools can check the figure itself: bond lengths, label boxes, arrow paths.
Panel contents are in the panel's own frame, shared by all panels (an atom that does not move
has the same coordinates in every panel); `Panel.origin` puts that frame on the page.
"""
from __future__ import annotations

from dataclasses import MISSING, dataclass, field, fields
from functools import lru_cache
from typing import Optional, Sequence

from .styles import Style


def _filled(cls):
    """A frozen dataclass whose __init__ writes the fields straight into the instance's dict. The
    generated one sets each through object.__setattr__ (the price of frozen), which costs more
    than the rest of making a Box, and a figure makes a few thousand scene parts. Still frozen
    (assigning raises), with the dataclass's fields, equality, hash and repr; the __init__ is
    written out as the dataclass module writes its own."""
    every = fields(cls)
    if any(f.default_factory is not MISSING or not f.init for f in every):
        raise TypeError(f"{cls.__name__}: _filled writes plain fields and defaults only")
    defaults = {f"_{f.name}": f.default for f in every if f.default is not MISSING}
    signature = ", ".join(f.name + (f"=_{f.name}" if f"_{f.name}" in defaults else "") for f in every)
    body = "".join(f"\n    d[{f.name!r}] = {f.name}" for f in every)
    exec(f"def __init__(self, {signature}):\n    d = self.__dict__{body}", defaults)
    cls.__init__ = defaults["__init__"]
    return cls

Point = tuple[float, float]


@_filled
@dataclass(frozen=True)
class Box:
    x0: float
    y0: float
    x1: float
    y1: float

    def contains(self, p: Point, pad: float = 0.0) -> bool:
        return self.x0 - pad <= p[0] <= self.x1 + pad and self.y0 - pad <= p[1] <= self.y1 + pad

    def overlaps(self, other: "Box", pad: float = 0.0) -> bool:
        return not (self.x1 + pad <= other.x0 or other.x1 + pad <= self.x0 or
                    self.y1 + pad <= other.y0 or other.y1 + pad <= self.y0)

    def distance(self, p: Point) -> float:
        dx = max(self.x0 - p[0], 0.0, p[0] - self.x1)
        dy = max(self.y0 - p[1], 0.0, p[1] - self.y1)
        return (dx * dx + dy * dy) ** 0.5

    def union(self, other: "Box") -> "Box":
        return Box(min(self.x0, other.x0), min(self.y0, other.y0), max(self.x1, other.x1), max(self.y1, other.y1))

    @staticmethod
    def enclosing(boxes: Sequence["Box"]) -> "Box":
        """The box round all of `boxes` (at least one)."""
        box = boxes[0]
        for other in boxes[1:]:
            box = box.union(other)
        return box

    def shifted(self, dx: float, dy: float) -> "Box":
        return Box(self.x0 + dx, self.y0 + dy, self.x1 + dx, self.y1 + dy)

    @property
    def width(self) -> float:
        return self.x1 - self.x0

    @property
    def height(self) -> float:
        return self.y1 - self.y0


@_filled
@dataclass(frozen=True)
class TextRun:
    """A piece of text on one baseline, starting at (x, y)."""

    text: str
    x: float
    y: float
    size: float
    italic: bool = False
    bold: bool = False
    colour: str = "#000000"


@_filled
@dataclass(frozen=True)
class AtomDrawing:
    index: int
    name: str                      # C7, H(C3), O(atom 12): how diagnostics name the atom
    element: str
    position: Point
    runs: tuple[TextRun, ...] = ()  # empty: a skeletal carbon, drawn as a vertex
    box: Optional[Box] = None       # the label's box, None for a skeletal carbon


@_filled
@dataclass(frozen=True)
class BondDrawing:
    atoms: tuple[int, int]
    order: int
    lines: tuple[tuple[Point, Point], ...]
    role: str = "plain"            # plain, formed (by the step arriving), broken (by the step leaving)
    colour: str = "#000000"
    # A stereo bond (IUPAC 2006): "solid", a filled wedge (`outline`; its `lines` are the
    # outline's edges), or "hashed" (its `lines` are the hashes), narrow at the stereocentre
    # `narrow`; "" for a bond in the plane.
    wedge: str = ""
    narrow: Optional[int] = None
    outline: tuple[Point, ...] = ()
    # The colour of each of `lines` where they differ (--color: the pi stroke of a C=O whose pi
    # bond alone breaks is coloured, its sigma stroke stays in ink); empty: every line in `colour`.
    line_colours: tuple[str, ...] = ()


@_filled
@dataclass(frozen=True)
class Mark:
    """Something drawn beside an atom: a charge, a map number, a CIP label (text), a radical or
    a lone pair (dots), or an error ring around the atom."""

    kind: str                      # charge, number, cip, radical, lone_pair, error
    atom: int
    runs: tuple[TextRun, ...] = ()
    dots: tuple[Point, ...] = ()
    radius: float = 0.0            # dot radius, or ring radius for an error mark
    box: Optional[Box] = None
    colour: str = "#000000"


@lru_cache(maxsize=None)
def _bernstein(n: int) -> tuple[tuple[float, float, float, float], ...]:
    """The cubic Bernstein weights at t = 0, 1/n, ..., 1: the same for every curve sampled n times."""
    out = []
    for k in range(n + 1):
        t = k / n
        out.append(((1 - t) ** 3, 3 * t * (1 - t) ** 2, 3 * t * t * (1 - t), t ** 3))
    return tuple(out)


@_filled
@dataclass(frozen=True)
class CurvedArrow:
    """One move: a cubic Bezier shaft (start, control1, control2, end) and a head ending at tip.

    source_point is the lone-pair dots, the unpaired electron or the midpoint of the source bond;
    sink_point is the sink atom or the midpoint of the bond that forms or gains order. sink_box is
    the label the head stops short of, when the sink is a labelled atom."""

    step: int
    move: str
    electrons: int
    source_kind: str
    source_atoms: tuple[int, ...]
    sink_atoms: tuple[int, ...]
    target_atoms: tuple[int, ...]  # what the head points at: one atom, or the two ends of a bond
    source_point: Point
    sink_point: Point
    sink_box: Optional[Box]
    start: Point
    control1: Point
    control2: Point
    end: Point
    tip: Point
    head: tuple[Point, ...]
    colour: str = "#000000"
    crossings: int = 0   # bonds not its own that the planner's samples of the chosen path cross

    def shaft_points(self, n: int = 40) -> list[Point]:
        (x0, y0), (x1, y1), (x2, y2), (x3, y3) = self.start, self.control1, self.control2, self.end
        return [(a * x0 + b * x1 + c * x2 + d * x3, a * y0 + b * y1 + c * y2 + d * y3)
                for a, b, c, d in _bernstein(n)]

    def path_points(self, n: int = 40) -> list[Point]:
        """The shaft sampled, then the head up to the tip."""
        return self.shaft_points(n) + [self.tip]


@_filled
@dataclass(frozen=True)
class Panel:
    index: int
    step: Optional[int]            # the step whose moves are drawn here (None on the last panel)
    origin: Point
    box: Box                       # everything drawn, in the panel frame
    atoms: tuple[AtomDrawing, ...]
    bonds: tuple[BondDrawing, ...]
    marks: tuple[Mark, ...]
    arrows: tuple[CurvedArrow, ...]
    placeholder: tuple[TextRun, ...] = ()   # text shown instead of a structure that could not be derived

    def atom(self, index: int) -> Optional[AtomDrawing]:
        for a in self.atoms:
            if a.index == index:
                return a
        return None


@_filled
@dataclass(frozen=True)
class ReactionArrow:
    """The arrow between two panels: its strokes and filled heads in page coordinates, with the
    text over and under it."""

    step: int
    kind: str                      # forward, reversible, resonance
    start: Point
    end: Point
    lines: tuple[tuple[Point, Point], ...]
    heads: tuple[tuple[Point, ...], ...]
    texts: tuple[TextRun, ...]
    box: Box


@_filled
@dataclass(frozen=True)
class Scene:
    style: Style
    width: float
    height: float
    bond_length: float
    title: str
    description: str
    panels: tuple[Panel, ...]
    reaction_arrows: tuple[ReactionArrow, ...]
    texts: tuple[TextRun, ...] = ()          # title and footnotes, page coordinates
    notes: tuple[str, ...] = field(default=())   # what the layout had to compromise on
    enlarged: float = 1.0   # how much larger than its style's sizes a slide was drawn, to fill its page
