"""The mechanism as written: plain, frozen data with a source location on every node.

Nothing here knows about RDKit or electrons; `language.py` builds these objects from text and
`trace.py` gives them chemical meaning.
"""
from __future__ import annotations

from dataclasses import MISSING, FrozenInstanceError, dataclass, field, fields
from operator import attrgetter
from typing import Optional, Union


def frozen(cls):
    """A frozen dataclass (fields(), replace(), equality and hashing on the fields that compare, the
    usual repr) whose methods are shared by every class instead of generated: @dataclass(frozen=True)
    compiles six methods per class, which made importing the model about 7 ms of every start-up."""
    cls.__signature__ = _SIGNATURE   # first: dataclass() asks for it when the class has no docstring
    cls = dataclass(init=False, repr=False, eq=False)(cls)
    every = fields(cls)
    cls._names = tuple(f.name for f in every)
    cls._position = {f.name: k for k, f in enumerate(every)}
    # Per field: its default, or a marker for a factory's or a required one (see _completed).
    cls._fill = tuple(f.default if f.default is not MISSING else _FACTORY if f.default_factory is not MISSING
                      else _REQUIRED for f in every)
    cls._factories = tuple((k, f.default_factory) for k, f in enumerate(every) if f.default_factory is not MISSING)
    cls._required = tuple(k for k, value in enumerate(cls._fill) if value is _REQUIRED)
    cls._key = attrgetter(*(f.name for f in every if f.compare))
    cls._post_init = hasattr(cls, "__post_init__")
    for name in ("__init__", "__eq__", "__hash__", "__repr__", "__setattr__", "__delattr__"):
        setattr(cls, name, _Shared.__dict__[name])
    return cls


class _Signature:
    """inspect.signature() of a @frozen class, built when asked for (help(), notebook tooltips)."""

    def __get__(self, instance, cls):
        from inspect import Parameter, Signature
        return Signature([Parameter(f.name, Parameter.POSITIONAL_OR_KEYWORD, annotation=f.type,
                                    default=f.default if f.default is not MISSING
                                    else f.default_factory() if f.default_factory is not MISSING else Parameter.empty)
                          for f in fields(cls)], return_annotation=None)


_SIGNATURE = _Signature()


_FACTORY, _REQUIRED = object(), object()


def _completed(cls, args: tuple, kwargs: dict) -> tuple:
    """Every field's value in order: the arguments given, then each field's default."""
    given = len(args)
    if given > len(cls._names):
        raise TypeError(f"{cls.__qualname__}() takes {len(cls._names)} arguments but {given} were given")
    values = list(args)
    values += cls._fill[given:]
    position = cls._position
    for name, value in kwargs.items():
        k = position.get(name, -1)
        if k < given:
            raise TypeError(f"{cls.__qualname__}() got an unexpected or repeated argument {name!r}")
        values[k] = value
    for k, factory in cls._factories:
        if values[k] is _FACTORY:
            values[k] = factory()
    for k in cls._required:
        if values[k] is _REQUIRED:
            raise TypeError(f"{cls.__qualname__}() missing argument {cls._names[k]!r}")
    return tuple(values)


class _Shared:
    """The methods of every @frozen class."""

    def __init__(self, *args, **kwargs):
        cls = type(self)
        if kwargs or len(args) != len(cls._names):
            args = _completed(cls, args, kwargs)
        self.__dict__.update(zip(cls._names, args))
        if cls._post_init:
            self.__post_init__()

    def __eq__(self, other):
        if other.__class__ is self.__class__:
            return self._key(self) == self._key(other)
        return NotImplemented

    def __hash__(self):
        return hash(self._key(self))

    def __repr__(self):
        return f"{type(self).__qualname__}({', '.join(f'{n}={getattr(self, n)!r}' for n in self._names)})"

    def __setattr__(self, name, value):
        raise FrozenInstanceError(f"cannot assign to field {name!r}")

    def __delattr__(self, name):
        raise FrozenInstanceError(f"cannot delete field {name!r}")


@frozen
class Location:
    """Where a node was written: 1-based line and column in `file`."""

    file: str = "<text>"
    line: int = 0
    column: int = 0

    def __str__(self) -> str:
        return f"{self.file}:{self.line}:{self.column}"


@frozen
class AtomRef:
    """A mapped atom such as `C7` (element + map number)."""

    element: str
    map_number: int
    loc: Location = field(default_factory=Location, compare=False)

    def __str__(self) -> str:
        return f"{self.element}{self.map_number}"


@frozen
class HydrogenOn:
    """A hydrogen attached to a mapped atom: `H(C3)`, or the bare `H` of `C3-H`."""

    parent: AtomRef
    loc: Location = field(default_factory=Location, compare=False)

    def __str__(self) -> str:
        return f"H({self.parent})"


Atom = Union[AtomRef, HydrogenOn]

BOND_ORDERS = {"-": 1, "=": 2, "#": 3}
CONNECTORS = {1: "-", 2: "=", 3: "#"}


@frozen
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


@frozen
class LonePair:
    """Source `:X`."""

    atom: Atom
    loc: Location = field(default_factory=Location, compare=False)

    def __str__(self) -> str:
        return f":{self.atom}"


@frozen
class UnpairedElectron:
    """Source `.X` (or `•X`)."""

    atom: Atom
    loc: Location = field(default_factory=Location, compare=False)

    def __str__(self) -> str:
        return f".{self.atom}"


@frozen
class BondPair:
    """Source `X-Y`, `X=Y`, `X#Y`: one electron pair of that bond."""

    bond: BondRef
    loc: Location = field(default_factory=Location, compare=False)

    def __str__(self) -> str:
        return str(self.bond)


@frozen
class BareAtom:
    """An atom written where electrons should be named (kept so the checker can say why it is wrong)."""

    atom: Atom
    loc: Location = field(default_factory=Location, compare=False)

    def __str__(self) -> str:
        return str(self.atom)


Source = Union[LonePair, UnpairedElectron, BondPair, BareAtom]


@frozen
class AtomSink:
    atom: Atom
    loc: Location = field(default_factory=Location, compare=False)

    def __str__(self) -> str:
        return str(self.atom)


@frozen
class BondSink:
    bond: BondRef
    loc: Location = field(default_factory=Location, compare=False)

    def __str__(self) -> str:
        return str(self.bond)


@frozen
class NonbondingSink:
    """Sink `:X`: the electrons end on X as non-bonding electrons and no bond forms, as when a
    metal hands an electron to a molecule (an electron transfer)."""

    atom: Atom
    loc: Location = field(default_factory=Location, compare=False)

    def __str__(self) -> str:
        return f":{self.atom}"


Sink = Union[AtomSink, BondSink, NonbondingSink]


@frozen
class Move:
    """One curved arrow. `electrons` is 2 for `->` and 1 for `~>`."""

    source: Source
    sink: Sink
    electrons: int
    loc: Location = field(default_factory=Location, compare=False)

    def __str__(self) -> str:
        return f"{self.source} {'->' if self.electrons == 2 else '~>'} {self.sink}"


@frozen
class Species:
    name: str
    smiles: str
    loc: Location = field(default_factory=Location, compare=False)
    # Where the SMILES text itself starts (just inside the quotes), for RDKit error positions.
    smiles_loc: Location = field(default_factory=Location, compare=False)


@frozen
class Checkpoint:
    """`expect "SMILES"` / `expect all "SMILES"` / `product "SMILES"`."""

    smiles: str
    whole_state: bool = False
    loc: Location = field(default_factory=Location, compare=False)
    # Where the SMILES text itself starts (just inside the quotes), for RDKit error positions.
    smiles_loc: Location = field(default_factory=Location, compare=False)


STEP_KINDS = ("forward", "reversible", "resonance")


# Where a comment stands against what it annotates: whole lines above it (for the mechanism, the top
# of the file); at the end of its first line; whole lines below its last part (inside a step, before
# its `end`; for the mechanism, after the last statement); at the end of a step's `end` line.
COMMENT_PLACES = ("above", "inline", "below", "end")


@frozen
class Comment:
    """A `# ...` comment as the author wrote it: `text` is what follows the `#` (less one space), `at`
    what it annotates, as a JSON pointer into the mechanism's JSON object ("" the mechanism itself,
    "/title", "/species/water", "/steps/0", "/steps/0/moves/1", "/steps/0/uses/acid", "/product"),
    `place` one of COMMENT_PLACES. `break_after`: for an "inline" comment on a statement written over
    several lines, how many of its tokens (`H(C3)` counting as one) come before the line break that
    ends the comment's line; None when it ends the statement's last line, so that comments on the
    lines of one statement stay on lines of their own."""

    text: str
    at: str = ""
    place: str = "above"
    loc: Location = field(default_factory=Location, compare=False)
    break_after: Optional[int] = None


@frozen
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


@frozen
class Mechanism:
    title: Optional[str] = None
    caption: Optional[str] = None
    species: tuple[Species, ...] = ()
    steps: tuple[Step, ...] = ()
    product: Optional[Checkpoint] = None
    source_name: str = "<text>"
    # Statements written after `product` (a step or a second product); kept for the checker.
    after_product: tuple[Location, ...] = field(default=(), compare=False)
    # The author's comments, in the order the writer prints them. Not part of what the mechanism
    # says: two mechanisms that differ only in comments are equal.
    comments: tuple[Comment, ...] = field(default=(), compare=False)

    # Conveniences for scripts and notebooks. The work is done in api.py and writer.py, imported
    # when called, so the model itself stays free of RDKit and drawing code.
    def check(self, pka_gap: Optional[float] = None):
        """The diagnostics of this mechanism (an `arrows.api.Diagnostics` list, sorted by location).
        pka_gap: AR508's uphill threshold in pKa units (default 12), as `arrows check --pka-gap`;
        `.passed(strict=True)` on the result is what `--strict` exits 0 on."""
        from .api import checked
        return checked(self, pka_gap)[1]

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

    def draw(self, fmt: str = "svg", style: Optional[str] = None, force: bool = False, *, dpi: int = 300,
             color: bool = False, numbers: bool = False, cip: bool = False, step_labels: bool = False,
             ph_labels: bool = True, title: bool = True, font: Optional[str] = None,
             font_size: Optional[float] = None, line_width: Optional[float] = None) -> bytes:
        """The figure as bytes: fmt is "svg", "pdf" or "png"; style names a preset (one-column,
        two-column, slide). The keywords are the options of `arrows draw` (--dpi, --color, --numbers,
        --cip, --step-labels, --every-atom as ph_labels=False, --no-title as title=False, --font,
        --font-size, --line-width). With errors it raises arrows.draw.DrawError unless force=True."""
        from .api import draw
        return draw(self, fmt, style, force, dpi=dpi, color=color, numbers=numbers, cip=cip,
                    step_labels=step_labels, ph_labels=ph_labels, title=title, font=font, font_size=font_size,
                    line_width=line_width)

    def to_text(self) -> str:
        """The mechanism as .mech text; parsing it gives back an equal Mechanism."""
        from .writer import to_text
        return to_text(self)

    def _repr_svg_(self) -> str:
        """Jupyter shows a Mechanism as its scheme, errors marked on it."""
        return self.draw("svg", force=True).decode("utf-8")
