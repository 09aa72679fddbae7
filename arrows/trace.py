"""Replaying a mechanism: species -> starting state -> the state after every step."""
from __future__ import annotations

import re
from dataclasses import dataclass, field
from typing import Iterator, Optional, Sequence

from rdkit import Chem

from .diagnostics import Diagnostic
from .electrons import AtomNumbers, ElectronState, StepChange, apply_step
from .model import AtomRef, BondPair, BondSink, HydrogenOn, Location, Mechanism, Species, Step
from .rdkit_io import (as_written, atom_list, canonical, rdkit_messages, read_smiles, reading_hint, sanitize,
                       unreadable)


@dataclass
class StepTrace:
    index: int
    step: Step
    before: ElectronState
    after: Optional[ElectronState]
    change: StepChange
    entered: tuple[int, ...] = ()         # atoms that joined with `uses`
    released_now: tuple[int, ...] = ()    # atoms whose fragment left after this step

    @property
    def derived(self) -> bool:
        return self.after is not None


@dataclass
class Trace:
    mechanism: Mechanism
    initial: Optional[ElectronState]
    steps: list[StepTrace] = field(default_factory=list)
    diagnostics: list[Diagnostic] = field(default_factory=list)

    @property
    def complete(self) -> bool:
        """Every step was derived."""
        return self.initial is not None and len(self.steps) == len(self.mechanism.steps) and all(
            s.derived for s in self.steps)

    @property
    def final(self) -> Optional[ElectronState]:
        if not self.complete:
            return None
        return self.steps[-1].after if self.steps else self.initial

    def states(self) -> Iterator[ElectronState]:
        """The starting state, then the state after each derived step."""
        if self.initial is not None:
            yield self.initial
        for s in self.steps:
            if s.after is not None:
                yield s.after


def hydrogen_parents_and_entries(mechanism: Mechanism) -> tuple[set[int], list[tuple[int, Species]]]:
    """In one pass over the steps: the map numbers of atoms whose hydrogens some move names (those
    hydrogens become explicit atoms), and the species that steps bring in with `uses`."""
    parents: set[int] = set()
    entries: list[tuple[int, Species]] = []
    for index, step in enumerate(mechanism.steps):
        entries.extend((index, s) for s in step.uses)
        for move in step.moves:
            for ref in _refs_named(move):
                if isinstance(ref, HydrogenOn):
                    parents.add(ref.parent.map_number)
    return parents, entries


def _refs_named(move) -> tuple:
    """The atoms a move names: both ends of a bond it starts from or ends at, else its one atom."""
    src, sink = move.source, move.sink
    named = (src.bond.first, src.bond.second) if isinstance(src, BondPair) else (src.atom,)
    return named + ((sink.bond.first, sink.bond.second) if isinstance(sink, BondSink) else (sink.atom,))


# An aromatic atom in a SMILES: a lower-case c, n, o, s or p not ending a two-letter symbol (Sc, Co).
_AROMATIC_ATOM = re.compile(r"(?<![A-Z])[cnosp]")


def named_pi_bonds(mechanism: Mechanism) -> frozenset[frozenset[int]]:
    """Map numbers of the two atoms of every bond a move starts from written `=` (a pi pair the
    author sees): which Kekule structure of a ring written aromatic the arrows were drawn on."""
    return frozenset(frozenset((move.source.bond.first.map_number, move.source.bond.second.map_number))
                     for step in mechanism.steps for move in step.moves
                     if isinstance(move.source, BondPair) and move.source.bond.order == 2
                     and isinstance(move.source.bond.first, AtomRef) and isinstance(move.source.bond.second, AtomRef))


def species_mol(species: Species, explicit_h_on: set[int]) -> tuple[Optional[Chem.Mol], Optional[Diagnostic]]:
    """A species as a Kekulé Mol whose hydrogen counts are fixed (never recomputed by RDKit), with
    explicit hydrogen atoms on the atoms whose hydrogens move."""
    with rdkit_messages():
        mol, _, _, problem = read_species(species, explicit_h_on)
    return mol, problem


def read_species(species: Species, explicit_h_on: set[int], pi_bonds: frozenset[frozenset[int]] = frozenset()
                 ) -> tuple[Optional[Chem.Mol], Optional[AtomNumbers], list[tuple[int, int]], Optional[Diagnostic]]:
    """species_mol, with the numbers of its atoms (for ElectronState.of_molecule) and (index, map
    number) of its mapped atoms, read in the walk over the atoms that fixes the hydrogen counts.
    A ring written aromatic takes the Kekule structure that has most of `pi_bonds` (map-number
    pairs the arrows start from as double bonds) double. Called inside an rdkit_messages() block
    (RDKit's log of a bad SMILES is not ours to print)."""
    # Without aromaticity perception: a Kekulé structure written by the author keeps its double bonds
    # (the arrows name them); lower-case aromatic input is kekulized by RDKit.
    mol = as_written(species.smiles)
    atoms = atom_list(mol) if mol is not None else []   # the same atoms after sanitizing
    smiles = species.smiles
    # A chiral tag comes only from @ in a SMILES, a double bond's configuration only from / or \\
    # (or from a CXSMILES extension, after |).
    geometry_written = "/" in smiles or "\\" in smiles
    chiral_written, geometry_read = "@" in smiles or "|" in smiles, geometry_written or "|" in smiles
    elements = [a.GetAtomicNum() for a in atoms]   # sanitizing changes no element
    try:
        # The named pi bonds that the SMILES writes aromatic: asked before sanitizing, whose
        # Kekule step clears the flags.
        drawn_on = _aromatic_pairs(mol) & pi_bonds if pi_bonds and _AROMATIC_ATOM.search(smiles) else frozenset()
        # The smallest set of rings only where RDKit's stereo perception reads it: the state the
        # species joins (Chem.CombineMols) keeps no rings, and each step finds its own (electrons._settle).
        sanitize(mol, elements, aromaticity=False, rings=chiral_written or geometry_read)
        Chem.Kekulize(mol, clearAromaticFlags=True)
        if drawn_on:
            _kekule_as_drawn(mol, drawn_on)
        if geometry_written:
            # Read without sanitizing, a written E/Z is only a direction on each neighbouring bond:
            # RDKit's perception turns it into the double bond's own configuration, which the
            # replay carries and forgets (configuration.forget_configuration) as it does a chiral tag.
            Chem.AssignStereochemistry(mol, cleanIt=True, force=True)
    except Exception:   # RDKit's full reading says why, and where (read_smiles translates its message)
        mol = None
    if mol is None:
        _, reason, position = read_smiles(species.smiles)
        reason = reason or "RDKit cannot write it in Kekulé form"
        loc = species.smiles_loc
        if position is not None:
            loc = Location(loc.file, loc.line, loc.column + position)
        return None, None, [], Diagnostic("AR102", unreadable(f"the SMILES of {species.name}", reason), loc,
                                          hint=reading_hint(reason, "check brackets, ring-closure digits and charges; "
                                                                    "map numbers go inside brackets, e.g. [CH2:3]"))
    count = len(atoms)
    charges, hydrogens = [0] * count, [0] * count
    chiral = False
    unspecified = Chem.ChiralType.CHI_UNSPECIFIED
    mapped, targets = [], []
    for index, atom in enumerate(atoms):
        count_h = atom.GetTotalNumHs(False)   # (includeNeighbors: RDKit reads a keyword argument at some cost)
        atom.SetNumExplicitHs(count_h)
        atom.SetNoImplicit(True)
        radicals = atom.GetNumRadicalElectrons()
        if radicals > 1:
            # RDKit's reader gives an atom's unused valence as radical electrons ([Mg] two, a
            # carbene [CH2] two); the bookkeeping pairs them, unpaired = N mod 2, as in every
            # derived state (the parity is the same), so a figure shows a pair, not two dots.
            atom.SetNumRadicalElectrons(radicals % 2)
        charges[index], hydrogens[index] = atom.GetFormalCharge(), count_h
        if chiral_written and atom.GetChiralTag() != unspecified:
            chiral = True
        number = atom.GetAtomMapNum()
        if number:
            mapped.append((index, number))
        if count_h and number in explicit_h_on:
            targets.append(index)
    if targets:
        mol = Chem.AddHs(mol, onlyOnAtoms=targets)
        for index in targets:    # its hydrogens are atoms now
            hydrogens[index] = 0
        for index in range(count, mol.GetNumAtoms()):   # the new hydrogens (the others keep theirs)
            mol.GetAtomWithIdx(index).SetNoImplicit(True)
            elements.append(1)
            charges.append(0)
            hydrogens.append(0)
    return mol, AtomNumbers(elements, charges, hydrogens, chiral, geometry_read), mapped, None


def _aromatic_pairs(mol: Chem.Mol) -> frozenset[frozenset[int]]:
    """Map numbers of the two ends of every bond `mol` (read as written) holds aromatic."""
    bond_at, atom_at = mol.GetBondWithIdx, mol.GetAtomWithIdx
    return frozenset(frozenset((atom_at(b.GetBeginAtomIdx()).GetAtomMapNum(), atom_at(b.GetEndAtomIdx()).GetAtomMapNum()))
                     for b in (bond_at(k) for k in range(mol.GetNumBonds())) if b.GetIsAromatic())


def _kekule_as_drawn(mol: Chem.Mol, pi_bonds: frozenset[frozenset[int]]) -> None:
    """Give `mol`, kekulized by RDKit from a ring written aromatic, the Kekule structure in which
    most of `pi_bonds` (bonds written aromatic) are double (benzene's C1=C6 named by an arrow,
    where RDKit had put C1=C2): the author drew the arrows on one structure, and either is the
    molecule."""
    maps = {a.GetIdx(): a.GetAtomMapNum() for a in atom_list(mol) if a.GetAtomMapNum()}

    def named_double(m: Chem.Mol) -> int:
        return sum(1 for b in m.GetBonds() if b.GetBondType() == Chem.BondType.DOUBLE
                   and frozenset((maps.get(b.GetBeginAtomIdx()), maps.get(b.GetEndAtomIdx()))) in pi_bonds)

    relevant = {b.GetIdx() for b in mol.GetBonds()
                if frozenset((maps.get(b.GetBeginAtomIdx()), maps.get(b.GetEndAtomIdx()))) in pi_bonds}
    if all(mol.GetBondWithIdx(k).GetBondType() == Chem.BondType.DOUBLE for k in relevant):
        return
    best, best_count = None, named_double(mol)
    # RDKit's resonance enumerator lists every Kekule structure (benzene two, naphthalene three).
    for form in Chem.ResonanceMolSupplier(mol, Chem.KEKULE_ALL):
        if form is None:
            continue
        count = named_double(form)
        if count > best_count:
            best, best_count = form, count
    if best is None:
        return
    for bond in best.GetBonds():
        order = bond.GetBondType()
        if order in (Chem.BondType.SINGLE, Chem.BondType.DOUBLE):
            mol.GetBondWithIdx(bond.GetIdx()).SetBondType(order)


def map_location(species: Species, number: int, occurrence: int) -> Location:
    """Where the n-th bracket atom carrying `number` is written in the species SMILES."""
    starts = [m.start() for m in re.finditer(rf"\[[^\[\]]*:{number}\]", species.smiles)]
    if len(starts) < occurrence:
        return species.smiles_loc
    loc = species.smiles_loc
    return Location(loc.file, loc.line, loc.column + starts[occurrence - 1])


def _fragment_of(mol: Chem.Mol, index: int) -> set[int]:
    for frag in Chem.GetMolFrags(mol, asMols=False, sanitizeFrags=False):
        if index in frag:
            return set(frag)
    return {index}


def _smaller_than_another(state: ElectronState, fragment: set[int], released: set[int],
                          counted: Optional[set[int]] = None) -> bool:
    """Whether some molecule of `state` outside `fragment` and not released has more heavy atoms;
    with `counted`, only a molecule holding one of those atoms counts."""
    elements = state.elements
    heavy = sum(1 for i in fragment if elements[i] != 1)
    return any(sum(1 for i in frag if elements[i] != 1) > heavy
               for frag in Chem.GetMolFrags(state.mol, asMols=False, sanitizeFrags=False)
               if not fragment & set(frag) and not released.issuperset(frag)
               and (counted is None or not counted.isdisjoint(frag)))


def _atoms_named_after(mechanism: Mechanism, index: int, map_index: dict[int, int]) -> set[int]:
    """The atoms (by index, of those in the drawing now) that the arrows of the steps after step
    `index` name: the molecules the mechanism goes on with."""
    numbers = {(ref.parent if isinstance(ref, HydrogenOn) else ref).map_number
               for step in mechanism.steps[index + 1:] for move in step.moves for ref in _refs_named(move)}
    return {map_index[n] for n in numbers if n in map_index}


class Replay:
    """Derives the states of a mechanism one step at a time: iterate it for each StepTrace. The
    species are loaded (and every bad SMILES and duplicate reported) when it is made; `initial` is
    None when they cannot be. Iteration stops after the first step whose moves cannot be applied;
    the reasons are in `diagnostics`. Nothing of earlier steps is kept."""

    def __init__(self, mechanism: Mechanism):
        self.mechanism = mechanism
        self.diagnostics: list[Diagnostic] = []
        self.initial: Optional[ElectronState] = None
        self.final: Optional[ElectronState] = None     # set once every step is derived
        self.steps_replayed = 0
        self._mapped: dict[int, list[tuple[int, int]]] = {}   # per species position: (index, map number)
        self._loaded, self._entered_later = self._load()
        if self.diagnostics:
            return
        start = ElectronState(Chem.Mol(), ())
        for position in range(len(mechanism.species)):
            species = self._loaded[position]
            start = start.appended(species, Chem.CombineMols(start.mol, species.mol))
        self.initial = start
        if not mechanism.steps:
            self.final = self.initial

    def _load(self) -> tuple[dict[int, ElectronState], dict[int, int]]:
        """Every species up front, `uses` ones included, so that every bad SMILES and duplicate
        is reported at once; each as a state of its own, to be appended to the mechanism's."""
        mechanism, diags = self.mechanism, self.diagnostics
        explicit_h_on, entries = hydrogen_parents_and_entries(mechanism)
        declared = [(None, s) for s in mechanism.species] + entries
        # (the moves are read for them only where a species is written aromatic)
        pi_bonds = named_pi_bonds(mechanism) if any(_AROMATIC_ATOM.search(sp.smiles) for _, sp in declared) \
            else frozenset()
        names: dict[str, Location] = {}
        seen_maps: dict[int, Location] = {}
        loaded: dict[int, ElectronState] = {}
        entered_later: dict[int, int] = {}
        with rdkit_messages():   # one quiet block for every species (read_species)
            for position, (step_index, sp) in enumerate(declared):
                if sp.name in names:
                    diags.append(Diagnostic("AR108", f"the name `{sp.name}` is already used (line {names[sp.name].line})",
                                            sp.loc, hint="give each species its own name"))
                names.setdefault(sp.name, sp.loc)
                mol, numbers, mapped, problem = read_species(sp, explicit_h_on, pi_bonds)
                if problem:
                    diags.append(problem)
                    continue
                in_this_species: dict[int, int] = {}
                self._mapped[position] = mapped
                for _, number in mapped:
                    in_this_species[number] = in_this_species.get(number, 0) + 1
                    if number in seen_maps:
                        diags.append(Diagnostic("AR103", f"map number {number} is already used "
                                                f"(line {seen_maps[number].line})",
                                                map_location(sp, number, in_this_species[number]),
                                                hint="map numbers are unique across the whole mechanism"))
                    seen_maps.setdefault(number, sp.loc)
                    if step_index is not None:
                        entered_later.setdefault(number, step_index)
                loaded[position] = ElectronState.of_molecule(mol, atoms=numbers)
        return loaded, entered_later

    def __iter__(self) -> Iterator[StepTrace]:
        if self.initial is None:
            return
        mechanism, diags, loaded, entered_later = self.mechanism, self.diagnostics, self._loaded, self._entered_later
        state = self.initial
        map_index, offset = {}, 0
        for position in range(len(mechanism.species)):
            map_index.update((number, offset + atom_index) for atom_index, number in self._mapped[position])
            offset += len(loaded[position].nonbonding)
        position = len(mechanism.species)
        known: dict[tuple[str, int], int] = {}   # written atoms found so far (electrons._StepReplay.resolve)
        # One quiet block for the whole replay: RDKit logs a rejected state, whose message we report.
        with rdkit_messages():
            for index, step in enumerate(mechanism.steps):
                entered: list[int] = []
                for _ in step.uses:
                    offset = len(state.nonbonding)
                    species = loaded[position]
                    incoming = species.mol
                    position += 1
                    state = state.appended(species, Chem.CombineMols(state.mol, incoming))
                    entered.extend(range(offset, offset + incoming.GetNumAtoms()))
                    for atom_index, number in self._mapped[position - 1]:
                        map_index[number] = offset + atom_index
                        entered_later.pop(number, None)
                after, change, step_diags = apply_step(state, step, index, map_index, entered_later, known)
                diags.extend(step_diags)
                released_now: list[int] = []
                if after is not None and step.releases:
                    after, released_now = self._release(after, step, index, map_index, change.touched_atoms,
                                                         change.moves)
                self.steps_replayed += 1
                if after is not None and index == len(mechanism.steps) - 1:
                    self.final = after
                yield StepTrace(index, step, state, after, change, tuple(entered), tuple(released_now))
                if after is None:
                    return
                state = after

    def _release(self, after: ElectronState, step: Step, index: int, map_index: dict[int, int],
                 touched: list[int], moves: Sequence = ()) -> tuple[ElectronState, list[int]]:
        released = set(after.released)
        released_now: list[int] = []
        for ref in step.releases:
            atom_index = map_index.get(ref.map_number)
            if atom_index is None:
                self.diagnostics.append(Diagnostic("AR104", f"no atom carries map number {ref.map_number}", ref.loc,
                                                   hint="`releases` names a mapped atom of the leaving fragment",
                                                   step=index))
                continue
            if atom_index in after.released:
                name = after.label(atom_index)
                self.diagnostics.append(Diagnostic(
                    "AR106", f"{name} left the drawing with `releases` in an earlier step", ref.loc,
                    hint=f"release a fragment once: drop this `releases {name}`", step=index, atoms=(name,)))
                continue
            if atom_index in released:
                # Named again in this step, or another atom of a fragment this step lets go already.
                name = after.label(atom_index)
                self.diagnostics.append(Diagnostic(
                    "AR106", f"{name} already left the drawing with a `releases` earlier in this step", ref.loc,
                    hint="one `releases` per fragment, naming any one of its atoms: drop this one",
                    step=index, atoms=(name,)))
                continue
            fragment = _fragment_of(after.mol, atom_index) - released
            reacted = len(touched) > 1 and fragment.issuperset(touched)
            # A larger molecule that stays excuses a release only if the step made the fragment
            # whole (every heavy atom touched: Ag+ and Br- joined), or the mechanism goes on with
            # that molecule: a spectator, or a by-product no later arrow touches, says nothing.
            counted = None if not reacted or all(after.elements[a] == 1 or a in touched for a in fragment) \
                else _atoms_named_after(self.mechanism, index, map_index)
            if (reacted or not touched) and len(fragment) > 1 and not _smaller_than_another(after, fragment, released,
                                                                                              counted):
                # A fragment that leaves is a piece the step's arrows split off (a leaving group)
                # or a partner they left whole (a base that took its proton); one that holds every
                # atom they touched is the molecule that reacted: a bond to the atom named was
                # meant to break. Unless a larger molecule stays: then the step made a small one
                # to let go (silver bromide precipitating from Ag+ and Br-). A step with no
                # arrows that lets the largest molecule go has the same slip.
                name = after.label(atom_index)
                near = [n.GetIdx() for n in after.mol.GetAtomWithIdx(atom_index).GetNeighbors()
                        if after.elements[n.GetIdx()] != 1]
                holder = next((n for n in near if n in touched), None) if touched else next(iter(near), None)
                bond = f"{after.label(holder)}-{name}" if holder is not None else "its bond"
                took_pi = holder is not None and any(m.source_kind == "bond" and set(m.source_atoms) == {holder, atom_index}
                                                     for m in moves)
                what = (f"the molecule this step's arrows act on ({len(fragment)} atoms, every atom they touch "
                        f"among them)" if reacted else f"the largest molecule left ({len(fragment)} atoms): no arrow "
                        f"breaks {name}'s bond to it")
                if took_pi:
                    hint = (f"the arrow from {bond} takes only one pair of a multiple bond, and {bond} stays: if "
                            f"{name} leaves, draw first the form in which {bond} is single (a resonance step)")
                elif holder is not None:
                    hint = f"if {name} leaves, break {bond} with an arrow (`{bond} -> {name}`), in this step or the next"
                else:
                    hint = f"if {name} leaves, break its bond first"
                self.diagnostics.append(Diagnostic("AR512", f"`releases {name}` takes away {what}", ref.loc,
                                                   hint=hint, step=index, atoms=(name,)))
            released_now.extend(sorted(fragment))
            released |= fragment
        return ElectronState(after.mol, after.nonbonding, frozenset(released), after.valence, after.bond_sums,
                            after.elements, after.configured, after.framework, after.cation_atoms), released_now


def replay(mechanism: Mechanism) -> Trace:
    """Derive every state of the mechanism and keep them all (for drawing, tracing, exporting).
    Stops at the first step whose moves cannot be applied; the reasons are in `trace.diagnostics`."""
    steps = Replay(mechanism)
    trace = Trace(mechanism, steps.initial, [], steps.diagnostics)
    trace.steps.extend(steps)
    return trace


def state_smiles(state: ElectronState) -> str:
    """Canonical SMILES of a whole state (released fragments included)."""
    return canonical(state.mol)
