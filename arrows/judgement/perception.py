"""One perceived view of a state, shared by the judgements that read a state through RDKit's
perception (acidity by SMARTS, stereo elements): hydrogen atoms folded into counts, rings and
aromaticity perceived, and each atom's index in the state.

A state keeps as explicit atoms only the hydrogens that some arrow moves; left in, such a
hydrogen would make two equal groups look different to stereo perception.
"""
from __future__ import annotations

from bisect import bisect_left
from typing import Iterable, Optional

from rdkit import Chem

from ..electrons import ElectronState
from ..rdkit_io import forget_configuration
from .acidity import perceived

_HYDROGEN = Chem.MolFromSmarts("[#1]")
_REMOVE_HS = Chem.RemoveHsParameters()
_REMOVE_HS.removeDegreeZero = True     # a free proton too


class Perceived:
    """The view of one state. `complete` is False when RDKit would not perceive it whole: then
    `mol` keeps its hydrogens and a partial perception, good for SMARTS matching only."""

    __slots__ = ("mol", "original", "complete", "memo")

    def __init__(self, mol: Chem.Mol, original: tuple[int, ...], complete: bool):
        self.mol = mol                # hydrogens as counts, rings and aromaticity perceived
        self.original = original      # index in `mol` -> state atom index (ascending)
        self.complete = complete
        self.memo: dict = {}          # judgements already made on this view

    def position(self, atom: int) -> Optional[int]:
        """The index in `mol` of state atom `atom` (None for a hydrogen atom folded into a count)."""
        k = bisect_left(self.original, atom)
        return k if k < len(self.original) and self.original[k] == atom else None


def perceive(mol: Chem.Mol, clear_stereo_on: Iterable[int] = (), heavy: Optional[tuple[int, ...]] = None) -> Perceived:
    """The view of `mol`. Only the atoms in `clear_stereo_on` lose their configuration; `heavy`,
    the indices of the atoms that are not hydrogen, spares a search when the caller knows them."""
    clear_stereo_on = list(clear_stereo_on)
    work = mol
    if clear_stereo_on:      # RemoveHs copies anyway: a copy of our own only when we change it
        work = Chem.RWMol(mol)
        forget_configuration(work, clear_stereo_on)
        work = work.GetMol()
    if heavy is None:
        # The hydrogen atoms found in C++ (a state holds only a few): cheaper than a walk over every atom.
        hydrogens = {m[0] for m in work.GetSubstructMatches(_HYDROGEN, maxMatches=work.GetNumAtoms() + 1)}
        heavy = tuple(i for i in range(work.GetNumAtoms()) if i not in hydrogens)
    try:
        plain = Chem.RemoveHs(work, _REMOVE_HS, sanitize=False)
        Chem.SanitizeMol(plain)
        if plain.GetNumAtoms() == len(heavy):   # else RDKit kept a hydrogen (an isotope, a bridge)
            return Perceived(plain, heavy, True)
    except Exception:   # an odd intermediate: fall back to a partial perception below
        pass
    return _partial(work)


def _partial(mol: Chem.Mol) -> Perceived:
    work = perceived(mol)   # the acidity table's own copy: hydrogens kept, perceived as far as RDKit goes
    return Perceived(work, tuple(range(work.GetNumAtoms())), False)


class RecentViews:
    """The views of the last few states met. A step's state after is the next step's state before,
    and several checks read each state: each state is perceived once, and only a few are kept."""

    def __init__(self, keep: int = 4):
        self.keep = keep
        self._views: dict[int, tuple[ElectronState, Perceived]] = {}
        self._heavy: tuple[tuple[int, ...], tuple[int, ...]] = ((), ())   # (elements, heavy atom indices)

    def of(self, state: ElectronState) -> Perceived:
        key = id(state)
        entry = self._views.get(key)
        if entry is None:
            # The state is held with its view, so its id cannot be reused while the entry lives.
            entry = (state, perceive(state.mol, heavy=self._heavy_atoms(state.elements)))
            self._views[key] = entry
            if len(self._views) > self.keep:
                del self._views[next(iter(self._views))]
        return entry[1]

    def _heavy_atoms(self, elements: tuple[int, ...]) -> tuple[int, ...]:
        """Steps pass one elements tuple on from state to state (atoms only change with `uses`):
        the heavy atoms are found again only when it changes."""
        if self._heavy[0] is not elements:
            self._heavy = (elements, tuple(i for i, z in enumerate(elements) if z != 1))
        return self._heavy[1]
