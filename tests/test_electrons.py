"""Electron bookkeeping against outside definitions.

Formal charge: IUPAC Gold Book, "formal charge": FC = V - N - B/2 (memory), with B/2 the bond order
sum. Lone-pair counts: Lewis structures as drawn in any introductory organic text (common practice).
RDKit is the independent judge of the charges written in SMILES and of sanitization.
"""
import pytest
from rdkit import Chem

from arrows import check_text
from arrows.electrons import ElectronState, initial_nonbonding
from arrows.rdkit_io import valence_electrons
from arrows.trace import species_mol
from arrows.model import Species


def _state(smiles: str) -> ElectronState:
    mol, problem = species_mol(Species("x", smiles), set())
    assert problem is None
    return ElectronState(mol, tuple(initial_nonbonding(mol)))


@pytest.mark.parametrize("smiles, symbol, lone_pairs, charge", [
    ("O", "O", 2, 0),            # water: two lone pairs on O (common practice)
    ("[OH-]", "O", 3, -1),       # hydroxide
    ("[OH3+]", "O", 1, +1),      # hydronium
    ("[NH4+]", "N", 0, +1),      # ammonium
    ("N", "N", 1, 0),            # ammonia
    ("[CH3+]", "C", 0, +1),      # methyl cation: no lone pair
    ("[CH3-]", "C", 1, -1),      # methyl anion: one lone pair
    ("[Br-]", "Br", 4, -1),      # bromide: four lone pairs
])
def test_lone_pairs_and_gold_book_formal_charge(smiles, symbol, lone_pairs, charge):
    state = _state(smiles)
    i = next(a.GetIdx() for a in state.mol.GetAtoms() if a.GetSymbol() == symbol)
    assert state.nonbonding[i] // 2 == lone_pairs
    # Gold Book: FC = V - N - B/2, and RDKit read the same charge from the SMILES text.
    assert state.formal_charge(i) == charge == Chem.MolFromSmiles(smiles).GetAtomWithIdx(i).GetFormalCharge()


def test_methyl_radical_has_one_unpaired_electron():
    state = _state("[CH3]")
    assert state.nonbonding[0] == 1 and state.formal_charge(0) == 0


def test_nitromethane_charge_separation():
    """Nitro group: N+ and one O- (common practice); V - N - B reproduces both."""
    state = _state("C[N+](=O)[O-]")
    charges = sorted(state.formal_charge(i) for i in range(state.mol.GetNumAtoms()))
    assert charges == [-1, 0, 0, +1]


def _final(text: str):
    trace, diags = check_text(text)
    assert not [d for d in diags if d.severity == "error"], [d.to_text() for d in diags]
    return trace


def test_homolysis_gives_two_radicals():
    """Br-Br homolysis with two fishhooks gives two bromine atoms (textbook radical initiation)."""
    trace = _final('''
species bromine = "[Br:1][Br:2]"
step "homolysis"
    Br1-Br2 ~> Br1
    Br1-Br2 ~> Br2
end
''')
    after = trace.final
    assert after.mol.GetNumBonds() == 0
    assert [a.GetNumRadicalElectrons() for a in after.mol.GetAtoms()] == [1, 1]
    assert [after.formal_charge(i) for i in range(2)] == [0, 0]


def test_radical_recombination_makes_a_two_electron_bond():
    """Two methyl radicals combine to ethane (textbook termination step)."""
    trace = _final('''
species a = "[CH3:1]"
species b = "[CH3:2]"
step "recombination"
    .C1 ~> C1-C2
    .C2 ~> C1-C2
end
product "CC"
''')
    from arrows.rdkit_io import canonical
    assert canonical(trace.final.mol) == Chem.CanonSmiles("CC")
    assert trace.final.mol.GetBondBetweenAtoms(0, 1).GetBondTypeAsDouble() == 1.0


def test_an_electron_transfer_makes_a_ketyl_radical_anion():
    """Sodium gives one electron to acetone: the ketyl, a radical anion with the charge on oxygen
    and the unpaired electron on carbon, and Na+ (textbook dissolving-metal chemistry; the
    mechanism is small_mechanisms.KETYL). The electron ends on O3 with no Na-O bond. Judge: RDKit
    reads the final state's SMILES back, with its radical count and charges."""
    from small_mechanisms import KETYL
    trace = _final(KETYL)
    after = trace.final
    assert after.mol.GetBondBetweenAtoms(0, 1) is None   # Na1 and O3: no bond
    again = Chem.MolFromSmiles(Chem.MolToSmiles(after.mol))
    charges = {a.GetAtomMapNum(): a.GetFormalCharge() for a in again.GetAtoms() if a.GetAtomMapNum()}
    radicals = {a.GetAtomMapNum(): a.GetNumRadicalElectrons() for a in again.GetAtoms() if a.GetAtomMapNum()}
    assert charges == {1: 1, 2: 0, 3: -1}
    assert radicals == {1: 0, 2: 1, 3: 0}
    moves = trace.steps[0].change.moves
    assert (moves[0].source_atoms, moves[0].sink_atoms) == ((0,), (1,))


def test_an_electron_transfer_to_its_own_atom_goes_nowhere():
    _, diags = check_text('species sodium = "[Na:1]"\nstep "s"\n    .Na1 ~> :Na1\nend\n')
    assert [(d.code, d.loc.line, d.loc.column) for d in diags if d.severity == "error"] == [("AR210", 3, 13)]


def test_sources_are_judged_before_the_step():
    """In one concerted step O9 may give back a pair while the C2=C3 pair leaves: both sources are
    read from the state before the step (language.md: moves in a step happen together)."""
    _final('''
species enolate = "[CH3:1][C:2]([O-:9])=[CH:3][CH2:4][CH2:5][CH2:6][C:7](=[O:10])[CH3:8]"
step "ring closure"
    :O9 -> C2=O9
    C2=C3 -> C3-C7
    C7=O10 -> O10
end
product "CC(=O)C1CCCC1(C)[O-]"
''')


def test_hydrogen_count_changes_only_through_moves():
    """Spectator atoms keep their hydrogen counts through every step (no implicit-H fix-up)."""
    trace = _final('''
species acetone = "[CH3:1][C:2](=[O:3])[CH3:4]"
species base = "[OH-:5]"
step "deprotonation"
    :O5 -> H(C1)
    C1-H -> C1=C2
    C2=O3 -> O3
end
''')
    before = trace.initial.mol
    after = trace.final.mol
    c4_before = next(a for a in before.GetAtoms() if a.GetAtomMapNum() == 4)
    c4_after = next(a for a in after.GetAtoms() if a.GetAtomMapNum() == 4)
    assert c4_before.GetTotalNumHs(includeNeighbors=True) == c4_after.GetTotalNumHs(includeNeighbors=True) == 3
    c1_after = next(a for a in after.GetAtoms() if a.GetAtomMapNum() == 1)
    assert c1_after.GetTotalNumHs(includeNeighbors=True) == 2
    # Electron count: every valence electron is either non-bonding or in a bond.
    for state in trace.states():
        total_v = sum(valence_electrons(a.GetAtomicNum()) for a in state.mol.GetAtoms()) + sum(
            a.GetNumExplicitHs() for a in state.mol.GetAtoms())
        charge = sum(state.formal_charge(i) for i in range(state.mol.GetNumAtoms()))
        in_bonds = 2 * sum(int(b.GetBondTypeAsDouble()) for b in state.mol.GetBonds()) + 2 * sum(
            a.GetNumExplicitHs() for a in state.mol.GetAtoms())
        assert sum(state.nonbonding) + in_bonds == total_v - charge


@pytest.mark.parametrize("first, second", [
    ("[CH3:1][C:2](=[O:3])[CH3:4]", "[OH-:5]"),                        # acetone and hydroxide
    ("[CH2-:1][P+:2](c1ccccc1)(c1ccccc1)c1ccccc1", "C[Mg+]"),          # an ylide and a Grignard cation
    ("F/C=C/[C@H](Cl)Br", "[Br:9][Br:10]"),                             # written configurations
])
def test_a_joined_state_reads_as_the_combined_molecule(first, second):
    """`uses` and the starting state join two species' numbers; read off the combined Mol by RDKit
    (charges, bonds, elements, configuration) they must be the same."""
    a, b = (ElectronState.of_molecule(species_mol(Species("x", s), set())[0]) for s in (first, second))
    joined = a.appended(b, Chem.CombineMols(a.mol, b.mol))
    read = ElectronState.of_molecule(joined.mol)
    assert (joined.nonbonding, joined.valence, joined.bond_sums, joined.elements, joined.configured) == \
        (read.nonbonding, read.valence, read.bond_sums, read.elements, read.configured)
    assert joined.bond_framework() == read.bond_framework() == ElectronState(joined.mol, joined.nonbonding).bond_framework()


def test_a_species_holds_unused_valence_electrons_as_pairs():
    """A lone magnesium atom holds its two valence electrons as a pair (3s2) and dichlorocarbene
    is a singlet (both memory, textbook), while RDKit's SMILES reader gives each two radical
    electrons; a methyl radical keeps its one. The starting state counts unpaired electrons as
    every derived state does, N mod 2, so no figure draws two dots for a pair."""
    text = ('species metal = "[Mg:1]"\nspecies carbene = "Cl[C:2]Cl"\nspecies radical = "[CH3:3]"\n'
            'species nitrogen = "[N:4]"\n')
    trace, _ = check_text(text)
    state = trace.initial
    read = {a.GetAtomMapNum(): a.GetNumRadicalElectrons() for a in state.mol.GetAtoms() if a.GetAtomMapNum()}
    assert read == {1: 0, 2: 0, 3: 1, 4: 1}
    assert all(state.mol.GetAtomWithIdx(i).GetNumRadicalElectrons() == n % 2 for i, n in enumerate(state.nonbonding))


def test_bonds_after_a_step_are_the_bonds_rdkit_lists():
    # RDKit as judge: the bonds a step leaves, worked out from the bonds before it and its change
    # (what drawing reads instead of asking RDKit bond by bond), are the state's own Mol's bonds
    # in RDKit's index order, over every step of the gallery, which forms, breaks and reorders
    # bonds (single and double, rings closed and opened).
    from pathlib import Path
    from arrows.electrons import bonds_after
    from arrows.rdkit_io import bond_list
    steps = 0
    for path in sorted((Path(__file__).resolve().parents[1] / "gallery").glob("*.mech")):
        trace, _ = check_text(path.read_text())
        for st in trace.steps:
            if st.after is not None:
                assert bonds_after(bond_list(st.before.mol), st.change, st.after.mol) == bond_list(st.after.mol)
                steps += 1
    assert steps > 50


def _hint(text: str, code: str) -> str:
    _, diags = check_text(text)
    found = [d for d in diags if d.code == code]
    assert found, [d.to_text() for d in diags]
    return found[0].hint


def test_an_overfull_atom_with_no_bond_left_alone_is_told_of_a_multiple_bond_it_has():
    """An iminium carbon given a lone pair while its C=N is made triple: no C=O anywhere, so the
    hint names the atom's own C1=N3 (it said `C=O -> O`, a bond the molecule lacks)."""
    hint = _hint('species iminium = "C[NH+:3]=[CH:1]c1ccccc1"\nstep "s"\n'
                 '    N3-H -> N3#C1\n    C1-H -> C1\nend\n', "AR301")
    assert "`C1=N3 -> N3`" in hint and "C=O" not in hint


def test_an_overfull_atom_with_no_bond_to_name_is_told_so_without_a_false_example():
    """An enol's carbinol carbon (C6) drawn forming the C-C bond its CH2 end (C5) should form
    (the enol adds through its CH2 end to the iminium carbon, common practice): every bond to C6
    is already changed or is a C-C bond, so the hint names none; it once said `C=O -> O`."""
    hint = _hint('species enol = "[CH2:5]=[C:6]([OH:7])C"\nspecies iminium = "C[N+:3](C)=[CH2:1]"\n'
                 'step "s"\n    C5=C6 -> C6-C1\n    C1=N3 -> N3\n    :O7 -> C6=O7\nend\n', "AR301")
    assert "C=O" not in hint and "C6" in hint and "end elsewhere" in hint


@pytest.mark.parametrize("species, named, unwritable", [
    ("C=[CH:1]C", "pi bond to C(atom 1)", "`C1=C(atom 1) -> C(atom 1)`"),            # pi bond
    ("C[CH2:1]Br", "leaving group, Br(atom 3)", "`C1-Br(atom 3) -> Br(atom 3)`"),  # leaving group
])
def test_a_room_making_move_is_not_written_with_an_unmapped_atom(species, named, unwritable):
    """Hydroxide added to a carbon that keeps all its bonds: the bond that would make room goes to
    an atom with no map number, which a move cannot name (the hint once wrote `unwritable`), so
    the hint says that atom needs one."""
    hint = _hint(f'species s = "{species}"\nspecies hydroxide = "[OH-:5]"\nstep "s"\n    :O5 -> C1\nend\n',
                 "AR301")
    assert named in hint and "needs a map number" in hint and unwritable not in hint


def test_a_room_making_move_names_a_mapped_neighbour_first():
    """Of two pi bonds, the one to a mapped atom is written as a move (allene, hydroxide on C1)."""
    hint = _hint('species allene = "C=[C:1]=[CH2:2]"\nspecies hydroxide = "[OH-:5]"\nstep "s"\n'
                 '    :O5 -> C1\nend\n', "AR301")
    assert "`C1=C2 -> C2`" in hint


@pytest.mark.parametrize("smiles, says, not_says", [
    # Five bonds on nitrogen: the hint speaks of N (an ammonium has four, an amine three; the
    # octet, common practice), not of a carbanion, as it once did for every element.
    ("C[N:1](C)(C)(C)C", ("[NH2] two", "at most four bonds as an ammonium [N+]", "three as a neutral amine"),
     ("[C-]", "[CH3]")),
    ("C[N+:1](C)(C)(C)C", ("ammonium [N+]",), ("[C-]",)),
    ("C[O:1](C)(C)C", ("at most three bonds as an oxonium [O+]",), ("[C-]",)),
    ("CS(C)(C)(C)(C)(C)C", ("[SH] one", "RDKit allows a neutral S a valence of 2, 4 or 6"), ("[C-]",)),
    ("CC(C)(C)(C)C", ("[CH3] three, [C] none", "a carbanion [C-] has at most three bonds"), ()),   # carbon kept
])
def test_an_atom_over_its_valence_is_told_the_limits_of_its_own_element(smiles, says, not_says):
    hint = _hint(f'species a = "{smiles}"\n', "AR102")
    assert all(s in hint for s in says) and not any(s in hint for s in not_says), hint


def test_an_element_mismatch_points_at_the_numbering():
    """`C3` written for atom 3, an oxygen (a numbering slip): the hint says how to check the
    numbers, not only to write O3, which may be just as wrong."""
    from arrows import check_text
    text = 'species e = "[CH3:1][CH2:2][O:3][CH3:4]"\nspecies b = "[OH-:5]"\nstep "x"\n    :O5 -> H(C3)\n    C3-H -> C3\nend\n'
    _, diags = check_text(text, "numbers.mech")
    found = [d for d in diags if d.code == "AR105"]
    assert found and "arrows number" in found[0].hint
