"""Electron bookkeeping: the state of every atom's non-bonding electrons and every bond's
electron count, and applying one concerted step of arrows to it.

For each atom: V valence electrons of the free atom, N non-bonding electrons, B the sum of bond
orders (hydrogens included). Formal charge = V - N - B; unpaired electrons = N mod 2. The RDKit Mol
of a state is derived from these numbers, never the other way round; a hydrogen count changes only
through a move.
"""
from __future__ import annotations

from dataclasses import dataclass, field
from functools import lru_cache
from typing import Callable, NamedTuple, Optional

from rdkit import Chem

from .diagnostics import Diagnostic
from .model import (AtomSink, BareAtom, BondPair, BondRef, BondSink, HydrogenOn, Location, LonePair, Move, NonbondingSink, Step,
                    UnpairedElectron, CONNECTORS)
from .configuration import ChairModel, carry_configuration, has_configuration, may_configure, names_light
from .rdkit_io import ELECTRONEGATIVITY, HYDRIDIC, atom_list, valence_complaint, valence_electrons

_BOND_TYPES = {1: Chem.BondType.SINGLE, 2: Chem.BondType.DOUBLE, 3: Chem.BondType.TRIPLE}
# RDKit's valence check and computed properties (implicit hydrogens, explicit valence): what makes a
# state a molecule. The rest of a full sanitization only perceives (rings, aromaticity, hybridization,
# conjugation), which the judgements do on their own view (judgement/perception.py); not
# FINDRADICALS, which would give a singlet carbene made by pair arrows two unpaired electrons: ours
# are the odd non-bonding electrons set from the bookkeeping.
_STATE_SANITIZE = Chem.SanitizeFlags.SANITIZE_PROPERTIES
_ORDER_WORDS = {0: "none", 1: "single", 2: "double", 3: "triple"}


@lru_cache(maxsize=None)
def _atomic_number(symbol: str) -> int:
    """-1 for a symbol that is no element (the atom is then reported as not matching)."""
    try:
        return Chem.GetPeriodicTable().GetAtomicNumber(symbol)
    except RuntimeError:
        return -1


def order_word(order: int) -> str:
    return _ORDER_WORDS.get(order, f"order {order}")


Pair = tuple[int, int]


# N, Cl, Br, I: RDKit's sanitization writes their oxides with more bonds than the element's
# valence list allows (a nitro N(=O)=O, periodate's I(=O)3) as X+ - O- (its clean-up step).
_CHARGE_SEPARATED = frozenset({7, 17, 35, 53})


def pair(i: int, j: int) -> Pair:
    return (i, j) if i < j else (j, i)


@dataclass(frozen=True)   # generated __init__: one state per step, the shared one costs more
class ElectronState:
    """One moment of the mechanism. Atom indices are identities: atoms are only ever appended.

    `valence` (V) and `bond_sums` (B, hydrogens included) per atom are derived from `mol` when not
    given; a step passes them on updated, so the per-step bookkeeping needs no walk over RDKit bonds.
    """

    mol: Chem.Mol                     # Kekulé form, atom maps kept, explicit H atoms where they move
    nonbonding: tuple[int, ...]       # N per atom
    released: frozenset[int] = frozenset()
    valence: tuple[int, ...] = ()
    bond_sums: tuple[int, ...] = ()
    elements: tuple[int, ...] = ()      # atomic number per atom
    configured: Optional[bool] = None   # whether some atom or bond carries a written configuration
    # see `bond_framework`; derived from the other fields, so neither compared nor shown
    framework: Optional[frozenset[tuple[int, int, int]]] = field(default=None, compare=False, repr=False)
    cation_atoms: Optional[frozenset[int]] = field(default=None, compare=False, repr=False)   # see `cations`
    # Judgements made on this state (judgement/, by name), kept with it so that the checks and the
    # drawing that follows them make each once.
    judged: dict = field(default_factory=dict, compare=False, repr=False)

    def __post_init__(self) -> None:
        # A step hands these on (the common case, checked cheaply); a new state derives them.
        if self.configured is None:
            object.__setattr__(self, "configured", has_configuration(self.mol))
        if len(self.valence) != len(self.nonbonding):
            elements = tuple(a.GetAtomicNum() for a in atom_list(self.mol))
            object.__setattr__(self, "elements", elements)
            object.__setattr__(self, "valence", tuple(valence_electrons(z) for z in elements))
        if len(self.bond_sums) != len(self.nonbonding):
            object.__setattr__(self, "bond_sums", tuple(_bond_sums(self.mol)))

    @classmethod
    def of_molecule(cls, mol: Chem.Mol, known_nonbonding: tuple[int, ...] = (),
                    released: frozenset[int] = frozenset(), atoms: Optional["AtomNumbers"] = None
                    ) -> "ElectronState":
        """A state read off a Mol: N = V - formal charge - B for every atom after the first
        len(known_nonbonding), whose N is given (`uses` appends atoms to a state whose electrons
        have already moved). One walk over the atoms and one over the bonds find everything;
        `atoms`, the atoms' numbers when the caller has just read them (trace.read_species),
        spares the walk over the atoms."""
        count = mol.GetNumAtoms()
        if atoms is None:
            atoms = atom_numbers(mol)
        elements, charges, hydrogens, configured, bond_configuration = atoms
        orders = [0.0] * count
        bond, no_stereo = mol.GetBondWithIdx, Chem.BondStereo.STEREONONE
        framework = set()
        for k in range(mol.GetNumBonds()):
            b = bond(k)
            order = b.GetBondTypeAsDouble()
            i, j = b.GetBeginAtomIdx(), b.GetEndAtomIdx()
            orders[i] += order
            orders[j] += order
            if bond_configuration and b.GetStereo() != no_stereo:
                configured = True
            if (elements[i] == 1) == (elements[j] == 1):
                framework.add((i, j, int(order)) if i < j else (j, i, int(order)))
        sums = tuple(int(total) + h for total, h in zip(orders, hydrogens))
        valence = tuple(valence_electrons(z) for z in elements)
        nonbonding = tuple(known_nonbonding) + tuple(
            valence[i] - charges[i] - sums[i] for i in range(len(known_nonbonding), count))
        return cls(mol, nonbonding, released, valence, sums, tuple(elements), configured, frozenset(framework))

    def appended(self, other: "ElectronState", mol: Chem.Mol) -> "ElectronState":
        """This state with the atoms of `other` after its own, as `uses` brings a species in; `mol`
        is Chem.CombineMols(self.mol, other.mol). The numbers of both are joined, not read off
        the combined Mol again."""
        offset = len(self.nonbonding)
        shifted = {(i + offset, j + offset, order) for i, j, order in other.bond_framework()}
        cations = self.cations().union(i + offset for i in other.cations())   # then each step hands them on
        return ElectronState(mol, self.nonbonding + other.nonbonding, self.released, self.valence + other.valence,
                             self.bond_sums + other.bond_sums, self.elements + other.elements,
                             bool(self.configured or other.configured), self.bond_framework().union(shifted), cations)

    def bond_electrons(self, i: int, j: int) -> int:
        framework = self.framework
        if framework is not None and (self.elements[i] == 1) == (self.elements[j] == 1):
            # A bond of the framework is read off it: each question put to RDKit from Python
            # costs more than these look-ups.
            first, second = (i, j) if i < j else (j, i)
            for order in (1, 2, 3):
                if (first, second, order) in framework:
                    return 2 * order
        bond = self.mol.GetBondBetweenAtoms(i, j)
        return 0 if bond is None else 2 * int(bond.GetBondTypeAsDouble())

    def bond_order_sum(self, i: int) -> int:
        return self.bond_sums[i]

    def formal_charge(self, i: int) -> int:
        return self.valence[i] - self.nonbonding[i] - self.bond_sums[i]

    def label(self, i: int) -> str:
        return atom_label(self.mol, i)

    def cations(self) -> frozenset[int]:
        """The atoms with a positive formal charge (none in most states), found once per state."""
        if self.cation_atoms is None:
            object.__setattr__(self, "cation_atoms", frozenset(
                i for i, (v, n, b) in enumerate(zip(self.valence, self.nonbonding, self.bond_sums)) if v - n - b > 0))
        return self.cation_atoms

    def bond_framework(self) -> frozenset[tuple[int, int, int]]:
        """(i, j, order), i < j, of every bond except those joining a hydrogen to another element,
        the order counted as the bookkeeping counts it (bond_electrons). With N and B of every atom
        it fixes the state up to which hydrogen sits where (each atom's own hydrogen count never
        changes): the perceived views of two states of one replay that agree on all three are the
        same (judgement/perception.py). Read off the Mol with the other numbers, handed on updated
        by each step."""
        if self.framework is None:
            elements, bond = self.elements, self.mol.GetBondWithIdx
            found = set()
            for k in range(self.mol.GetNumBonds()):
                b = bond(k)
                i, j = pair(b.GetBeginAtomIdx(), b.GetEndAtomIdx())
                if (elements[i] == 1) == (elements[j] == 1):
                    found.add((i, j, int(b.GetBondTypeAsDouble())))
            object.__setattr__(self, "framework", frozenset(found))
        return self.framework


class AtomNumbers(NamedTuple):
    """Per atom of a Mol: atomic number, formal charge, hydrogens held as a count; whether some
    atom carries a chiral tag, and whether a bond may carry a configuration (False when the
    caller knows none does)."""

    elements: list[int]
    charges: list[int]
    hydrogens: list[int]
    chiral: bool
    bond_configuration: bool = True


def atom_numbers(mol: Chem.Mol) -> AtomNumbers:
    """AtomNumbers read off `mol`, one walk over its atoms."""
    atom, count = mol.GetAtomWithIdx, mol.GetNumAtoms()
    unspecified = Chem.ChiralType.CHI_UNSPECIFIED
    elements, charges, hydrogens = [0] * count, [0] * count, [0] * count
    chiral = False
    for i in range(count):
        a = atom(i)
        elements[i], charges[i], hydrogens[i] = a.GetAtomicNum(), a.GetFormalCharge(), a.GetNumExplicitHs()
        if a.GetChiralTag() != unspecified:
            chiral = True
    return AtomNumbers(elements, charges, hydrogens, chiral)


def _bond_sums(mol: Chem.Mol) -> list[int]:
    """B per atom: bond orders (one pass over the bonds) plus hydrogens held as counts."""
    orders = [0.0] * mol.GetNumAtoms()
    bond = mol.GetBondWithIdx
    for k in range(mol.GetNumBonds()):
        b = bond(k)
        order = b.GetBondTypeAsDouble()
        orders[b.GetBeginAtomIdx()] += order
        orders[b.GetEndAtomIdx()] += order
    return [int(total) + a.GetNumExplicitHs() for total, a in zip(orders, atom_list(mol))]


def atom_label(mol: Chem.Mol, i: int) -> str:
    """C7 for a mapped atom, H(C3) for a hydrogen on a mapped atom, else element and position."""
    atom = mol.GetAtomWithIdx(i)
    if atom.GetAtomMapNum():
        return f"{atom.GetSymbol()}{atom.GetAtomMapNum()}"
    if atom.GetAtomicNum() == 1 and atom.GetDegree() == 1:
        parent = atom.GetNeighbors()[0]
        if parent.GetAtomMapNum():
            return f"H({parent.GetSymbol()}{parent.GetAtomMapNum()})"
    return f"{atom.GetSymbol()}(atom {i + 1})"


def nameable(mol: Chem.Mol, i: int) -> bool:
    """Whether a move can name atom i (C7, or H(C3) for a hydrogen on a mapped atom): an atom with
    no map number is labelled C(atom 5) in messages, which the language cannot write."""
    atom = mol.GetAtomWithIdx(i)
    if atom.GetAtomMapNum():
        return True
    return atom.GetAtomicNum() == 1 and atom.GetDegree() == 1 and bool(atom.GetNeighbors()[0].GetAtomMapNum())


def bond_label(mol: Chem.Mol, i: int, j: int) -> str:
    """C3-C7, or O11-H when one end is a hydrogen on the other."""
    for a, b in ((i, j), (j, i)):
        atom = mol.GetAtomWithIdx(b)
        if atom.GetAtomicNum() == 1 and not atom.GetAtomMapNum() and mol.GetBondBetweenAtoms(a, b) is not None \
                and atom.GetDegree() == 1:
            return f"{atom_label(mol, a)}-H"
    return f"{atom_label(mol, i)}-{atom_label(mol, j)}"


def initial_nonbonding(mol: Chem.Mol) -> list[int]:
    return list(ElectronState.of_molecule(mol).nonbonding)


class ResolvedMove(NamedTuple):   # several per step: a named tuple is the cheapest immutable record
    """A move with its atoms resolved to indices, for drawing and analysis.

    source_kind is "lone_pair", "unpaired" or "bond"; source_atoms holds one atom (lone pair,
    unpaired electron) or the two atoms of the bond. sink_atoms holds one atom when the electrons
    end as non-bonding electrons on it, or two atoms for the bond that forms or gains order.
    """

    move: Move
    source_kind: str
    source_atoms: tuple[int, ...]
    sink_atoms: tuple[int, ...]
    electrons: int


@dataclass
class StepChange:
    """What one step did, by atom index: bonds formed, broken and changed, charge changes."""

    formed: list[Pair] = field(default_factory=list)
    broken: list[Pair] = field(default_factory=list)
    reordered: list[tuple[Pair, int, int]] = field(default_factory=list)   # (bond, before, after)
    charges: list[tuple[int, int, int]] = field(default_factory=list)      # (atom, before, after)
    touched_atoms: list[int] = field(default_factory=list)
    shells: dict[int, int] = field(default_factory=dict)                  # valence-shell electrons N + 2B, touched atoms
    moves: list[ResolvedMove] = field(default_factory=list)
    chair: Optional[ChairModel] = None   # a thermal [3,3] shift's chairs, from a configured state

    @property
    def pericyclic(self) -> bool:
        """Every arrow moves a bond's pair into a bond and the pairs close a loop, so no atom gains
        or loses charge (a cycloaddition, a [3,3] shift, an ene reaction). An open chain of such
        arrows moves a charge: a C=C pair onto a carbocation (a cation-olefin cyclisation) is polar."""
        return bool(self.moves) and not self.charges and all(
            m.source_kind == "bond" and len(m.sink_atoms) == 2 and m.electrons == 2 for m in self.moves)

    def attacker(self, atom: int) -> Optional[int]:
        """The atom whose own pair (a lone pair, or a bond of its own: an organometallic's C-M, a
        B-H) makes a new bond to `atom` in this step, if any: the nucleophile that adds to it."""
        for move in self.moves:
            if move.electrons != 2 or len(move.sink_atoms) != 2 or atom not in move.sink_atoms \
                    or atom in move.source_atoms:
                continue
            partner = move.sink_atoms[0] if move.sink_atoms[1] == atom else move.sink_atoms[1]
            if partner in move.source_atoms and any({atom, partner} == set(p) for p in self.formed):
                return partner
        return None


def bonds_after(bonds: list[tuple[int, int, float]], change: StepChange, after: Chem.Mol
                ) -> list[tuple[int, int, float]]:
    """rdkit_io.bond_list of the state after a step, from that of the state before (`bonds`) and
    the step's change, as apply_step edits the Mol: the bonds it breaks are removed (RDKit keeps
    the others in their order), those whose order changes keep their place, and those it forms
    are appended in the order it makes them. `after` (the state's Mol) is asked only for the
    order of each new bond."""
    broken = {pair(i, j) for i, j in change.broken}
    orders = {pair(i, j): float(new) for (i, j), _, new in change.reordered}
    out = []
    for i, j, order in bonds:   # (pair, in line: every bond of every state drawn)
        key = (i, j) if i < j else (j, i)
        if key not in broken:
            out.append((i, j, orders.get(key, order)))
    bond = after.GetBondBetweenAtoms
    out += [(i, j, bond(i, j).GetBondTypeAsDouble()) for i, j in change.formed]
    return out


class _StepFailed(Exception):
    pass


class _StepReplay:
    """Applies the moves of one step concurrently: every source is judged against the state
    before the step, and the state is checked only after all moves."""

    def __init__(self, state: ElectronState, step: Step, step_index: int, map_index: dict[int, int],
                 entered_later: dict[int, int], known: dict[tuple[str, int], int]):
        self.state, self.step, self.step_index = state, step, step_index
        self.map_index, self.entered_later, self.known = map_index, entered_later, known
        self.diagnostics: list[Diagnostic] = []
        self.d_nonbonding: dict[int, int] = {}
        self.d_bond: dict[Pair, int] = {}
        self.used_lone: dict[int, int] = {}
        self.used_bond: dict[Pair, int] = {}
        self.used_unpaired: dict[int, int] = {}
        self.written_sinks: list[tuple[Pair, int, Location, BondRef]] = []
        self._bond_before: dict[Pair, int] = {}
        self.resolved: list[ResolvedMove] = []
        self.first_move_on_bond: dict[Pair, Move] = {}
        self._hydrogen_choice: dict[int, int] = {}
        self.bond_sources: dict[Pair, list[Move]] = {}   # bond -> the arrows that start on it

    # diagnostics
    def fail(self, code: str, message: str, loc: Location, hint: Optional[str] = None,
             atoms: tuple[str, ...] = (), bonds: tuple = ()) -> None:
        self.diagnostics.append(Diagnostic(code, message, loc, hint, tuple(str(a) for a in atoms), bonds,
                                           self.step_index))

    def warn(self, code: str, message: str, loc: Location, hint: Optional[str] = None,
             atoms: tuple[str, ...] = ()) -> None:
        self.diagnostics.append(Diagnostic(code, message, loc, hint, atoms, (), self.step_index))

    # resolving written atoms to indices
    def resolve(self, ref, no_hydrogen_hint: Optional[Callable[[], Optional[str]]] = None) -> int:
        if isinstance(ref, HydrogenOn):
            return self.hydrogen_on(self.resolve(ref.parent), ref, no_hydrogen_hint)
        index = self.known.get((ref.element, ref.map_number))
        if index is None:
            index = self._look_up(ref)
        released = self.state.released
        if released and index in released:
            self.fail("AR106", f"{ref} left the drawing with `releases` in an earlier step", ref.loc,
                      "bring it back with `uses` under a new map number, or do not release it", atoms=(str(ref),))
            raise _StepFailed
        return index

    def _look_up(self, ref) -> int:
        """The index of a written atom the first time the replay meets it, checked to exist and to
        be the element written; remembered for the whole replay (atoms are only ever appended, and
        a map number is never reused)."""
        index = self.map_index.get(ref.map_number)
        if index is None:
            if ref.map_number in self.entered_later:
                hint = f"atom {ref.map_number} enters only in step {self.entered_later[ref.map_number] + 1}"
            elif ref.map_number == 0:
                hint = (f"map number 0 means no number in a SMILES ([{ref.element}:0] is an unnumbered atom): "
                        f"number the atom from 1 up, e.g. [{ref.element}:9], and write {ref.element}9 here")
            else:
                # A reagent the arrows use but no line brings in (the base of an enolate formation).
                hint = (f"no species holds atom {ref.map_number}: declare the molecule it belongs to, with "
                        f"`species NAME = \"SMILES\"` or, inside this step, `uses NAME = \"SMILES\"`, the atom "
                        f"carrying its number (e.g. [{ref.element}:{ref.map_number}])")
            self.fail("AR104", f"no atom carries map number {ref.map_number} at this point", ref.loc, hint,
                      atoms=(str(ref),))
            raise _StepFailed
        if self.state.elements[index] != _atomic_number(ref.element):
            atom = self.state.mol.GetAtomWithIdx(index)
            hint = (f"write {atom.GetSymbol()}{ref.map_number} if that atom is meant; if a {ref.element} was meant, "
                    f"its number is another: check the species' numbers (`arrows number SMILES` prints them)")
            if ref.element == "H" and atom.GetTotalNumHs(includeNeighbors=True):
                # H2 for "the hydrogen on atom 2": a hydrogen is named by the atom that holds it.
                hint = f"a hydrogen on {atom.GetSymbol()}{ref.map_number} is written H({atom.GetSymbol()}{ref.map_number})"
            self.fail("AR105", f"{ref} names atom {ref.map_number}, which is {atom.GetSymbol()}, not {ref.element}",
                      ref.loc, hint, atoms=(str(ref),))
            raise _StepFailed
        self.known[(ref.element, ref.map_number)] = index
        return index

    def hydrogen_on(self, parent: int, ref: HydrogenOn, hint: Optional[Callable[[], Optional[str]]] = None) -> int:
        if parent in self._hydrogen_choice:
            return self._hydrogen_choice[parent]
        hydrogens = [n for n in self.state.mol.GetAtomWithIdx(parent).GetNeighbors() if n.GetAtomicNum() == 1]
        if not hydrogens:
            self.fail("AR109", f"{ref.parent} carries no hydrogen at this point", ref.loc,
                      (hint and hint()) or "check which atom holds the proton; the formula of each state is "
                                           "shown by `arrows trace`",
                      atoms=(str(ref.parent),))
            raise _StepFailed
        # Unmapped hydrogens are interchangeable; mapped ones are kept for the author who named them.
        chosen = min((a.GetAtomMapNum() != 0, a.GetIdx()) for a in hydrogens)[1]
        self._hydrogen_choice[parent] = chosen
        return chosen

    def _bonds_held_hint(self, a: int, b: int) -> str:
        """The bonds the two atoms do hold before the step (the hydride of a formate named on the
        iminium carbon it goes to, not on the carbon it leaves)."""
        held = []
        for atom in (a, b):
            bonds = [self.bond_name(atom, n.GetIdx()) for n in self.state.mol.GetAtomWithIdx(atom).GetNeighbors()]
            if bonds:
                held.append(f"{self.state.label(atom)} holds {', '.join(bonds[:4])}")
        where = "; ".join(held) + "; " if held else ""
        return f"{where}check the atom numbers (`arrows trace` shows the bonds of every state)"

    def bond_name(self, a: int, b: int) -> str:
        return f"{self.state.label(a)}-{self.state.label(b)}"

    # electrons
    def bond_before(self, i: int, j: int) -> int:
        """Electrons in bond i-j before the step (RDKit bond look-ups are the costly part of a step)."""
        key = (i, j) if i < j else (j, i)
        known = self._bond_before.get(key)
        if known is None:
            known = self._bond_before[key] = self.state.bond_electrons(i, j)
        return known

    def nonbonding(self, i: int) -> int:
        return self.state.nonbonding[i]

    def take_from_atom(self, i: int, n: int) -> None:
        self.d_nonbonding[i] = self.d_nonbonding.get(i, 0) - n

    def give_to_atom(self, i: int, n: int) -> None:
        self.d_nonbonding[i] = self.d_nonbonding.get(i, 0) + n

    def change_bond(self, i: int, j: int, n: int, move: Move) -> None:
        key = (i, j) if i < j else (j, i)
        self.d_bond[key] = self.d_bond.get(key, 0) + n
        self.first_move_on_bond.setdefault(key, move)

    def source_atom(self, move: Move, ref) -> int:
        index = self.resolve(ref)
        if self.state.elements[index] == 1 and self.nonbonding(index) == 0:
            # A bonded hydrogen holds no electrons of its own; a hydride ion (NaH, LiH) or a hydrogen
            # atom does, and an arrow may start there like any other lone pair or unpaired electron.
            hydrogen = self.state.label(index)
            parent = hydrogen[2:-1] if hydrogen.startswith("H(") else "X"
            sink = str(move.sink.atom) if isinstance(move.sink, AtomSink) else None
            proton = (f"to move a proton, start at the base's lone pair, `:{sink or 'B'} -> {hydrogen}`, and let "
                      f"the bond's pair go with `{parent}-H -> ...`")
            hydride = f"to deliver a hydride, move the bond's pair with it: `{parent}-H -> {sink or 'C'}-{hydrogen}`"
            self.fail("AR204", f"the arrow starts at the hydrogen {hydrogen}; arrows start at electrons",
                      move.source.loc, {"proton": proton, "hydride": hydride,
                                        "either": f"{proton}; {hydride}"}[self._hydrogen_leaves_as(index)],
                      atoms=(hydrogen,))
            raise _StepFailed
        return index

    def _hydrogen_leaves_as(self, hydrogen: int) -> str:
        """What a hydrogen most likely leaves its parent as: a hydride from a hydridic element
        (rdkit_io.HYDRIDIC: B-H, Al-H, Si-H, a main-group metal hydride), either from carbon (an
        enolisation's proton, NADH's or a Cannizzaro's hydride), a proton from anything else."""
        parents = self.state.mol.GetAtomWithIdx(hydrogen).GetNeighbors()
        if not parents:
            return "proton"   # a bare H+ (or H2's, taken whole): a base's pair goes to it
        element = parents[0].GetAtomicNum()
        return "either" if element == 6 else "hydride" if element in HYDRIDIC else "proton"

    def apply(self, move: Move) -> None:
        src, sink, n = move.source, move.sink, move.electrons
        if isinstance(src, BareAtom):
            self.source_atom(move, src.atom)   # a hydrogen written as a source is AR204
            self.fail("AR205", f"the arrow starts at the atom {src.atom}, not at electrons", src.loc,
                      f"name the electrons: `:{src.atom}` for a lone pair, a bond such as `{src.atom}-X`, "
                      f"or `.{src.atom}` for an unpaired electron", atoms=(str(src.atom),))
            raise _StepFailed
        if isinstance(src, (LonePair, UnpairedElectron)):
            x = self.source_atom(move, src.atom)
            self.check_atom_source(move, src, x)
            self.take_from_atom(x, n)
            self.attach(move, x, sink)
        else:
            a, b = self.resolve(src.bond.first), self.resolve(src.bond.second)
            self.check_bond_source(move, src, a, b)
            self.change_bond(a, b, -n, move)
            self.detach(move, (a, b), sink)

    def check_atom_source(self, move: Move, src, x: int) -> None:
        nb = self.nonbonding(x)
        if isinstance(src, UnpairedElectron):
            if nb % 2 == 0:
                label = self.state.label(x)
                self.fail("AR201", f"{label} has no unpaired electron", src.loc,
                          "a fishhook starts at a radical centre, a lone pair (`:X ~>`) or a bond", atoms=(label,))
                raise _StepFailed
            if move.electrons == 2:
                label = self.state.label(x)
                self.fail("AR209", f"a pair arrow cannot start at the single electron on {label}", move.loc,
                          f"use a fishhook: `.{src.atom} ~> ...`", atoms=(label,))
                raise _StepFailed
            self.used_unpaired[x] = self.used_unpaired.get(x, 0) + 1
            if self.used_unpaired[x] > 1:
                label = self.state.label(x)
                self.fail("AR203", f"the unpaired electron on {label} is used twice in this step", src.loc,
                          "a radical centre has one unpaired electron: one fishhook may start there per step",
                          atoms=(label,))
                raise _StepFailed
            return
        pairs = nb // 2
        if pairs == 0:
            label, charge = self.state.label(x), self.state.formal_charge(x)
            why = f"{label} has no lone pair" + (f" (it is a cation, formal charge {charge:+d})" if charge > 0 else "")
            hint = "arrows start at electrons: a lone pair, a bond, or an unpaired electron"
            sink = move.sink
            taker = (self.map_index.get(sink.atom.map_number)
                     if isinstance(sink, AtomSink) and not isinstance(sink.atom, HydrogenOn) else None)
            if nb == 1:
                # A radical centre: its one electron moves by a fishhook, not as a pair.
                why += " (it carries one unpaired electron)"
                hint = f"a radical's electron moves by a fishhook: `.{src.atom} ~> {move.sink}`"
            elif taker is not None and self.bond_before(x, taker) and (bonded := self._bonded_taker_hint(x, taker)):
                hint += "; " + bonded
            elif taker is not None and self.nonbonding(taker) >= 2:
                # An arrow drawn from the electrophile to the nucleophile: the commonest reversal.
                hint += f"; the arrow may run backwards, from the electrons to the atom that takes them: `:{sink.atom} -> {src.atom}`"
            self.fail("AR201", why, src.loc, hint, atoms=(label,))
            raise _StepFailed
        self.used_lone[x] = self.used_lone.get(x, 0) + move.electrons
        if self.used_lone[x] > 2 * pairs:
            label = self.state.label(x)
            self.fail("AR203", f"{label} has {pairs} lone pair{'s' if pairs > 1 else ''}; this step uses more",
                      src.loc, _repeated_move_hint(self.step) or "each arrow from a lone pair takes one pair",
                      atoms=(label,))
            raise _StepFailed

    def _bonded_taker_hint(self, x: int, taker: int) -> Optional[str]:
        """For an arrow from atom x, which has no lone pair, to an atom it is bonded to: the bond's
        pair goes to the taker as the bond breaks (a protonated alcohol ionising, `C2-O6 -> O6`,
        drawn `:C2 -> O6`), when the taker is the more electronegative; where x is short of an
        octet (a carbocation beside an OR), the taker's lone pair is pushed into the bond instead
        (`:O6 -> C2=O6`, the oxocarbenium form)."""
        label = self.state.label
        order = self.bond_before(x, taker) // 2
        if self.nonbonding(x) + 2 * self.state.bond_sums[x] < 8:
            if self.nonbonding(taker) < 2 or order >= 3:
                return None
            connector = "=" if order == 1 else "#"
            return (f"{label(x)} is short of an octet: the arrow may run backwards, {label(taker)}'s lone pair "
                    f"making a {'double' if order == 1 else 'triple'} bond: "
                    f"`:{label(taker)} -> {label(x)}{connector}{label(taker)}`")
        if ELECTRONEGATIVITY.get(self.state.elements[taker], 0.0) < ELECTRONEGATIVITY.get(self.state.elements[x], 0.0):
            return None
        bond = f"{label(x)}{'-=#'[min(order, 3) - 1]}{label(taker)}"
        what = "the bond breaks" if order == 1 else "a pi bond breaks"
        return (f"{label(x)} and {label(taker)} are bonded: if {what}, its pair going to {label(taker)}, "
                f"the arrow starts at the bond: `{bond} -> {label(taker)}`")

    def check_bond_source(self, move: Move, src: BondPair, a: int, b: int) -> None:
        have = self.bond_before(a, b)
        written = src.bond.order
        if have == 0:
            self.fail("AR201", f"there is no bond {self.bond_name(a, b)}", src.loc,
                      self._bonds_held_hint(a, b), atoms=(self.state.label(a), self.state.label(b)))
            raise _StepFailed
        actual = have // 2
        if written > actual:
            self.fail("AR202", f"{src.bond} is written {order_word(written)}, but {self.bond_name(a, b)} is a {order_word(actual)} bond: "
                      f"there is no {'pi' if written == 2 else 'second pi'} pair to move",
                      src.loc, self._charge_separated_hint(a, b) or f"write {_rewrite(src.bond, actual)}, or check the previous step",
                      atoms=(self.state.label(a), self.state.label(b)))
            raise _StepFailed
        key = pair(a, b)
        self.bond_sources.setdefault(key, []).append(move)
        self.used_bond[key] = self.used_bond.get(key, 0) + move.electrons
        if self.used_bond[key] > have:
            self.fail("AR203", f"the electrons of {self.bond_name(a, b)} are used twice in this step", src.loc,
                      f"{self.bond_name(a, b)} holds {actual} pair{'s' if actual > 1 else ''}; each arrow from it takes one",
                      atoms=(self.state.label(a), self.state.label(b)))
            raise _StepFailed

    def judge_bond_sources(self) -> None:
        """A multiple bond's sigma pair is taken only by an arrow that names it (`X-Y`): arrows
        written `X=Y` (or `X#Y`) take its pi pairs, so two pair arrows from one C=C, or four
        fishhooks, would break the bond through a name that says it stays. An arrow that writes a
        multiple bond lower than it is (`C=C` as `C-C`) names its pi pair, with a warning, unless
        the step's other arrows take every pi pair (the Staudinger N=N, broken right through)."""
        for key, uses in self.bond_sources.items():
            fishhooks = [move for move in uses if move.electrons == 1 and isinstance(move.sink, AtomSink)]
            same = next((second for k, first in enumerate(fishhooks) for second in fishhooks[k + 1:]
                         if str(first.sink) == str(second.sink)), None)
            if same is not None:
                # Both electrons of the bond sent onto one of its atoms by two fishhooks: a
                # heterolysis, which a pair arrow draws (the fishhooks of a bond that splits evenly go
                # to its two atoms).
                bond = same.source.bond
                self.fail("AR209", f"two fishhooks move both electrons of {bond} to {same.sink}: that is one pair "
                          f"moving", same.loc, f"write one pair arrow, `{bond} -> {same.sink}`; a bond that splits "
                          f"evenly sends one fishhook to each of its atoms",
                          atoms=(self.state.label(key[0]), self.state.label(key[1])))
                raise _StepFailed
            have = self.bond_before(*key)
            actual = have // 2
            pi_taken = sum(move.electrons for move in uses if move.source.bond.order >= 2)
            for move in uses:
                bond = move.source.bond
                if bond.order < actual and not (bond.order == 1 and pi_taken >= have - 2):
                    self.warn("AR507", f"{bond} is written {order_word(bond.order)}, but {self.bond_name(*key)} is "
                              f"{order_word(actual)}", move.source.loc,
                              f"write {_rewrite(bond, actual)} so the reader sees which pair moves")
            if have < 4 or self.used_bond[key] <= have - 2 or any(move.source.bond.order == 1 for move in uses):
                continue
            taken = 0
            for move in uses:   # the first arrow past the pi pairs
                taken += move.electrons
                if taken > have - 2:
                    break
            bond = move.source.bond
            pi = have // 2 - 1
            if move.electrons == 2 and any(other.electrons == 1 for other in uses):
                # A pair arrow among fishhooks from one pi bond (a homolysis written half as a heterolysis).
                hint = f"the other arrows from `{bond}` move one electron each: if this one does too, write `{bond} ~> {move.sink}`"
            else:
                hint = (f"each arrow from `{bond}` takes one pi pair; drop the repeated arrow, or, to break the bond "
                        f"right through, name its sigma pair `{bond.first}-{bond.second}`")
            self.fail("AR203", f"the arrows from {bond} take more than its {pi} pi pair{'s' if pi > 1 else ''}: "
                      f"its sigma pair would go too", move.source.loc, hint,
                      atoms=(self.state.label(key[0]), self.state.label(key[1])))
            raise _StepFailed

    def _charge_separated_hint(self, a: int, b: int) -> Optional[str]:
        """For X=O written where RDKit holds X+-O- (it reads a halogen or nitrogen with more bonds
        than its valence list allows, the periodate ion's I(=O)3 or a nitro group's N(=O)=O, in
        that charge-separated form): where the pi pair the author meant is."""
        state = self.state
        for centre, oxygen in ((a, b), (b, a)):
            if (state.elements[centre] in _CHARGE_SEPARATED and state.elements[oxygen] == 8
                    and state.formal_charge(centre) > 0 and state.formal_charge(oxygen) < 0):
                x, o = state.label(centre), state.label(oxygen)
                return (f"RDKit reads {x}'s bonds to oxygen charge-separated ({x}{state.formal_charge(centre):+d}, {o}-), "
                        f"as it does a nitrogen or halogen written with more bonds than its usual valence: the pi "
                        f"pair meant is already {o}'s lone pair (leave the move out; giving it back is `:{o} -> {x}`)")
        return None

    def attach(self, move: Move, x: int, sink) -> None:
        """Electrons from atom x go to a sink: a new or stronger bond from x, or (`:Y`) onto
        another atom with no bond made."""
        n = move.electrons
        kind = "lone_pair" if isinstance(move.source, LonePair) else "unpaired"
        if isinstance(sink, NonbondingSink):
            y = self.resolve(sink.atom)
            if y == x:
                self.fail("AR210", f"the arrow from {self.state.label(x)} ends where it starts", sink.loc,
                          "an electron transfer ends on another atom")
                raise _StepFailed
            self.give_to_atom(y, n)
            self.resolved.append(ResolvedMove(move, kind, (x,), (y,), n))
            return
        if isinstance(sink, AtomSink):
            y = self.resolve(sink.atom)
        else:
            ends = (self.resolve(sink.bond.first), self.resolve(sink.bond.second))
            if x not in ends:
                self.fail("AR207", f"the bond {sink.bond} does not contain {self.state.label(x)}", sink.loc,
                          f"electrons from {self.state.label(x)} can only form a bond to {self.state.label(x)}: end "
                          f"the arrow at the atom it bonds to (`{move.source} -> {self.state.label(ends[0])}` or "
                          f"`-> {self.state.label(ends[1])}`)",
                          atoms=(self.state.label(x),))
                raise _StepFailed
            y = ends[1] if ends[0] == x else ends[0]
            self.written_sinks.append((pair(x, y), sink.bond.order, sink.loc, sink.bond))
        if y == x:
            self.fail("AR210", f"the arrow from {self.state.label(x)} ends where it starts", sink.loc,
                      "end the arrow at the atom that receives the electrons, or at the bond that forms")
            raise _StepFailed
        self.change_bond(x, y, n, move)
        self.resolved.append(ResolvedMove(move, kind, (x,), (x, y), n))

    def detach(self, move: Move, ends: tuple[int, int], sink) -> None:
        """Electrons from bond ends go to a sink: one of its own atoms, a bond sharing an atom, or
        (`:Y`) onto any atom with no bond made (an electron transfer out of a bond)."""
        n = move.electrons
        a, b = ends
        if isinstance(sink, NonbondingSink):
            y = self.resolve(sink.atom)
            self.give_to_atom(y, n)
            self.resolved.append(ResolvedMove(move, "bond", (a, b), (y,), n))
            return
        if isinstance(sink, AtomSink):
            y = self.resolve(sink.atom)
            if y not in ends:
                la, lb = self.state.label(a), self.state.label(b)
                self.fail("AR206", f"a pair of {la}-{lb} cannot become a lone pair on {self.state.label(y)}", sink.loc,
                          f"to form a bond to {sink.atom}, name the bond: {move.source} -> {lb}-{sink.atom} "
                          f"(or {la}-{sink.atom})", atoms=(la, lb, self.state.label(y)))
                raise _StepFailed
            self.give_to_atom(y, n)
            self.resolved.append(ResolvedMove(move, "bond", (a, b), (y,), n))
            return
        # `C1-H -> O4-H` for a hydrogen moving to O4: the sink's H names one already on O4.
        moving = lambda: _moving_hydrogen_hint(move, sink.bond)   # noqa: E731 (written only if it fails)
        y, z = self.resolve(sink.bond.first, moving), self.resolve(sink.bond.second, moving)
        shared = {a, b} & {y, z}
        if not shared:
            self.fail("AR207", f"the bond {sink.bond} shares no atom with {move.source}", sink.loc,
                      _no_shared_atom_hint(move, sink.bond, self.state.elements[a] == 1 or self.state.elements[b] == 1))
            raise _StepFailed
        if {a, b} == {y, z}:
            self.fail("AR210", f"the arrow from {move.source} ends in the same bond", sink.loc,
                      "a pair of a bond moves onto one of its atoms or into a bond next to it")
            raise _StepFailed
        pivot = shared.pop()
        other = z if y == pivot else y
        self.written_sinks.append((pair(pivot, other), sink.bond.order, sink.loc, sink.bond))
        self.change_bond(pivot, other, n, move)
        self.resolved.append(ResolvedMove(move, "bond", (a, b), (pivot, other), n))


def _no_shared_atom_hint(move: Move, sink: BondRef, hydrogen_moves: bool) -> str:
    """The hint of AR207. A hydrogen that moves with its pair (a hydride shift) keeps the name of
    the atom it leaves: `C2-H -> C5-H(C2)`, not `C5-H`, which is a hydrogen already on C5."""
    moving = _moving_hydrogen_hint(move, sink) if hydrogen_moves else None
    return moving or "the electrons stay on an atom they started on: the new bond must contain one atom of the source"


def _moving_hydrogen_hint(move: Move, sink: BondRef) -> Optional[str]:
    """For a hydrogen of the source bond sent into a sink bond with an `H` of its own (a hydride
    shift written `C2-H -> C5-H`): the hydrogen keeps the name of the atom it leaves."""
    source = move.source
    ends = (sink.first, sink.second)
    if not isinstance(source, BondPair) or not any(isinstance(e, HydrogenOn) for e in ends):
        return None
    leaves = next((e.parent for e in (source.bond.first, source.bond.second) if isinstance(e, HydrogenOn)), None)
    taker = next((e for e in ends if not isinstance(e, HydrogenOn)), None)
    if leaves is None or taker is None:
        return None
    arrow = "~>" if move.electrons == 1 else "->"
    return (f"a hydrogen that moves with its {'electron' if move.electrons == 1 else 'pair'} keeps the name of the "
            f"atom it leaves: {source} {arrow} {taker}-H({leaves})")


def _overfilling_order_hint(state: ElectronState, replay: _StepReplay, key: Pair,
                            changes: dict[Pair, tuple[int, int]], actual: int) -> Optional[str]:
    """AR208's hint when the order the moves give the bond would overfill one of its atoms (more
    than 2 electrons on H, 8 on Li to Ne): writing that order only trades AR208 for AR301. The
    fault lies in the arrows: one runs the wrong way (a Cope's sigma pair sent into the pi bond
    its neighbour's pair also enters) or one taking a pair off the atom is missing."""
    if 2 * actual <= replay.bond_before(*key):
        return None   # the moves lower the order: no atom gains electrons from this bond
    full = []
    for i in key:
        z = state.elements[i]
        if z > 10:
            continue   # a heavier atom may expand its octet
        limit = 2 if z <= 2 else 8
        shell = (state.nonbonding[i] + replay.d_nonbonding.get(i, 0) + 2 * state.bond_sums[i]
                 + sum(after - before for bond, (before, after) in changes.items() if i in bond))
        if shell > limit:
            full.append((state.label(i), shell, limit))
    if not full:
        return None
    into = [f"`{m.move}`" for m in replay.resolved if len(m.sink_atoms) == 2 and pair(*m.sink_atoms) == key]
    if len({shell for _, shell, _ in full}) == 1:
        left = (f"{' and '.join(label for label, _, _ in full)} with {full[0][1]} valence electrons"
                f"{' each' if len(full) > 1 else ''}")
    else:
        left = " and ".join(f"{label} with {shell}" for label, shell, _ in full) + " valence electrons"
    limits = " and ".join(sorted({str(limit) for _, _, limit in full}))
    head = f"as a {order_word(actual)} bond it would leave {left} (the limit is {limits}): do not write that order. "
    if len(into) >= 2:
        return (head + f"{' and '.join(into)} {'both' if len(into) == 2 else 'all'} bring a pair into "
                f"{replay.bond_name(*key)}: one of them runs the wrong way (in a pericyclic step each bond round "
                f"the ring gains or loses one pair), or an arrow taking a pair off {' or '.join(l for l, _, _ in full)} "
                f"is missing")
    return head + (f"An arrow runs the wrong way, or one taking a pair off {' or '.join(l for l, _, _ in full)} "
                   f"is missing")


def _other_donor_hint(state: ElectronState, replay: _StepReplay, key: Pair, changes: dict[Pair, tuple[int, int]],
                      written: int, actual: int) -> Optional[str]:
    """AR208's hint for a lone pair of an O or N, X, pushed into X=Y, a bond that already has the
    order written (`:O7 -> C6=O7` on a carbonate's C=O), where the order the moves give would leave
    X beyond +1, or an oxygen at +1 in a triple bond (C#O+). When Y holds another O or N, negative
    and single-bonded, its pair makes the bond written (`:O5 -> C6=O5`: the carbonate loses CO2;
    common practice: the push of a fragmentation starts at the negative atom, not at the C=O beside
    it). An acylium ion (C#O+ with no such neighbour) is left to the usual hint."""
    if actual <= written or replay.bond_before(*key) // 2 != written:
        return None
    label = state.label
    for m in replay.resolved:
        if m.source_kind != "lone_pair" or m.electrons != 2 or pair(*m.sink_atoms) != key:
            continue
        x = m.source_atoms[0]
        y = key[0] if key[1] == x else key[1]
        if state.elements[x] not in (7, 8):
            continue
        bonds_after = state.bond_sums[x] + sum(after - before for b, (before, after) in changes.items() if x in b) // 2
        charge = state.valence[x] - state.nonbonding[x] - replay.d_nonbonding.get(x, 0) - bonds_after
        if charge < 1 or (charge == 1 and (actual < 3 or state.elements[x] == 7)):
            continue   # an oxocarbenium, iminium, nitrilium or acylium the author wrote at too low an order
        donors = [n.GetIdx() for n in state.mol.GetAtomWithIdx(y).GetNeighbors()
                  if n.GetIdx() != x and state.elements[n.GetIdx()] in (7, 8) and state.formal_charge(n.GetIdx()) < 0
                  and state.nonbonding[n.GetIdx()] >= 2 and replay.bond_before(y, n.GetIdx()) // 2 + 1 == written
                  and pair(y, n.GetIdx()) not in changes and nameable(state.mol, n.GetIdx())]
        proposed = f"{label(y)}{CONNECTORS[actual]}{label(x)}" if actual in CONNECTORS else f"{label(y)}-{label(x)}"
        what = (f"writing `{proposed}` would put {label(x)} at {charge:+d}"
                f"{' in a triple bond' if actual == 3 else ''}; {label(y)}{CONNECTORS[written]}{label(x)} is already "
                f"{order_word(written)}")
        if donors:
            d = donors[0]
            return (f"{what}, so the arrow that makes a {order_word(written)} bond to {label(y)} starts at the "
                    f"negative {label(d)}: `:{label(d)} -> {label(y)}{CONNECTORS[written]}{label(d)}`")
        if charge > 1:
            return f"{what}: do not write that order; the pair most likely comes from another atom's lone pair"
    return None


def _rewrite(bond: BondRef, order: int) -> str:
    return str(BondRef(bond.first, bond.second, order)) if order in CONNECTORS else str(bond)


def apply_step(state: ElectronState, step: Step, step_index: int, map_index: dict[int, int],
               entered_later: dict[int, int], known: Optional[dict[tuple[str, int], int]] = None
               ) -> tuple[Optional[ElectronState], StepChange, list[Diagnostic]]:
    """Apply all moves of `step` at once. Returns (state after, change, diagnostics); the state is
    None when the moves cannot give a valid structure (the diagnostics say why). `known` holds the
    written atoms (element, map number) already found, for a replay to pass from step to step."""
    replay = _StepReplay(state, step, step_index, map_index, entered_later, {} if known is None else known)
    change = StepChange()
    try:
        for move in step.moves:
            replay.apply(move)
        replay.judge_bond_sources()
    except _StepFailed:
        return None, change, replay.diagnostics
    change.moves = replay.resolved
    return _settle(state, step, step_index, replay, change)


def _settle(state: ElectronState, step: Step, step_index: int, replay: _StepReplay,
            change: StepChange) -> tuple[Optional[ElectronState], StepChange, list[Diagnostic]]:
    """Turn the summed electron changes into the next state, checking it is a molecule."""
    diags = replay.diagnostics
    changes: dict[Pair, tuple[int, int]] = {}    # bond -> (electrons before, after)
    for key, delta in replay.d_bond.items():
        if delta == 0:
            continue
        before = replay.bond_before(*key)
        after = before + delta
        changes[key] = (before, after)
        if after % 2 == 0 and after <= 6 and (step.kind != "resonance" or (before == 0) == (after == 0)):
            continue   # the common case: nothing to report
        diags.extend(_bond_faults(state, step, step_index, replay, key, before, after))
    for key, written, loc, text in replay.written_sinks:
        actual = (changes[key][1] if key in changes else replay.bond_before(*key)) // 2
        if actual != written and not any(d.code in ("AR303", "AR302") for d in diags):
            hint = _overfilling_order_hint(state, replay, key, changes, actual) \
                or _other_donor_hint(state, replay, key, changes, written, actual) or (
                f"write the bond as it is after the step"
                f"{': `' + _rewrite(text, actual) + '`' if actual in CONNECTORS else ''}")
            if replay.bond_before(*key) == 0 and written > actual:
                # Written as raising the order of a bond the step only makes: the author may have
                # meant a bond an earlier step should have made (the O-P bond of an oxaphosphetane
                # whose ring-closing step left it out).
                hint += (f"; the two are not bonded before this step: if an earlier step was to "
                         f"bond them, its arrow should end at `{_rewrite(text, 1)}`")
            diags.append(Diagnostic("AR208", f"{text} says the bond will be {order_word(written)}; "
                                    f"after this step it is {order_word(actual)}", loc, hint,
                                    bonds=((state.label(key[0]), state.label(key[1])),), step=step_index))
    if diags and any(d.severity == "error" for d in diags):
        return None, change, diags

    nonbonding = list(state.nonbonding)
    for i, delta in replay.d_nonbonding.items():
        nonbonding[i] += delta
    bond_sums = list(state.bond_sums)

    work = Chem.RWMol(state.mol)   # kept as the state's Mol: a copy to a read-only Mol would buy nothing
    for (i, j), (before, electrons) in changes.items():
        bond_sums[i] += (electrons - before) // 2
        bond_sums[j] += (electrons - before) // 2
        if electrons == 0:
            work.RemoveBond(i, j)
            change.broken.append((i, j))
        elif before == 0:
            work.AddBond(i, j, _BOND_TYPES[electrons // 2])
            change.formed.append((i, j))
        else:
            work.GetBondBetweenAtoms(i, j).SetBondType(_BOND_TYPES[electrons // 2])
            change.reordered.append(((i, j), before // 2, electrons // 2))

    touched = sorted(set(replay.d_nonbonding).union(*changes))
    change.touched_atoms = touched
    configured = state.configured
    # The configuration rules run where a configuration exists, or where a syn addition can make one.
    if configured or may_configure(changes):
        def shifted(atom: int, leaving: int) -> bool:
            return any(m.source_kind == "bond" and set(m.source_atoms) == {atom, leaving} and atom in m.sink_atoms
                       for m in replay.resolved)
        pairs = sum(1 for m in replay.resolved if m.electrons == 2)
        configured, change.chair = carry_configuration(state.mol, work, changes, shifted, configured, pairs,
                                                       names_light(step.over, step.under))
    valence, elements, old_nonbonding, old_bond_sums = state.valence, state.elements, state.nonbonding, state.bond_sums
    shells = change.shells
    for i in touched:
        bonds, electrons = bond_sums[i], nonbonding[i]
        charge = valence[i] - electrons - bonds
        old_charge = valence[i] - old_nonbonding[i] - old_bond_sums[i]
        if charge != old_charge:
            change.charges.append((i, old_charge, charge))
            work.GetAtomWithIdx(i).SetFormalCharge(charge)
        if electrons % 2 != old_nonbonding[i] % 2:
            work.GetAtomWithIdx(i).SetNumRadicalElectrons(electrons % 2)
        shell = shells[i] = electrons + 2 * bonds
        if shell > 8 or (shell > 2 and elements[i] <= 2):
            diags.extend(_overfull_shell(state, step, step_index, replay, i, shell, bonds, electrons, changes))
    if diags and any(d.severity == "error" for d in diags):
        return None, change, diags
    try:   # RDKit's own log of a failure is silenced by the caller (trace.replay); the message is in exc
        Chem.SanitizeMol(work, _STATE_SANITIZE)
        Chem.FastFindRings(work)   # ring membership for the checks; full ring perception is the views' job
    except Exception as exc:
        # RDKit counts atoms from 0 ("atom # 7 S, 7"): the author's label is named instead (S20).
        complaint = valence_complaint(str(exc))
        reason = (f"{state.label(complaint[0])} would have valence {complaint[2]}, more than RDKit allows"
                  if complaint and complaint[0] < len(elements) else str(exc))
        diags.append(Diagnostic("AR304", f"RDKit rejects the structure after this step: {reason}", step.loc,
                                "check charges and bond orders with `arrows trace`", step=step_index))
        return None, change, diags
    return (ElectronState(work, tuple(nonbonding), state.released, valence, tuple(bond_sums), elements,
                          configured, _next_framework(state, changes), _next_cations(state, change.charges)),
            change, diags)


def _polar_step_in_fishhooks(state: ElectronState, step: Step, replay: "_StepReplay") -> bool:
    """Whether every arrow of the step is a fishhook though nothing in it is a radical's: no arrow
    starts at an unpaired electron, no bond sends one electron to each of its own atoms (a
    homolysis) and no lone pair hands an electron over with no bond made (an electron transfer,
    `:Mg1 ~> :Br3`), while one starts at a lone pair (the proton transfer of a polar step written in
    fishhooks: `:O4 ~> H(C3)`, `C3-H ~> C2=C3`; bromide taking Br+ from NBS as the N-Br pair goes on
    into C=N and the C=O pair onto its O: `C12=O11 ~> O11` is half a pair arrow, not a homolysis)."""
    moves = step.moves
    if not moves or any(m.electrons != 1 or isinstance(m.source, UnpairedElectron) for m in moves):
        return False
    lone_pairs = [m for m in moves if isinstance(m.source, LonePair)]
    if not lone_pairs or any(isinstance(m.sink, NonbondingSink) for m in lone_pairs):
        return False
    ends_reached: dict[frozenset, set] = {}
    for m in moves:
        if isinstance(m.source, BondPair) and isinstance(m.sink, (AtomSink, NonbondingSink)):
            ends = frozenset((replay.resolve(m.source.bond.first), replay.resolve(m.source.bond.second)))
            if replay.resolve(m.sink.atom) in ends:
                ends_reached.setdefault(ends, set()).add(replay.resolve(m.sink.atom))
    return not any(reached == ends for ends, reached in ends_reached.items())


def _radical_adds_hint(state: ElectronState, step: Step, replay: "_StepReplay", key: Pair) -> Optional[str]:
    """For a new bond given a radical's electron by a fishhook and a pair by a pair arrow from a pi
    bond (three electrons): a radical adds to a pi bond with fishhooks, one electron of the pi bond
    pairing with the radical's, the other left at the far end (common practice). Told as such,
    since writing the radical's arrow as a pair arrow (what a lone fishhook among pair arrows is
    otherwise told) cannot be: a single electron is no pair."""
    def into_bond(move: Move) -> bool:
        sink = move.sink
        return isinstance(sink, BondSink) and {replay.resolve(sink.bond.first), replay.resolve(sink.bond.second)} == set(key)
    radical = next((m for m in step.moves if m.electrons == 1 and isinstance(m.source, UnpairedElectron) and into_bond(m)),
                   None)
    pair = next((m for m in step.moves if m.electrons == 2 and isinstance(m.source, BondPair) and into_bond(m)), None)
    if radical is None or pair is None:
        return None
    ends = {replay.resolve(pair.source.bond.first), replay.resolve(pair.source.bond.second)}
    far = [end for end in ends if end not in key]
    if len(far) != 1:
        return None
    return (f"a radical adds to a pi bond with fishhooks: one electron of {pair.source} pairs with the radical's "
            f"(`{pair.source} ~> {pair.sink}`), the other stays at the far end (`{pair.source} ~> {state.label(far[0])}`)")


def _bond_faults(state: ElectronState, step: Step, step_index: int, replay: _StepReplay, key: Pair,
                 before: int, after: int) -> list[Diagnostic]:
    """AR303 (an odd electron count), AR302 (beyond triple), AR305 (a sigma bond made or broken in
    a resonance step) for one bond the step changes."""
    found = []
    label = replay.bond_name(*key)
    first = replay.first_move_on_bond[key]
    bonds = ((state.label(key[0]), state.label(key[1])),)
    if after % 2:
        hint = "a bond made from single electrons needs a fishhook from each partner in the same step"
        if before == 0 and after == 1 and isinstance(first.sink, AtomSink):
            # One fishhook from an atom to another: perhaps an electron handed over, no bond meant.
            hint += f"; to hand the electron over with no bond, end the arrow at :{first.sink.atom}"
        elif after < before and isinstance(first.source, BondPair) and first.electrons == 1:
            # A bond split by fishhooks gives one electron to each side: one went, the other is
            # still to be moved (the pi bond of an alkene a radical adds to).
            sink = first.sink
            reached = {replay.resolve(sink.atom)} if isinstance(sink, (AtomSink, NonbondingSink)) else {
                replay.resolve(sink.bond.first), replay.resolve(sink.bond.second)}
            left = [end for end in key if end not in reached]
            hint = "a bond split by fishhooks sends one electron to each side"
            if len(left) == 1:
                hint += f": add `{first.source} ~> {state.label(left[0])}`"
        radical_hint = _radical_adds_hint(state, step, replay, key)
        if radical_hint:
            hint = radical_hint
        elif _polar_step_in_fishhooks(state, step, replay):
            hint = ("every arrow of this step is a fishhook, yet none starts at an unpaired electron and no "
                    "bond splits evenly: a polar step (a proton transfer, an addition) moves pairs, "
                    "so write each arrow `->`")
        elif first.electrons == 1 and len(step.moves) > 1 and all(m.electrons == 2 for m in step.moves if m is not first):
            # One fishhook among pair arrows: most often `~>` typed for `->`.
            hint = (f"the step's other arrows move pairs: if this one does too, write `{first.source} -> {first.sink}`; "
                    f"otherwise, {hint}")
        hint = _repeated_move_hint(step) or hint
        found.append(Diagnostic("AR303", f"the bond {label} is left with {after} electron{'s' if after > 1 else ''}",
                                first.loc, hint, bonds=bonds, step=step_index))
    elif after > 6:
        found.append(Diagnostic("AR302", f"the bond {label} would be of order {after // 2}", first.loc,
                                "no bond is more than triple", bonds=bonds, step=step_index))
    if step.kind == "resonance" and (before == 0) != (after == 0):
        what = "made" if before == 0 else "broken"
        found.append(Diagnostic("AR305", f"the sigma bond {label} is {what} in a resonance step", first.loc,
                                "resonance moves only pi electrons and lone pairs; for a real reaction drop "
                                "`resonance` from the step", bonds=bonds, step=step_index))
    return found


def _overfull_shell(state: ElectronState, step: Step, step_index: int, replay: _StepReplay, i: int, shell: int,
                    bonds: int, nonbonding: int, changes: dict[Pair, tuple[int, int]]) -> list[Diagnostic]:
    """AR301 for an atom of the first two periods with more valence electrons than its shell holds
    (2 for H and He, 8 for Li to Ne); heavier atoms may expand their octet. The hint names a bond
    of the atom that the step leaves alone and could break (a pi bond, else one to a heteroatom),
    else a pi bond the step does not weaken, else names none rather than one the atom lacks."""
    z = state.elements[i]
    limit = 2 if z <= 2 else 8
    if shell <= limit or z > 10:
        return []
    label = state.label(i)
    hint = _repeated_move_hint(step) or _misdirected_pair_hint(state, step, replay, i) \
        or _room_making_hint(state, i, changes, replay) or _meant_elsewhere_hint(state, step, replay, i, changes) \
        or _unweakened_pi_bond_hint(state, i, changes) or _no_room_named_hint(label)
    return [Diagnostic("AR301", f"{label} would hold {shell} valence electrons "
                       f"({bonds} bond{'s' if bonds != 1 else ''}"
                       f"{f', {nonbonding // 2} lone pair(s)' if nonbonding >= 2 else ''}); the limit is {limit}",
                       _first_move_touching(step, replay, i), hint, atoms=(label,), step=step_index)]


def _repeated_move_hint(step: Step) -> Optional[str]:
    """For a step with one arrow written twice (a line copied and not edited)."""
    seen: dict[str, Move] = {}
    for move in step.moves:
        text = str(move)
        if text in seen:
            return f"`{text}` is written twice (lines {seen[text].loc.line} and {move.loc.line}): drop one"
        seen[text] = move
    return None


def _misdirected_pair_hint(state: ElectronState, step: Step, replay: _StepReplay, i: int) -> Optional[str]:
    """For an atom made overfull by the pair of its own bond sent onto it. If it is the more
    electronegative end, a nucleophile's arrow onto it belongs at the other end (an enolate drawn
    onto the carbonyl oxygen, `:C1 -> O6` beside `C5=O6 -> O6`: `:C1 -> C5`); otherwise the pair
    belongs at the other end (`C5=O6 -> C5` beside `:C1 -> C5`: `C5=O6 -> O6`)."""
    label = state.label
    own = [m for m in step.moves if isinstance(m.source, BondPair) and isinstance(m.sink, AtomSink)
           and replay.resolve(m.sink.atom) == i
           and i in (replay.resolve(m.source.bond.first), replay.resolve(m.source.bond.second))]
    if not own:
        return None
    ends = (replay.resolve(own[0].source.bond.first), replay.resolve(own[0].source.bond.second))
    other = ends[0] if ends[1] == i else ends[1]
    if state.elements[other] == 1 and state.elements[i] == 6 and _lone_pair_onto(step, replay, i):
        return _hydride_leaves_hint(state, step, replay, i, own[0])
    negativity = [ELECTRONEGATIVITY.get(state.elements[a], 0.0) for a in (i, other)]
    # (Between two atoms alike, the peroxide O-O a sulfide attacks, the pair is taken as meant.)
    if negativity[0] >= negativity[1]:
        attack = _lone_pair_onto(step, replay, i)
        return (f"a nucleophile adds at the other end of {own[0].source}: `{attack.source} -> {label(other)}`"
                if attack else None)
    return (f"the pair of {own[0].source} goes to its more electronegative end: "
            f"`{own[0].source} -> {label(other)}`") if negativity[1] > negativity[0] else None


def _hydride_leaves_hint(state: ElectronState, step: Step, replay: _StepReplay, i: int, kept: Move) -> str:
    """For a carbon that keeps the pair of its C-H bond where it has no room for it (a sigma adduct
    rearomatised as if the H were a proton, the pair pushed back in by the ring): the hydrogen
    leaves with the pair, as a hydride, to an acidic hydrogen (H2, the Chichibabin reaction; Joule &
    Mills, from memory). The acid named is an N-H or O-H next to the carbon, else any other."""
    label, mol = state.label, state.mol
    carbon = label(i)

    def acidic(k: int) -> bool:
        atom = mol.GetAtomWithIdx(k)
        return state.elements[k] in (7, 8) and state.formal_charge(k) >= 0 and atom.GetAtomMapNum() > 0 \
            and (atom.GetNumExplicitHs() > 0 or any(n.GetAtomicNum() == 1 for n in atom.GetNeighbors()))
    near = [n.GetIdx() for n in mol.GetAtomWithIdx(i).GetNeighbors()]
    acid = next((k for k in near + list(range(mol.GetNumAtoms())) if k != i and acidic(k)), None)
    taking = [m for m in step.moves if not isinstance(m.source, BondPair) and isinstance(m.sink, AtomSink)
              and state.elements[replay.resolve(m.sink.atom)] == 1]
    instead = f" in place of `{kept}`" + "".join(f" and `{m}`" for m in taking)
    if acid is None:
        return (f"{carbon} has no room to keep the pair of {kept.source}: the hydrogen leaves with it, as a "
                f"hydride, to an electrophile (an acid's proton, making H2){instead}")
    a = label(acid)
    return (f"{carbon} has no room to keep the pair of {kept.source}: the hydrogen leaves with it, as a hydride, "
            f"to an acidic hydrogen, making H2 (as in the Chichibabin reaction): `{kept.source} -> H({a})-H({carbon})` "
            f"with `{a}-H -> {a}`{instead}")


# The least acidic C-H a base of a polar mechanism is drawn taking: an ester's or a nitrile's alpha
# C-H, ~25 in the acidity table (common practice: an alkoxide or LDA enolises an ester; an alkane's
# C-H, ~50, no polar base takes).
_TAKEN_C_H_PKA = 25


def _meant_elsewhere_hint(state: ElectronState, step: Step, replay: _StepReplay, i: int,
                          changes: dict[Pair, tuple[int, int]]) -> Optional[str]:
    """For a lone pair sent onto a carbon that has no bond to give up: where the arrow was most
    likely meant. A mistyped number first: an electron-poor neighbour of the carbon (methanol drawn
    onto the methyl of protonated acetic acid, `:O6 -> C2`, for its carbonyl carbon C1). Then a
    proton of the carbon, where a base could take it: the step moves a C-H pair of the carbon (an
    E2's base drawn onto the carbon), or the C-H is acidic by the acidity table (a base drawn onto
    the alpha carbon of a 1,3-dione); not an alkane's C-H that nothing in the step takes."""
    atom = state.mol.GetAtomWithIdx(i)
    attack = _lone_pair_onto(step, replay, i)
    if state.elements[i] != 6 or attack is None:
        return None
    carbon = state.label(i)
    neighbour = _electrophile_beside(state, replay, i, replay.resolve(attack.source.atom), changes) \
        if isinstance(attack.sink, AtomSink) else None
    held = atom.GetTotalNumHs() or any(n.GetAtomicNum() == 1 for n in atom.GetNeighbors())
    proton = f"`{attack.source} -> H({carbon})`" if held and (
        _c_h_pair_moves(state, replay, i) or _acidic_c_h(state, i)) else None
    if neighbour is None:
        return (f"a base takes a proton, not the carbon: end the arrow at one of {carbon}'s hydrogens, {proton}"
                if proton else None)
    j, why, pi_arrow = neighbour
    element = "carbon" if state.elements[j] == 6 else "boron"
    hint = (f"the arrow may be meant for {state.label(j)}, the electrophilic {element} beside {carbon} "
            f"({why}): `{attack.source} -> {state.label(j)}`" + (f" with `{pi_arrow}`" if pi_arrow else ""))
    if proton:
        hint += f"; if a proton transfer is meant, end the arrow at one of {carbon}'s hydrogens, {proton}"
    return hint


def _electrophile_beside(state: ElectronState, replay: _StepReplay, i: int, nucleophile: int,
                         changes: dict[Pair, tuple[int, int]]) -> Optional[tuple[int, str, Optional[str]]]:
    """An electron-poor carbon or boron beside atom i that the nucleophile could bond to, with why
    it is electron-poor and the pi bond's arrow that would make room on it (None when the step
    already moves it or it has none): the atom this step leaves short of a pair first, then one
    short of an octet before the step (a carbocation), then the carbon of a C=O or C=N+, a
    protonated one first (common practice: the order of their electrophilicity)."""
    label, mol = state.label, state.mol
    short = set(_left_short(state, changes, replay))
    ranked = []
    for n in mol.GetAtomWithIdx(i).GetNeighbors():
        j = n.GetIdx()
        if state.elements[j] not in (5, 6) or j == nucleophile or not nameable(mol, j) \
                or mol.GetBondBetweenAtoms(j, nucleophile) is not None:
            continue
        if j in short:
            taking = next((m.move for m in replay.resolved if m.source_kind == "bond" and j in m.source_atoms
                           and j not in m.sink_atoms), None)
            ranked.append((0, j, f"`{taking}` leaves it short of a pair" if taking else
                           "this step leaves it short of a pair", None))
            continue
        if state.nonbonding[j] + 2 * state.bond_sums[j] < 8:
            kind = "a carbocation" if state.elements[j] == 6 and state.formal_charge(j) > 0 else "short of an octet"
            ranked.append((1, j, kind, None))
            continue
        for bond in n.GetBonds():
            x = bond.GetOtherAtomIdx(j)
            if state.elements[j] != 6 or state.elements[x] not in (7, 8) or bond.GetBondTypeAsDouble() != 2 \
                    or not nameable(mol, x):
                continue
            charged = state.formal_charge(x) > 0
            if state.elements[x] == 7 and not charged:
                continue   # a neutral imine's carbon: a weak electrophile, not offered
            double = f"{label(j)}={label(x)}"
            moved = changes.get(pair(j, x), (4, 4))[1] < 4
            ranked.append((2 if charged else 3, j, f"the carbon of {double}{'+' if charged else ''}",
                           None if moved else f"{double} -> {label(x)}"))
            break
    if not ranked:
        return None
    _, j, why, pi_arrow = min(ranked, key=lambda r: r[0])
    return j, why, pi_arrow


def _c_h_pair_moves(state: ElectronState, replay: _StepReplay, i: int) -> bool:
    """Whether an arrow of the step starts at a C-H bond of carbon i (`C2-H -> C2=C3`): the step
    itself takes a proton from it, as an E2 does from a C-H no table calls acidic."""
    return any(m.source_kind == "bond" and i in m.source_atoms
               and any(state.elements[k] == 1 for k in m.source_atoms) for m in replay.resolved)


def _acidic_c_h(state: ElectronState, i: int) -> bool:
    """Whether a base could take a proton of carbon i: its C-H as acidic as an ester's alpha C-H
    or more, by the acidity table (asked only for a hint)."""
    from .judgement.acidity import acidity_of, perceived
    entry = acidity_of(perceived(state.mol), i)
    return entry is not None and entry.pka <= _TAKEN_C_H_PKA


def _lone_pair_onto(step: Step, replay: _StepReplay, i: int) -> Optional[Move]:
    """The step's first arrow from an atom's own electrons (not a bond) that ends at atom i, or
    at a bond to it (`:S6 -> S6-O2`)."""
    for move in step.moves:
        if isinstance(move.source, BondPair):
            continue
        sink = move.sink
        if isinstance(sink, AtomSink) and replay.resolve(sink.atom) == i:
            return move
        if isinstance(sink, BondSink) and i in (replay.resolve(sink.bond.first), replay.resolve(sink.bond.second)):
            return move
    return None


_LEAVING_ELEMENTS = frozenset((7, 8, 9, 15, 16, 17, 35, 53))   # N, O, F, P, S, Cl, Br, I
_LEAVING_RANK = {53: 0, 35: 1, 17: 2, 16: 3, 8: 4, 9: 5, 7: 6, 15: 7}   # I- best, then Br-, Cl- ... (pKa of HX)


def _room_making_hint(state: ElectronState, i: int, changes: dict[Pair, tuple[int, int]],
                      replay: _StepReplay) -> Optional[str]:
    """What would keep atom i's shell full but not over: one of its bonds the step leaves alone
    breaking in the same step, its pi bond first (the missing arrow of a concerted step), sent
    where the step leaves an atom short (see _short_of_a_pair), else a bond to a heteroatom (a
    leaving group); None when it has no such bond."""
    label = state.label
    kept = [(b.GetOtherAtomIdx(i), b.GetBondTypeAsDouble()) for b in state.mol.GetAtomWithIdx(i).GetBonds()
            if (min(i, b.GetOtherAtomIdx(i)), max(i, b.GetOtherAtomIdx(i))) not in changes
            and state.elements[b.GetOtherAtomIdx(i)] != 1]
    # A move can name only mapped atoms: a bond to one is offered first.
    kept.sort(key=lambda bond: not nameable(state.mol, bond[0]))
    pi = [(j, order) for j, order in kept if order >= 2]
    if pi:
        j, order = pi[0]
        if not nameable(state.mol, j):
            return f"a bond to {label(i)} must break in the same step: its pi bond to {_needs_map_number(label(j))}"
        bond = f"{label(i)}{'=' if order == 2 else '#'}{label(j)}"
        short = _short_of_a_pair(state, changes, replay, exclude=(i, j))
        bonded = state.mol.GetBondBetweenAtoms(j, short) if short is not None else None
        if bonded is not None:
            # The missing arrow of a concerted step: the pair goes on into the bond to the atom the
            # step leaves with six electrons (a Claisen shift's oxygen, a Diels-Alder's diene end).
            connector = "=" if int(bonded.GetBondTypeAsDouble()) == 1 else "#"
            return (f"a bond to {label(i)} must break in the same step: its pi bond, whose pair goes to "
                    f"{label(short)}, left short of a pair by this step: `{bond} -> {label(j)}{connector}{label(short)}`")
        if short is not None and all(m.source_kind == "bond" and len(m.sink_atoms) == 2 for m in replay.resolved) \
                and not _within_bonds(state, changes, j, short, 3) and _within_bonds(state, changes, j, short, 5):
            # A concerted step whose every arrow runs from a bond into a bond (a Diels-Alder with the
            # dienophile's arrow left out): the missing arrow closes the loop with a new bond, into
            # a ring of five or six (a four-membered one across an arene attacking a nitrilium
            # carbon is no pericyclic array: the arrow meant breaks the C#N's pi bond onto N).
            return (f"a bond to {label(i)} must break in the same step: its pi bond, whose pair goes to "
                    f"{label(short)}, left short of a pair by this step: `{bond} -> {label(j)}-{label(short)}`")
        if short is not None:
            # Anywhere else a new bond from the pi bond's far end to the atom left short is one no
            # arrow of the step is about (a three-membered ring in a Curtius shift drawn to the wrong
            # nitrogen, a bond to another molecule): an arrow of the step most likely ends at the
            # wrong atom.
            misplaced = _misplaced_arrow_hint(state, changes, replay, i, short)
            if misplaced:
                return misplaced
        return f"a bond to {label(i)} must break in the same step: its pi bond, for example `{bond} -> {label(j)}`"
    if kept and state.elements[i] == 1:
        # A hydrogen taken by a base, whatever holds it (an O-H, the C-H of a formate): the pair
        # of its bond stays on the atom it leaves, written as the language writes an X-H bond.
        holder = kept[0][0]
        if not nameable(state.mol, holder):
            return (f"the bond that holds {label(i)} must break in the same step: its bond to "
                    f"{_needs_map_number(label(holder))}")
        hydrogen = "H" if label(i).startswith("H(") else label(i)   # C3-H for C3's, H5 for a mapped one
        short = _short_of_a_pair(state, changes, replay, exclude=(i, holder))
        beside = state.mol.GetBondBetweenAtoms(holder, short) if short is not None else None
        if beside is not None:
            # The missing arrow of a concerted step (an ene reaction's C-H pair going on into the new
            # C=C): the pair goes to the neighbour this step leaves short of one.
            order_after = int(beside.GetBondTypeAsDouble()) + 1
            connector = "=" if order_after == 2 else "#"
            return (f"the bond that holds {label(i)} must break in the same step, its pair going on to "
                    f"{label(short)}, left short of a pair by this step: "
                    f"`{label(holder)}-{hydrogen} -> {label(short)}{connector}{label(holder)}`")
        return (f"the bond that holds {label(i)} must break in the same step: "
                f"`{label(holder)}-{hydrogen} -> {label(holder)}`")
    leaving = [j for j, order in kept if state.elements[j] in _LEAVING_ELEMENTS]
    # The group that leaves as the weakest base first (common practice: an onium leaves as a neutral
    # molecule, a neutral group as an anion; an O- would leave as oxide, O2-, so the OEt of a
    # tetrahedral intermediate leaves, not its O-); a halogen before O, N, S or P.
    leaving.sort(key=lambda j: (not nameable(state.mol, j), -state.formal_charge(j), _LEAVING_RANK.get(state.elements[j], 9)))
    if leaving:
        if not nameable(state.mol, leaving[0]):
            return (f"a bond to {label(i)} must break in the same step: the bond to a leaving group, "
                    f"{_needs_map_number(label(leaving[0]))}")
        bond = f"{label(i)}-{label(leaving[0])}"
        return (f"a bond to {label(i)} must break in the same step: the bond to a leaving group, for example "
                f"`{bond} -> {label(leaving[0])}`")
    return None


def _misplaced_arrow_hint(state: ElectronState, changes: dict[Pair, tuple[int, int]], replay: _StepReplay,
                          i: int, short: int) -> Optional[str]:
    """For atom i overfull while the step leaves atom `short` with six electrons: the arrow that
    belongs at `short` and was drawn to i. Either a new bond to i (a group migrating to the atom
    that also takes the leaving group's pair, a nucleophile adding to the wrong carbon: the bond
    belongs at the atom left short), or the pair of the bond i-short sent onto i (it belongs on
    the atom it would otherwise leave short). None when neither is written, or the new bond
    would close a ring of three or four atoms."""
    label, mol = state.label, state.mol
    if not nameable(mol, short):
        return None
    for m in replay.resolved:
        if m.electrons != 2 or len(m.sink_atoms) != 2 or i not in m.sink_atoms:
            continue
        k = m.sink_atoms[0] if m.sink_atoms[1] == i else m.sink_atoms[1]
        if replay.bond_before(i, k) or k == short or short in m.source_atoms or not nameable(mol, k) \
                or replay.bond_before(k, short) or _within_bonds(state, changes, k, short, 3, (k, i)):
            continue
        move = m.move
        sink = label(short) if isinstance(move.sink, AtomSink) else f"{label(k)}-{label(short)}"
        rewritten = f"`{move.source} -> {sink}`"
        gives = next((g for g in replay.resolved if g.source_kind == "bond" and set(g.source_atoms) == {i, short}
                      and g.sink_atoms == (i,)), None)
        if gives is not None and m.source_kind == "bond":
            # A 1,2-shift onto a leaving group's atom: the group goes where the pair leaves from.
            return (f"{label(i)} takes the pair of {label(short)}-{label(i)} as that bond breaks, so it cannot also "
                    f"take the new bond from {label(k)}: a group migrates to the atom the leaving pair leaves, "
                    f"{label(short)}, left short of a pair by this step: {rewritten}")
        return (f"{label(i)} has no room for the new bond from {label(k)}, while this step leaves {label(short)} "
                f"short of a pair: the arrow most likely belongs at {label(short)}: {rewritten}")
    for m in replay.resolved:
        if m.source_kind == "bond" and set(m.source_atoms) == {i, short} and m.sink_atoms == (i,) \
                and ELECTRONEGATIVITY.get(state.elements[short], 0.0) >= ELECTRONEGATIVITY.get(state.elements[i], 0.0):
            return (f"`{m.move}` gives {label(i)} a pair it has no room for, while {label(short)} is left short of "
                    f"one: the pair of {m.move.source} goes to {label(short)}: `{m.move.source} -> {label(short)}`")
    return None


def _within_bonds(state: ElectronState, changes: dict[Pair, tuple[int, int]], a: int, b: int, most: int,
                  dropped: tuple[int, int] = (-1, -1)) -> bool:
    """Whether heavy atoms a and b are at most `most` bonds apart after the step (the bond
    `dropped` left out): a bond between them would close a ring of at most most + 1 atoms."""
    gone = {pair(x, y) for (x, y), (_, after) in changes.items() if after == 0} | {pair(*dropped)}
    made: dict[int, set[int]] = {}
    for (x, y), (before, after) in changes.items():
        if before == 0 and after and state.elements[x] != 1 and state.elements[y] != 1:
            made.setdefault(x, set()).add(y)
            made.setdefault(y, set()).add(x)
    reached, frontier = {a}, {a}
    for _ in range(most):
        ahead = set()
        for x in frontier:
            near = {n.GetIdx() for n in state.mol.GetAtomWithIdx(x).GetNeighbors() if n.GetAtomicNum() != 1}
            ahead |= {y for y in near | made.get(x, set()) if pair(x, y) not in gone}
        if b in ahead:
            return True
        frontier = ahead - reached
        reached |= ahead
    return False


def _needs_map_number(atom: str) -> str:
    """An atom a hint would name in a move, told instead that it needs a map number: the language
    writes an atom only by its map number (C(atom 5) is a label for messages)."""
    return f"{atom}, which needs a map number in its species to be named in a move"


def _unweakened_pi_bond_hint(state: ElectronState, i: int, changes: dict[Pair, tuple[int, int]]) -> Optional[str]:
    """When no bond the step leaves alone can make room: a multiple bond the atom has before the
    step and the step does not weaken (the iminium C1=N3 a step makes triple), written as the move
    that gives its pi pair to the other atom. One the step weakens has already given its pair."""
    for bond in state.mol.GetAtomWithIdx(i).GetBonds():
        j = bond.GetOtherAtomIdx(i)
        before, after = changes.get(pair(i, j), (0, 0))
        if before >= 4 and after >= before and nameable(state.mol, j):
            connector = "=" if before == 4 else "#"
            return (f"a bond to {state.label(i)} must break in the same step: its pi bond, for example "
                    f"`{state.label(i)}{connector}{state.label(j)} -> {state.label(j)}`")
    return None


def _no_room_named_hint(atom: str) -> str:
    """When no bond of the atom is worth naming (a carbon drawn taking a bond its neighbour should)."""
    return (f"a bond to {atom} must break in the same step, or an arrow that ends at {atom} (or at a bond "
            f"to it) must end elsewhere")


def _short_of_a_pair(state: ElectronState, changes: dict[Pair, tuple[int, int]], replay: _StepReplay,
                     exclude: tuple[int, ...]) -> Optional[int]:
    """A first-row atom the step takes from eight valence electrons to six (a pair of its bond
    sent elsewhere, none coming back), other than `exclude`: where a missing arrow's pair belongs."""
    return next((k for k in _left_short(state, changes, replay) if k not in exclude), None)


def _left_short(state: ElectronState, changes: dict[Pair, tuple[int, int]], replay: _StepReplay) -> list[int]:
    """The first-row atoms the step takes from eight valence electrons to six, by index."""
    gained: dict[int, int] = dict(replay.d_nonbonding)
    for (a, b), (before, after) in changes.items():
        gained[a] = gained.get(a, 0) + after - before
        gained[b] = gained.get(b, 0) + after - before
    return [k for k, delta in sorted(gained.items())
            if delta == -2 and 5 <= state.elements[k] <= 9 and state.nonbonding[k] + 2 * state.bond_sums[k] == 8]


def _next_framework(state: ElectronState, changes: dict[Pair, tuple[int, int]]):
    """The bond framework after a step, from the one before (None when nobody asked for it)."""
    if state.framework is None:
        return None
    elements = state.elements
    removed, added = [], []
    for (i, j), (before, electrons) in changes.items():
        if (elements[i] == 1) != (elements[j] == 1):
            continue
        if before:
            removed.append((i, j, before // 2))
        if electrons:
            added.append((i, j, electrons // 2))
    if not removed and not added:
        return state.framework
    return state.framework.difference(removed).union(added)


def _next_cations(state: ElectronState, charges: list[tuple[int, int, int]]) -> Optional[frozenset[int]]:
    """The cations after a step, from those before and the step's charge changes (None when
    nobody asked for them before)."""
    cations = state.cation_atoms
    if cations is None:
        return None
    for _, before, after in charges:
        if before > 0 or after > 0:
            return cations.difference(i for i, _, _ in charges).union(i for i, _, after in charges if after > 0)
    return cations   # (most steps) no atom becomes a cation or stops being one


def _first_move_touching(step: Step, replay: _StepReplay, atom: int) -> Location:
    for resolved in replay.resolved:
        if atom in resolved.source_atoms or atom in resolved.sink_atoms:
            return resolved.move.loc
    return step.loc

