"""The mechanism as written: plain, frozen data with a source location on every node.

Nothing here knows about RDKit or electrons; `language.py` builds these objects from text and
`trace.py` gives them chemical meaning.
"""
from __future__ import annotations

from dataclasses import dataclass, field
from typing import Optional, Union


@dataclass(frozen=True)
class Location:
    """Where a node was written: 1-based line and column in `file`."""

    file: str = "<text>"
    line: int = 0
    column: int = 0

    def __str__(self) -> str:
        return f"{self.file}:{self.line}:{self.column}"


@dataclass(frozen=True)
class AtomRef:
    """A mapped atom such as `C7` (element + map number)."""

    element: str
    map_number: int
    loc: Location = field(default_factory=Location, compare=False)

    def __str__(self) -> str:
        return f"{self.element}{self.map_number}"


@dataclass(frozen=True)
class HydrogenOn:
    """A hydrogen attached to a mapped atom: `H(C3)`, or the bare `H` of `C3-H`."""

    parent: AtomRef
    loc: Location = field(default_factory=Location, compare=False)

    def __str__(self) -> str:
        return f"H({self.parent})"


Atom = Union[AtomRef, HydrogenOn]

BOND_ORDERS = {"-": 1, "=": 2, "#": 3}
CONNECTORS = {1: "-", 2: "=", 3: "#"}


@dataclass(frozen=True)
class BondRef:
    """Two atoms and the bond order the author wrote between them."""

    first: Atom
    second: Atom
    order: int
    loc: Location = field(default_factory=Location, compare=False)

    def __str__(self) -> str:
        return f"{_bond_end(self.first, self.second)}{CONNECTORS[self.order]}{_bond_end(self.second, self.first)}"


def _bond_end(atom: Atom, other: Atom) -> str:
    if isinstance(atom, HydrogenOn) and atom.parent == other:
        return "H"
    return str(atom)


@dataclass(frozen=True)
class LonePair:
    """Source `:X`."""

    atom: Atom
    loc: Location = field(default_factory=Location, compare=False)

    def __str__(self) -> str:
        return f":{self.atom}"


@dataclass(frozen=True)
class UnpairedElectron:
    """Source `.X` (or `•X`)."""

    atom: Atom
    loc: Location = field(default_factory=Location, compare=False)

    def __str__(self) -> str:
        return f".{self.atom}"


@dataclass(frozen=True)
class BondPair:
    """Source `X-Y`, `X=Y`, `X#Y`: one electron pair of that bond."""

    bond: BondRef
    loc: Location = field(default_factory=Location, compare=False)

    def __str__(self) -> str:
        return str(self.bond)


@dataclass(frozen=True)
class BareAtom:
    """An atom written where electrons should be named (kept so the checker can say why it is wrong)."""

    atom: Atom
    loc: Location = field(default_factory=Location, compare=False)

    def __str__(self) -> str:
        return str(self.atom)


Source = Union[LonePair, UnpairedElectron, BondPair, BareAtom]


@dataclass(frozen=True)
class AtomSink:
    atom: Atom
    loc: Location = field(default_factory=Location, compare=False)

    def __str__(self) -> str:
        return str(self.atom)


@dataclass(frozen=True)
class BondSink:
    bond: BondRef
    loc: Location = field(default_factory=Location, compare=False)

    def __str__(self) -> str:
        return str(self.bond)


Sink = Union[AtomSink, BondSink]


@dataclass(frozen=True)
class Move:
    """One curved arrow. `electrons` is 2 for `->` and 1 for `~>`."""

    source: Source
    sink: Sink
    electrons: int
    loc: Location = field(default_factory=Location, compare=False)

    def __str__(self) -> str:
        return f"{self.source} {'->' if self.electrons == 2 else '~>'} {self.sink}"


@dataclass(frozen=True)
class Species:
    name: str
    smiles: str
    loc: Location = field(default_factory=Location, compare=False)
    # Where the SMILES text itself starts (just inside the quotes), for RDKit error positions.
    smiles_loc: Location = field(default_factory=Location, compare=False)


@dataclass(frozen=True)
class Checkpoint:
    """`expect "SMILES"` / `expect all "SMILES"` / `product "SMILES"`."""

    smiles: str
    whole_state: bool = False
    loc: Location = field(default_factory=Location, compare=False)


STEP_KINDS = ("forward", "reversible", "resonance")


@dataclass(frozen=True)
class Step:
    label: str
    kind: str = "forward"
    over: Optional[str] = None
    under: Optional[str] = None
    uses: tuple[Species, ...] = ()
    moves: tuple[Move, ...] = ()
    releases: tuple[AtomRef, ...] = ()
    expects: tuple[Checkpoint, ...] = ()
    loc: Location = field(default_factory=Location, compare=False)


@dataclass(frozen=True)
class Mechanism:
    title: Optional[str] = None
    caption: Optional[str] = None
    species: tuple[Species, ...] = ()
    steps: tuple[Step, ...] = ()
    product: Optional[Checkpoint] = None
    source_name: str = "<text>"
    # Statements written after `product` (a step or a second product); kept for the checker.
    after_product: tuple[Location, ...] = field(default=(), compare=False)

    # Conveniences for scripts and notebooks. The work is done in api.py and writer.py, imported
    # when called, so the model itself stays free of RDKit and drawing code.
    def check(self):
        """The diagnostics of this mechanism (an `arrows.api.Diagnostics` list, sorted by location)."""
        from .api import checked
        return checked(self)[1]

    @property
    def trace(self):
        """The replay: the state before and after every step (`arrows.trace.Trace`)."""
        from .api import checked
        return checked(self)[0]

    @property
    def states(self) -> list:
        """The derived states as RDKit Mols: the start, then the state after each derived step."""
        from .api import derived_mols
        return derived_mols(self)

    def draw(self, fmt: str = "svg", style: Optional[str] = None, force: bool = False) -> bytes:
        """The figure as bytes: fmt is "svg", "pdf" or "png"; style names a preset (one-column,
        two-column, slide...). With errors it raises arrows.draw.DrawError unless force=True."""
        from .api import draw
        return draw(self, fmt, style, force)

    def to_text(self) -> str:
        """The mechanism as .mech text; parsing it gives back an equal Mechanism."""
        from .writer import to_text
        return to_text(self)

    def _repr_svg_(self) -> str:
        """Jupyter shows a Mechanism as its scheme, errors marked on it."""
        return self.draw("svg", force=True).decode("utf-8")
