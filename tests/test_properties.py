"""Property tests (hypothesis).

1. Any sequence of valid electron moves conserves total charge, the atoms of every element and the
   number of valence electrons. Moves are chosen from what the current state allows (a lone pair
   to a proton, a bond pair onto one of its atoms, a lone pair into an incomplete octet, homolysis,
   radical recombination), so the engine must accept every one of them. RDKit is the independent
   judge of each derived state: it must sanitize, and its formal charges and formula are the ones
   counted.
2. Random text, random token soup and random edits of a valid file never raise anything: the
   library answers with diagnostics.
"""
from __future__ import annotations

from collections import Counter

from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from rdkit import Chem

from arrows import check_text, parse, replay
from arrows.diagnostics import CODES
from arrows.electrons import ElectronState
from arrows.rdkit_io import period, valence_electrons

from small_mechanisms import ALDOL

# Small species, every heavy atom mapped so that a move can name it. Hydrogens are named through
# their parent: H(O4), O4-H.
POOL = [
    ("hydroxide", "[OH-:1]"),
    ("water", "[OH2:2]"),
    ("methanol", "[CH3:3][OH:4]"),
    ("ammonium", "[NH4+:5]"),
    ("ammonia", "[NH3:6]"),
    ("acetaldehyde", "[CH3:7][CH:8]=[O:9]"),
    ("methyl_cation", "[CH3+:10]"),
    ("bromide", "[Br-:11]"),
    ("methyl_radical", "[CH3:12]"),
    ("hydronium", "[OH3+:13]"),
    ("ethene", "[CH2:14]=[CH2:15]"),
    ("acetonitrile", "[CH3:16][C:17]#[N:18]"),
    ("bromine_atom", "[Br:19]"),
]
CONNECTOR = {1: "-", 2: "=", 3: "#"}


def _name(state: ElectronState, i: int) -> str:
    atom = state.mol.GetAtomWithIdx(i)
    return f"{atom.GetSymbol()}{atom.GetAtomMapNum()}"


def _shell(state: ElectronState, i: int) -> int:
    return state.nonbonding[i] + 2 * state.bond_order_sum(i)


def _has_hydrogen(state: ElectronState, i: int) -> bool:
    return state.mol.GetAtomWithIdx(i).GetTotalNumHs(includeNeighbors=True) > 0


def valid_steps(state: ElectronState) -> list[tuple[str, ...]]:
    """Every step of one kind of move that the bookkeeping rules allow in `state`, as move texts."""
    heavy = [a.GetIdx() for a in state.mol.GetAtoms() if a.GetAtomMapNum()]
    lone_pair = [i for i in heavy if state.nonbonding[i] >= 2]
    radical = [i for i in heavy if state.nonbonding[i] % 2]
    steps: list[tuple[str, ...]] = []
    # proton transfer: a lone pair takes a proton, the X-H pair stays on X
    for x in lone_pair:
        for y in heavy:
            if y != x and _has_hydrogen(state, y):
                steps.append((f":{_name(state, x)} -> H({_name(state, y)})",
                              f"{_name(state, y)}-H -> {_name(state, y)}"))
    # a lone pair into an incomplete octet (second-row atom with six electrons or fewer)
    for x in lone_pair:
        for y in heavy:
            if y != x and period(state.mol.GetAtomWithIdx(y).GetAtomicNum()) == 2 and _shell(state, y) <= 6 \
                    and state.bond_electrons(x, y) < 6:
                steps.append((f":{_name(state, x)} -> {_name(state, y)}",))
    for bond in state.mol.GetBonds():
        i, j = bond.GetBeginAtomIdx(), bond.GetEndAtomIdx()
        if not (state.mol.GetAtomWithIdx(i).GetAtomMapNum() and state.mol.GetAtomWithIdx(j).GetAtomMapNum()):
            continue
        written = f"{_name(state, i)}{CONNECTOR[state.bond_electrons(i, j) // 2]}{_name(state, j)}"
        # heterolysis: one pair of the bond onto either atom
        steps.append((f"{written} -> {_name(state, i)}",))
        steps.append((f"{written} -> {_name(state, j)}",))
        # homolysis: one electron to each atom
        steps.append((f"{written} ~> {_name(state, i)}", f"{written} ~> {_name(state, j)}"))
    # radical recombination: one electron from each partner
    for a in radical:
        for b in radical:
            if a < b and state.bond_electrons(a, b) < 6 and max(_shell(state, a), _shell(state, b)) <= 7:
                steps.append((f".{_name(state, a)} ~> {_name(state, b)}", f".{_name(state, b)} ~> {_name(state, a)}"))
    return steps


def final_state(text: str) -> ElectronState:
    trace = replay(parse(text))
    assert trace.final is not None, [d.to_text() for d in trace.diagnostics]
    return trace.final


@st.composite
def mechanisms(draw) -> str:
    chosen = draw(st.lists(st.sampled_from(range(len(POOL))), min_size=2, max_size=4, unique=True))
    text = "".join(f'species {POOL[i][0]} = "{POOL[i][1]}"\n' for i in sorted(chosen))
    for number in range(draw(st.integers(1, 6))):
        options = valid_steps(final_state(text))
        if not options:
            break
        moves = draw(st.sampled_from(options))
        text += f'step "step {number + 1}"\n' + "".join(f"    {m}\n" for m in moves) + "end\n"
    return text


def totals(state: ElectronState) -> tuple[int, Counter, int]:
    """(net charge, atoms by element, valence electrons), counted on RDKit's view of the state."""
    for atom in state.mol.GetAtoms():   # the state's Mol carries the bookkeeping's unpaired electron
        assert atom.GetNumRadicalElectrons() == state.nonbonding[atom.GetIdx()] % 2
    mol = Chem.Mol(state.mol)
    Chem.SanitizeMol(mol)   # RDKit must accept every derived state
    elements = Counter()
    for atom in mol.GetAtoms():
        elements[atom.GetSymbol()] += 1
        elements["H"] += atom.GetTotalNumHs()
        # RDKit assigns unpaired electrons by its own rule (a lone-pair-short oxenium gets two): the
        # parity must still agree with ours.
        assert atom.GetNumRadicalElectrons() % 2 == state.nonbonding[atom.GetIdx()] % 2
    # Valence electrons: lone electrons plus two per bond (a hydrogen kept as a count is a bond too).
    hydrogen_counts = sum(a.GetNumExplicitHs() for a in mol.GetAtoms())
    electrons = sum(state.nonbonding) + 2 * sum(int(b.GetBondTypeAsDouble()) for b in mol.GetBonds()) \
        + 2 * hydrogen_counts
    # Summing the Gold Book formal charge V - N - B over all atoms: the electrons are the free atoms'
    # valence electrons less RDKit's net charge.
    free_atoms = sum(valence_electrons(a.GetAtomicNum()) for a in mol.GetAtoms()) + hydrogen_counts
    assert electrons == free_atoms - Chem.GetFormalCharge(mol)
    return Chem.GetFormalCharge(mol), elements, electrons


@settings(max_examples=150, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(mechanisms())
def test_valid_moves_conserve_charge_atoms_and_electrons(text):
    trace, diags = check_text(text)
    assert [d for d in diags if d.severity == "error"] == [], text + "\n" + "\n".join(d.to_text() for d in diags)
    assert trace.complete
    states = list(trace.states())
    assert len(states) == len(trace.steps) + 1
    first = totals(states[0])
    for state in states[1:]:
        assert totals(state) == first, text


def assert_answers_with_diagnostics(text: str) -> None:
    trace, diags = check_text(text, "random.mech")
    for d in diags:
        assert d.code in CODES
        assert d.loc.file == "random.mech" and d.loc.line >= 1 and d.loc.column >= 1, d.to_text()
        assert d.message


@settings(max_examples=300, deadline=None)
@given(st.text())
def test_random_text_never_raises(text):
    assert_answers_with_diagnostics(text)


TOKENS = ["species", "step", "end", "product", "expect", "all", "uses", "releases", "reversible", "resonance",
          "over", "under", "title", "caption", "water", "base", "=", "-", "#", ":", ".", "•", "->", "~>",
          "(", ")", "H", "H(C2)", "C2-H", "C1", "C2", "O3", "O4", "N5", "Br6", "H7", "C99", "\n", "# note\n",
          '"s"', '"[OH-:4]"', '"[CH3:1][CH2:2][O:3]"', '"[CH2:1]=[CH2:2]"', '"CCO"', '"[Br:6][H:7]"',
          '"[N:5]"', '"C(("', '""', '"[OH2:3]"', '"[CH3:1][Br:6]"']


@settings(max_examples=400, deadline=None)
@given(st.lists(st.sampled_from(TOKENS), max_size=40))
def test_token_soup_never_raises(tokens):
    assert_answers_with_diagnostics(" ".join(tokens))


# Random moves, mostly wrong, between the mapped atoms of real species: every one must come back as
# diagnostics (a move written O3-C2 -> O3-O3 once reached RDKit as a self-bond).
MAPPED = ['[cH:1]1[cH:2][cH:3][cH:4][cH:5][c:6]1[OH:7]', '[CH3:11][C:12](=[O:13])[O:14][CH3:15]',
          '[CH2:21]=[CH:22][CH:23]=[CH2:24]', '[C-:31]#[N:32]', '[NH3+:41][CH2:42][C:43](=[O:44])[O-:45]',
          '[CH2:51]1[CH2:52][O:53]1', '[Br:61][Br:62]', '[CH3:71][CH2:72]', '[H-:81]', '[O:91]=[O:92]']
SPECIES = "".join(f'species s{i} = "{smiles}"\n' for i, smiles in enumerate(MAPPED))
ATOM_NAMES = ["C1", "C2", "C6", "O7", "C12", "O13", "O14", "C21", "C22", "C31", "N32", "N41", "O45", "C51", "O53",
              "Br61", "Br62", "C71", "C72", "H81", "O91", "O92", "C99"]
# Bonds as they are in the species, so that many sources are right and the sink is what is tested.
REAL_BONDS = [("C12", "=", "O13"), ("C12", "-", "O14"), ("C21", "=", "C22"), ("C31", "#", "N32"), ("C51", "-", "O53"),
              ("Br61", "-", "Br62"), ("O91", "=", "O92"), ("C71", "-", "C72"), ("O7", "-", "H"), ("N41", "-", "H")]

atom_texts = st.sampled_from(ATOM_NAMES).flatmap(lambda a: st.sampled_from([a, f"H({a})"]))
arrows_ = st.sampled_from(["->", "~>"])
any_bond = st.builds(lambda a, c, b: f"{a}{c}{b}", atom_texts, st.sampled_from("-=#"), atom_texts)
wild_move = st.builds(lambda src, arrow, sink: f"{src} {arrow} {sink}",
                      st.one_of(atom_texts.map(lambda a: ":" + a), atom_texts.map(lambda a: "." + a), any_bond,
                                atom_texts),
                      arrows_, st.one_of(atom_texts, any_bond, atom_texts.map(lambda a: ":" + a)))


def _from_real_bond(bond: tuple[str, str, str]):
    """A right source bond with a sink made of its own atoms (or one more): onto an atom, into a
    bond next to it, into itself, or into a bond with the same atom at both ends."""
    first, connector, second = bond
    ends = [first, f"H({first})" if second == "H" else second]
    partners = st.sampled_from(ends + ATOM_NAMES)
    connectors = st.sampled_from("-=#")
    sink = st.one_of(st.sampled_from(ends),
                     st.builds(lambda x, c, y: f"{x}{c}{y}", st.sampled_from(ends), connectors, partners),
                     st.builds(lambda x, c: f"{x}{c}{x}", st.sampled_from(ends), connectors))
    return st.builds(lambda arrow, target: f"{first}{connector}{second} {arrow} {target}", arrows_, sink)


move_texts = st.one_of(wild_move, st.sampled_from(REAL_BONDS).flatmap(_from_real_bond))
step_texts = st.builds(lambda kind, moves: f'step "s"{kind}\n' + "".join(f"    {m}\n" for m in moves) + "end\n",
                       st.sampled_from(["", " resonance"]), st.lists(move_texts, min_size=1, max_size=2))


# The replay stops at the first step that fails, and most random moves fail at once: short steps,
# many examples.
@settings(max_examples=600, deadline=None)
@given(st.lists(step_texts, min_size=1, max_size=2))
def test_random_moves_on_real_species_never_raise(steps):
    assert_answers_with_diagnostics(SPECIES + "".join(steps))


# A valid file to edit at random: the acetaldehyde aldol addition (small_mechanisms.py), with a
# title and step options so that edits reach every part of the language.
VALID = 'title "Aldol addition"\n' + ALDOL.replace('step "addition"', 'step "addition" reversible over "NaOH"')


def test_the_file_to_edit_is_valid():
    assert [d for d in check_text(VALID)[1] if d.severity != "note"] == []


edits = st.tuples(st.integers(0, len(VALID)), st.integers(0, 12),
                  st.sampled_from(TOKENS + ["", " ", "\n", "1", "9", "\"", "[", "]", "\x00", "é"]))


@settings(max_examples=400, deadline=None)
@given(st.lists(edits, min_size=1, max_size=4))
def test_edits_of_a_valid_file_never_raise(changes):
    text = VALID
    for start, length, inserted in changes:
        start = min(start, len(text))
        text = text[:start] + inserted + text[start + length:]
    assert_answers_with_diagnostics(text)
