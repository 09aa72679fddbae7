"""`arrows closures`: closures that cannot form are left out, products the base pulls on rank first,
and symmetry folds only pairs that one symmetry of the molecule maps onto each other.

Sources, named beside each check: common practice (a benzene ring is not bridged by a closure; no
closure makes a trans-cycloalkene or cycloalkyne below eight atoms, memory); Bredt's rule (no
C=C at the bridgehead of a small bridged bicycle); textbook outcomes (Robinson annulation, the
Dieckmann condensation, memory). RDKit judges structure: canonical SMILES, ring membership, its
own bridgehead atoms (rdMolDescriptors.CalcNumBridgeheadAtoms) and its own automorphisms.
"""
import json

import pytest
from click.testing import CliRunner
from rdkit import Chem
from rdkit.Chem import rdMolDescriptors
from rdkit.Chem.rdMolDescriptors import CalcMolFormula

from arrows.cli import cli


def closures(smiles: str, *extra) -> dict:
    result = CliRunner().invoke(cli, ["closures", smiles, "--format", "json", *extra])
    assert result.exit_code == 0, result.output
    return json.loads(result.output)


def canonical(smiles: str) -> str:
    return Chem.MolToSmiles(Chem.MolFromSmiles(smiles))


def arene_bridged(smiles: str) -> bool:
    """RDKit's rings: a ring that takes two or more bonds of an aromatic ring bridges it."""
    mol = Chem.MolFromSmiles(smiles)
    rings = [set(r) for r in mol.GetRingInfo().BondRings()]
    arenes = [r for r in rings if all(mol.GetBondWithIdx(i).GetIsAromatic() for i in r)]
    return any(len(r & a) >= 2 for r in rings for a in arenes if r != a)


def bridgehead_alkene(smiles: str) -> bool:
    """A non-aromatic double bond at one of RDKit's bridgehead atoms."""
    mol = Chem.MolFromSmiles(smiles)
    heads: list[int] = []
    rdMolDescriptors.CalcNumBridgeheadAtoms(mol, heads)
    return any(b.GetBondType() == Chem.BondType.DOUBLE and {b.GetBeginAtomIdx(), b.GetEndAtomIdx()} & set(heads)
               for b in mol.GetBonds())


def ring_with(smiles: str, bond_type: Chem.BondType) -> bool:
    mol = Chem.MolFromSmiles(smiles)
    return any(b.GetBondType() == bond_type and b.IsInRing() for b in mol.GetBonds())


@pytest.mark.parametrize("smiles", ["O=Cc1cccc(CC(C)=O)c1", "OCc1ccc(CBr)cc1"])
def test_no_closure_bridges_a_benzene_ring(smiles):
    """Common practice: a closure across the meta or para positions of a benzene ring (a
    [3]metacyclophane, a para-bridged ether) is not made; it is left out, with the reason. Both
    used to be listed favoured, the metacyclophane first."""
    data = closures(smiles, "--condense")
    assert not any(arene_bridged(r["product"]) for r in data["closures"] if r["product"])
    assert data["left_out"] and all("cyclophane" in r["reason"] for r in data["left_out"])


def test_a_ring_fused_to_a_benzene_ring_is_still_listed():
    """Common practice: a ring fused at the ortho positions (one bond of the arene) closes, as in
    every benzannulation by an aldol; RDKit finds the arene fused, not bridged."""
    rows = closures("O=Cc1ccccc1CC(C)=O", "--condense")["closures"]
    assert rows[0]["ring_size"] == 6 and not arene_bridged(rows[0]["product"])


@pytest.mark.parametrize("smiles", ["CC(=O)CC/C=C/C=O", "OC/C=C/CC=O"])
def test_no_new_ring_holds_a_double_bond_written_e(smiles):
    """Common practice (memory): trans-cycloalkenes below eight atoms are not formed. The only C=C
    of these substrates is written E, so no listed product may hold a C=C in a ring (RDKit); the
    closures onto the aldehyde are left out. They were listed favoured, the E bond turned Z."""
    data = closures(smiles, "--condense")
    assert not any(ring_with(r["product"], Chem.BondType.DOUBLE) for r in data["closures"] if r["product"])
    assert data["left_out"] and all("trans" in r["reason"] for r in data["left_out"])


@pytest.mark.parametrize("smiles, product", [
    ("OC/C=C\\CC=O", "OC1CC=CCO1"),          # (Z)-6-hydroxyhex-4-enal: the cyclic hemiacetal
    ("CC(=O)CC/C=C\\C=O", "CC(=O)C1=CC=CC1"),  # the Z enal: aldol condensation onto the aldehyde
])
def test_the_z_twin_still_closes(smiles, product):
    """Common practice: a cis C=C sits in a five- or six-membered ring; the same substrates written
    Z keep their closure onto the aldehyde."""
    rows = closures(smiles, "--condense")["closures"]
    assert canonical(product) in {canonical(r["product"]) for r in rows if r["product"]}


def test_no_new_ring_holds_a_triple_bond():
    """Common practice (memory): cyclooctyne is the smallest isolable cycloalkyne, so
    6-hydroxyhex-4-ynal closes no six-membered lactol (it was listed favoured)."""
    data = closures("OCC#CCC=O")
    assert not any(ring_with(r["product"], Chem.BondType.TRIPLE) for r in data["closures"] if r["product"])
    assert [r["class"] for r in data["left_out"]] == ["6-exo-trig"]


def test_left_out_closures_cannot_be_written(tmp_path):
    """What is left out of the table is left out of --write and --draw too."""
    out, drawing = tmp_path / "draft.mech", tmp_path / "grid.svg"
    result = CliRunner().invoke(cli, ["closures", "OC/C=C/CC=O", "--write", str(out), "--draw", str(drawing)])
    assert result.exit_code == 2 and "0 candidate(s)" in result.output and "left out" in result.output
    assert not out.exists() and not drawing.exists()


def test_robinson_annulation_ranks_the_octalone_first():
    """Textbook Robinson annulation: 2-(3-oxobutyl)cyclohexanone closes the octalone
    4,4a,5,6,7,8-hexahydronaphthalen-2(3H)-one. The other six-membered aldol bridges the ring
    (bicyclo[3.3.1]); Bredt's rule forbids its dehydration to a bridgehead enone, which was ranked
    first. It stays an aldol (RDKit formula C10H16O2), ranked after."""
    rows = closures("O=C1CCCCC1CCC(C)=O", "--condense")["closures"]
    assert canonical(rows[0]["product"]) == canonical("O=C1C=C2CCCCC2CC1")
    assert not any(bridgehead_alkene(r["product"]) for r in rows if r["product"])
    bridged = [r for r in rows if rdMolDescriptors.CalcNumBridgeheadAtoms(Chem.MolFromSmiles(r["product"]))]
    assert bridged and all(CalcMolFormula(Chem.MolFromSmiles(r["product"])) == "C10H16O2" for r in bridged)
    assert "Bredt" in bridged[0]["reason"]


def test_wieland_miescher_ketone_gets_no_bridgehead_alkene():
    """Bredt's rule: the Wieland-Miescher ketone's further aldols would put a C=C at a bridgehead
    (RDKit's); none is listed (one used to be first)."""
    data = closures("CC12CCC(=O)C=C1CCCC2=O", "--condense")
    assert not any(bridgehead_alkene(r["product"]) for r in data["closures"] if r["product"])


@pytest.mark.parametrize("first, second", [
    # With --condense, the aldol that dehydrates (an H left on the alpha carbon) before the quaternary
    # one (common practice: the condensation drives the equilibrium): 3-isopropylcyclohex-2-enone.
    ("CC(C)C(=O)CCCC(C)=O", "CC(=O)CCCC(=O)C(C)C"),
    # Textbook Dieckmann (memory): the beta-keto ester with an H between its carbonyls, which the
    # base removes, forms: ethyl 3-methyl-2-oxocyclopentane-1-carboxylate from diethyl 2-methyladipate.
    ("CCOC(=O)C(C)CCCC(=O)OCC", "CCOC(=O)CCCC(C)C(=O)OCC"),
])
def test_the_first_candidate_does_not_depend_on_how_the_smiles_is_written(first, second):
    a = closures(first, "--condense")["closures"][0]["product"]
    b = closures(second, "--condense")["closures"][0]["product"]
    assert canonical(a) == canonical(b)     # RDKit canonical SMILES
    assert canonical(a) in (canonical("CC(C)C1=CC(=O)CCC1"), canonical("CCOC(=O)C1CCC(C)C1=O"))


def _automorphisms(mol: Chem.Mol) -> list[tuple[int, ...]]:
    return list(mol.GetSubstructMatches(mol, uniquify=False, maxMatches=100000))


@pytest.mark.parametrize("smiles", ["O=CCCC(O)C(O)CCC=O", "CC(=O)CC(O)C(O)CC(C)=O", "CC(=O)CCCC(C)=O"])
def test_folded_pairs_are_equivalent_under_one_symmetry(smiles):
    """RDKit's automorphisms judge: the pairs folded into one row are images of its pair under one
    automorphism of the molecule, and no two rows are. The diol-dialdehyde used to show only its
    five-membered lactol (hiding the six-membered one), the diol-dione a four-membered closure
    folded into a five-membered one."""
    data = closures(smiles)
    mol = Chem.MolFromSmiles(data["species"])
    index = {f"{a.GetSymbol()}{a.GetAtomMapNum()}": a.GetIdx() for a in mol.GetAtoms()}
    for atom in mol.GetAtoms():
        atom.SetAtomMapNum(0)
    images = _automorphisms(mol)

    def orbit(pair: tuple[int, int]) -> set[tuple[int, int]]:
        return {(m[pair[0]], m[pair[1]]) for m in images}

    orbits = []
    for row in data["closures"]:
        pair = (index[row["nucleophile"]["atom"]], index[row["electrophile"]["atom"]])
        for text in row["equivalent"]:
            nu, el = text.split(" onto ")
            assert (index[nu], index[el]) in orbit(pair), (row["class"], text)
        orbits.append(frozenset(orbit(pair)))
    assert len(set(orbits)) == len(orbits)


def test_diol_dialdehyde_lists_both_lactols():
    """Common practice: a 1,2-diol between two aldehydes closes both the five- and the
    six-membered lactol; the products differ (RDKit ring sizes)."""
    rows = closures("O=CCCC(O)C(O)CCC=O")["closures"]
    sizes = {r["ring_size"] for r in rows if r["nucleophile"]["kind"] == "oxygen"}
    assert sizes == {5, 6}


def test_a_written_enolate_is_the_only_nucleophile_and_its_carbonyl_no_electrophile():
    """Common practice: an enolate's carbonyl carbon holds its charge and accepts no nucleophile, and
    a species already an enolate needs no base (a second deprotonation would make a dianion). Its
    own C1 was offered onto its C2 carbonyl, drafted with hydroxide taking a proton from the anion."""
    data = closures("[CH2-]C(=O)CCCC(C)=O", "--condense")
    rows = data["closures"]
    assert rows and {r["nucleophile"]["atom"] for r in rows} == {"C1"}
    assert all(r["electrophile"]["atom"] != "C2" for r in rows)
    assert canonical(rows[0]["product"]) == canonical("CC1([O-])CCCC(=O)C1")   # the aldol alkoxide


def test_a_written_enolate_draft_takes_no_proton(tmp_path):
    """No step of the draft moves a proton to the base: the substrate is already the anion."""
    out = tmp_path / "draft.mech"
    result = CliRunner().invoke(cli, ["closures", "[CH2-]C(=O)CCCC(C)=O", "--condense", "--write", str(out)])
    assert result.exit_code == 0, result.output
    assert "-> H(" not in out.read_text(encoding="utf-8")
