"""The model's @frozen classes behave as the standard library's @dataclass(frozen=True) does: the
reference is a twin of each class declared the standard way (Python's dataclasses module)."""
from __future__ import annotations

import copy
import dataclasses
import inspect
import pickle
from dataclasses import dataclass, field

import pytest

from arrows.diagnostics import Diagnostic
from arrows.model import AtomRef, Location, Step, frozen


@dataclass(frozen=True)
class StandardAtom:
    element: str
    map_number: int
    loc: Location = field(default_factory=Location, compare=False)


@frozen
class SharedAtom:
    element: str
    map_number: int
    loc: Location = field(default_factory=Location, compare=False)


def test_equality_hash_and_repr_follow_the_standard_twin():
    here, there = Location("a.mech", 3, 5), Location("b.mech", 9, 1)
    for cls in (StandardAtom, SharedAtom):
        assert cls("C", 7, here) == cls("C", 7, there)          # loc does not compare
        assert hash(cls("C", 7, here)) == hash(cls("C", 7, there))
        assert cls("C", 7) != cls("C", 8) and cls("C", 7) != cls("N", 7)
        assert cls("C", 7).__eq__(("C", 7)) is NotImplemented
    assert repr(SharedAtom("C", 7, here)).replace("Shared", "Standard") == repr(StandardAtom("C", 7, here))


def test_frozen_as_the_standard_twin():
    for atom in (StandardAtom("C", 7), SharedAtom("C", 7)):
        with pytest.raises(dataclasses.FrozenInstanceError):
            atom.element = "N"
        with pytest.raises(dataclasses.FrozenInstanceError):
            del atom.map_number


def test_arguments_are_bound_as_the_standard_twin():
    for cls in (StandardAtom, SharedAtom):
        assert cls(element="C", map_number=7) == cls("C", map_number=7) == cls("C", 7)
        assert cls("C", 7).loc == Location()                    # default factory
        for bad in (lambda: cls("C"), lambda: cls("C", 7, Location(), 4), lambda: cls("C", 7, colour=1),
                    lambda: cls("C", 7, element="N")):
            with pytest.raises(TypeError):
                bad()
    assert str(inspect.signature(SharedAtom)) == str(inspect.signature(StandardAtom)).replace(
        "<factory>", repr(Location()))


def test_dataclass_tools_copies_and_post_init_work():
    atom = AtomRef("C", 7, Location("a.mech", 3, 5))
    assert dataclasses.is_dataclass(atom) and [f.name for f in dataclasses.fields(atom)] == ["element", "map_number", "loc"]
    assert dataclasses.replace(atom, map_number=8) == AtomRef("C", 8)
    assert pickle.loads(pickle.dumps(atom)) == atom and copy.deepcopy(Step("s", moves=())) == Step("s")
    assert Diagnostic("AR301", "octet exceeded", Location()).severity == "error"   # __post_init__ ran
