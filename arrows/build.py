"""Building a Mechanism in code: species from SMILES or RDKit Mols, moves from their text (read
with the grammar of .mech files) or as model objects, steps and whole mechanisms.

    from arrows import build
    mech = build.mechanism(
        title="Proton transfer",
        species=[build.species("acid", "[OH3+:1]"), build.species("base", "[NH3:2]")],
        steps=[build.step("transfer", ":N2 -> H(O1)", "O1-H -> O1")],
    )

The result is the same frozen Mechanism that `arrows.parse` returns, so it can be checked,
drawn and printed back as .mech text (`mech.to_text()`).
"""
from __future__ import annotations

import re
from dataclasses import fields, is_dataclass, replace
from typing import Iterable, Optional, Union

from .diagnostics import Diagnostic, MechanismError
from .language import parse
from .model import STEP_KINDS, AtomRef, Checkpoint, Location, Mechanism, Move, Species, Step
from .writer import name as checked_name

MoveLike = Union[Move, str]
CheckpointLike = Union[Checkpoint, str]
_ATOM = re.compile(r"([A-Z][a-z]?)([0-9]+)\Z")   # the grammar's ATOM terminal


def _moved_up(node, lines: int):
    """The same model node with every location `lines` lines higher (undoing the wrapper line)."""
    if isinstance(node, Location):
        return replace(node, line=node.line - lines)
    if is_dataclass(node):
        return replace(node, **{f.name: _moved_up(getattr(node, f.name), lines) for f in fields(node)
                                if is_dataclass(getattr(node, f.name))})
    return node


def move(text: str, file: str = "<move>") -> Move:
    """One move from its text, e.g. ``move("C3-H -> C2=C3")`` or ``move(".Br1 ~> H(C3)")``.

    The text is read by the grammar of .mech files, inside a step. Raises MechanismError (AR101,
    located on line 1 of `file`, with a hint) when it is not exactly one move.
    """
    if "\n" in text or "\r" in text:
        raise MechanismError([Diagnostic("AR101", "a move is written on one line", Location(file, 1, 1),
                                         hint="build each move on its own, e.g. move(\"C3-H -> C2=C3\")")])
    try:
        wrapped = parse(f'step ""\n{text}\nend\n', file)
    except MechanismError as exc:
        raise MechanismError([_moved_up(d, 1) for d in exc.diagnostics]) from None
    step = wrapped.steps[0] if len(wrapped.steps) == 1 else None
    if step is None or len(step.moves) != 1 or step.uses or step.releases or step.expects:
        raise MechanismError([Diagnostic("AR101", f"{text!r} is not one electron move", Location(file, 1, 1),
                                         hint="a move is a source, an arrow and a sink, e.g. :O11 -> H(C3)")])
    return _moved_up(step.moves[0], 1)


def atom(text: str) -> AtomRef:
    """A mapped atom from its text, e.g. ``atom("O9")``."""
    match = _ATOM.match(text.strip())
    if match is None:
        raise ValueError(f"{text!r} is not a mapped atom: write element + map number, e.g. O9")
    return AtomRef(match.group(1), int(match.group(2)))


def mol_smiles(mol) -> str:
    """SMILES of an RDKit Mol, keeping its atom maps; unmapped explicit hydrogens are folded into
    their heavy atoms (the engine makes the hydrogens that moves name explicit by itself)."""
    from rdkit import Chem
    work = Chem.RemoveHs(mol, sanitize=False)
    return Chem.MolToSmiles(work)


def _smiles_of(structure, what: str) -> str:
    """A SMILES string as given, or an RDKit Mol's; a TypeError that says what was given otherwise
    (a None reached RDKit as a Boost.Python ArgumentError naming RemoveHs)."""
    if isinstance(structure, str):
        return structure
    if hasattr(structure, "GetNumAtoms"):
        return mol_smiles(structure)
    raise TypeError(f"{what}: a SMILES string or an RDKit Mol, not {type(structure).__name__}")


def _all_of(items, kind: type, what: str, maker: str) -> tuple:
    """`items` as a tuple, each checked to be a `kind`: a SMILES string where a Species belongs
    failed only later, inside check(), with an AttributeError."""
    items = tuple(items)
    for item in items:
        if not isinstance(item, kind):
            raise TypeError(f"{what}: each is a {kind.__name__} (made with arrows.build.{maker}), "
                            f"not {type(item).__name__} {item!r:.40}")
    return items


def species(name: str, structure) -> Species:
    """A species from a SMILES string or an RDKit Mol (written as SMILES with its atom maps)."""
    return Species(checked_name(name), _smiles_of(structure, f"species {name!r}"))


def checkpoint(smiles, whole_state: bool = False) -> Checkpoint:
    """An `expect` (or `product`) structure, a SMILES string or an RDKit Mol; whole_state=True
    demands the whole state (`expect all`)."""
    return Checkpoint(_smiles_of(smiles, "a checkpoint"), whole_state)


def _as_checkpoint(item: CheckpointLike) -> Checkpoint:
    return item if isinstance(item, Checkpoint) else checkpoint(item)


def step(label: str, *moves: MoveLike, kind: str = "forward", over: Optional[str] = None,
         under: Optional[str] = None, uses: Iterable[Species] = (), releases: Iterable[Union[AtomRef, str]] = (),
         expect: Iterable[CheckpointLike] = ()) -> Step:
    """One concerted step. Moves are Move objects or move text; `kind` is forward, reversible or
    resonance; `releases` takes atoms such as "O9"; `expect` takes SMILES or Checkpoints."""
    if kind not in STEP_KINDS:
        raise ValueError(f"step kind {kind!r}: choose one of {', '.join(STEP_KINDS)}")
    return Step(label, kind, over, under, _all_of(uses, Species, f"uses of step {label!r}", "species"),
                tuple(m if isinstance(m, Move) else move(m) for m in moves),
                tuple(r if isinstance(r, AtomRef) else atom(r) for r in releases),
                tuple(_as_checkpoint(c) for c in expect))


def mechanism(*, title: Optional[str] = None, caption: Optional[str] = None, species: Iterable[Species] = (),
              steps: Iterable[Step] = (), product: Optional[CheckpointLike] = None,
              source_name: str = "<text>") -> Mechanism:
    """A whole mechanism; equal to what `arrows.parse` gives for the same text."""
    return Mechanism(title, caption, _all_of(species, Species, "species", "species"), _all_of(steps, Step, "steps", "step"),
                     None if product is None else _as_checkpoint(product), source_name)
