"""One perceived view of a state, shared by the judgements that read a state through RDKit's
perception (acidity by SMARTS, stereo elements): hydrogen atoms folded into counts, rings and
aromaticity perceived, and each atom's index in the state.

A state keeps as explicit atoms only the hydrogens that some arrow moves; left in, such a
hydrogen would make two equal groups look different to stereo perception. A labelled hydrogen
(D, T) is different, and stays an atom in the view.
"""
from __future__ import annotations

from bisect import bisect_left
from typing import Iterable, Optional

from rdkit import Chem

from ..electrons import ElectronState
from ..configuration import forget_configuration
from ..rdkit_io import sanitize
from .acidity import perceived

_HYDROGEN = Chem.MolFromSmarts("[#1]")
_REMOVE_HS = Chem.RemoveHsParameters()
_REMOVE_HS.removeDegreeZero = True     # a free proton too
_REMOVE_HS.removeHydrides = True       # a free hydride ion (NaH as a base)
_REMOVE_HS.removeOnlyHNeighbors = True  # H2 (a hydride met by a proton): else the view is only partial


class Perceived:
    """The view of one state. `complete` is False when RDKit would not perceive it whole: then
    `mol` keeps its hydrogens and a partial perception, good for SMARTS matching only."""

    __slots__ = ("mol", "original", "complete", "memo")

    def __init__(self, mol: Chem.Mol, original: tuple[int, ...], complete: bool):
        self.mol = mol                # hydrogens as counts (D and T as atoms), rings and aromaticity perceived
        self.original = original      # index in `mol` -> state atom index (ascending)
        self.complete = complete
        self.memo: dict = {}          # judgements already made on this view

    def position(self, atom: int) -> Optional[int]:
        """The index in `mol` of state atom `atom` (None for a hydrogen atom folded into a count)."""
        k = bisect_left(self.original, atom)
        return k if k < len(self.original) and self.original[k] == atom else None


def aromatic(view: Perceived, atom: int) -> bool:
    """Whether state atom `atom` is aromatic in the view (False for a hydrogen folded into a
    count); remembered on the view, which a proton shuttle meets again and again."""
    known = view.memo.setdefault("aromatic", {})
    if atom not in known:
        position = view.position(atom)
        known[atom] = position is not None and view.mol.GetAtomWithIdx(position).GetIsAromatic()
    return known[atom]


def perceive(mol: Chem.Mol, clear_stereo_on: Iterable[int] = (), heavy: Optional[tuple[int, ...]] = None,
             elements: Optional[tuple[int, ...]] = None) -> Perceived:
    """The view of `mol`. Only the atoms in `clear_stereo_on` lose their configuration; `heavy`,
    the indices of the atoms that are not hydrogen, spares a search when the caller knows them, and
    `elements`, the atomic number of each atom, a step of the sanitization (rdkit_io.sanitize)."""
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
        sanitize(plain, elements)
        if plain.GetNumAtoms() == len(heavy):   # else RDKit kept a hydrogen (an isotope, a bridge)
            return Perceived(plain, heavy, True)
        # A deuterium or tritium stays an atom, as RDKit writes it ([2H]): a CHD carbon is a
        # stereocentre. The view is whole if those are all RDKit kept.
        labelled = {i for i in range(work.GetNumAtoms())
                    if work.GetAtomWithIdx(i).GetAtomicNum() == 1 and work.GetAtomWithIdx(i).GetIsotope()}
        kept = tuple(sorted(set(heavy) | labelled))
        if labelled and plain.GetNumAtoms() == len(kept):
            return Perceived(plain, kept, True)
    except Exception:   # an odd intermediate: fall back to a partial perception below
        pass
    return _partial(work)


def _partial(mol: Chem.Mol) -> Perceived:
    work = perceived(mol)   # the acidity table's own copy: hydrogens kept, perceived as far as RDKit goes
    return Perceived(work, tuple(range(work.GetNumAtoms())), False)


class RecentViews:
    """The views of the states met. A step's state after is the next step's state before, and
    several checks read each state: each state is perceived once, and only a few are kept. A state
    met again (a proton shuttle comes back to where it was, with another of the equal hydrogens
    moved) is recognised by its contents and gets the view, and the judgements, made the first time."""

    def __init__(self, keep: int = 4, keep_contents: int = 64):
        self.keep, self.keep_contents = keep, keep_contents
        self._views: dict[int, tuple[ElectronState, Perceived]] = {}
        # Per elements tuple (atoms change only with `uses`): heavy atom indices, whether every
        # hydrogen atom is interchangeable with the others, and the views met by contents.
        self._elements: Optional[tuple[int, ...]] = None
        self._heavy: tuple[int, ...] = ()
        self._plain_hydrogens = False
        self._by_contents: dict[tuple, Perceived] = {}

    def of(self, state: ElectronState) -> Perceived:
        key = id(state)
        entry = self._views.get(key)
        if entry is None:
            # The state is held with its view, so its id cannot be reused while the entry lives.
            entry = (state, self._view(state))
            self._views[key] = entry
            if len(self._views) > self.keep:
                del self._views[next(iter(self._views))]
        return entry[1]

    def _view(self, state: ElectronState) -> Perceived:
        if self._elements is not state.elements:
            self._meet_atoms(state)
        if state.configured or not self._plain_hydrogens:
            return perceive(state.mol, heavy=self._heavy, elements=state.elements)
        # N and B of every atom and the bonds between heavy atoms (and between hydrogens) fix the
        # state up to a permutation of its hydrogen atoms, which RemoveHs folds into equal counts.
        contents = (state.nonbonding, state.bond_sums, state.bond_framework())
        view = self._by_contents.get(contents)
        if view is None:
            view = perceive(state.mol, heavy=self._heavy, elements=state.elements)
            if view.complete:      # a partial view keeps hydrogen atoms: which one is where matters
                self._by_contents[contents] = view
                if len(self._by_contents) > self.keep_contents:
                    del self._by_contents[next(iter(self._by_contents))]
        return view

    def _meet_atoms(self, state: ElectronState) -> None:
        """Steps pass one elements tuple on from state to state: the heavy atoms are found again,
        and the views met by contents forgotten, only when it changes."""
        elements, atom = state.elements, state.mol.GetAtomWithIdx
        self._elements = elements
        self._heavy = tuple(i for i, z in enumerate(elements) if z != 1)
        # A hydrogen isotope stays an atom of the view, where its place shows.
        self._plain_hydrogens = all(atom(i).GetIsotope() == 0 for i, z in enumerate(elements) if z == 1)
        self._by_contents = {}
