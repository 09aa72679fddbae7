"""Independent judges of an alkene's geometry, from RDKit 3D models: what a periplanar
elimination from a configured reactant must give, and what a derived state holds. Atoms are
named by map number: C1 (loses its hydrogen), C2 (loses the group mapped 3), and the two groups
compared across the new C1=C2, mapped 5 (on C1) and 6 (on C2)."""
from __future__ import annotations

from rdkit import Chem
from rdkit.Chem import AllChem, rdMolTransforms


def periplanar(smiles: str, dihedral: float) -> str:
    """'cis' or 'trans': the groups mapped 5 (on C1) and 6 (on C2) after C1 loses its hydrogen and
    C2 its group mapped 3, the two leaving with the dihedral angle H-C1-C2-X3 given (180 anti, 0
    syn). Judge: an RDKit 3D model (ETKDG, fixed seed) of the configured reactant, turned about
    C1-C2 to that angle; the groups keep their dihedral as the two carbons flatten (common practice:
    the Newman projection of a periplanar elimination)."""
    mol = Chem.AddHs(Chem.MolFromSmiles(smiles))
    at = {a.GetAtomMapNum(): a.GetIdx() for a in mol.GetAtoms() if a.GetAtomMapNum()}
    assert AllChem.EmbedMolecule(mol, randomSeed=7) == 0
    hydrogen = next(n.GetIdx() for n in mol.GetAtomWithIdx(at[1]).GetNeighbors() if n.GetAtomicNum() == 1)
    conformer = mol.GetConformer()
    rdMolTransforms.SetDihedralDeg(conformer, hydrogen, at[1], at[2], at[3], dihedral)
    return "cis" if abs(rdMolTransforms.GetDihedralDeg(conformer, at[5], at[1], at[2], at[6])) < 90 else "trans"


def alkene_geometry(state) -> str:
    """'cis' or 'trans' for the groups mapped 5 and 6 across the double bond C1=C2 of a derived
    state. Judge: an RDKit 3D model (ETKDG) of the state's SMILES, maps kept."""
    work = Chem.RWMol(state.mol)
    Chem.SanitizeMol(work)
    piece = next(f for f in Chem.GetMolFrags(Chem.RemoveHs(work), asMols=True)
                 if {a.GetAtomMapNum() for a in f.GetAtoms()} >= {1, 2, 5, 6})
    mol = Chem.AddHs(Chem.MolFromSmiles(Chem.MolToSmiles(piece)))
    at = {a.GetAtomMapNum(): a.GetIdx() for a in mol.GetAtoms() if a.GetAtomMapNum()}
    assert AllChem.EmbedMolecule(mol, randomSeed=7) == 0
    return "cis" if abs(rdMolTransforms.GetDihedralDeg(mol.GetConformer(), at[5], at[1], at[2], at[6])) < 90 else "trans"
