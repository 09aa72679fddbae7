"""A concerted elimination across a ring bond whose leaving groups cannot be periplanar (AR604).

An E2 takes the hydrogen anti-periplanar to the leaving group: in a ring that means trans on the
ring (in a cyclohexane, trans-diaxial); a syn elimination in which the leaving group takes the
hydrogen itself (a Cope elimination, an ester pyrolysis) needs them cis. With both carbons
configured, which face each group stands on is read off an RDKit 3D model of the molecule (each
group's side of the plane through its carbon and that carbon's ring neighbours), so no convention of
tags and neighbour order is ours.
(Common practice: the menthyl chloride E2 gives only the alkene the trans-diaxial hydrogen
allows.)"""
from __future__ import annotations

from typing import Iterator, Optional

from rdkit import Chem

from ..configuration import concerted_eliminations
from ..diagnostics import Diagnostic
from ..electrons import pair
from ..trace import StepTrace
from . import Check

_RING_SIZES = range(5, 8)   # rings whose bonds cannot turn a group anti from the cis face


class RingEliminationGeometry(Check):
    name = "ring eliminations"
    codes = ("AR604",)

    def step(self, st: StepTrace, context) -> Iterator[Diagnostic]:
        if st.after is None or not st.before.configured:
            return
        for a, b, p, q, syn in _ring_eliminations(st):
            cis = _same_face(st.before.mol, a, b, p, q)
            if cis is None or cis == syn:
                continue
            label = st.before.label
            kind = "syn" if syn else "anti"
            need, found = ("cis", "trans") if syn else ("trans", "cis")
            yield Diagnostic(
                "AR604", f"{label(p)} and {label(q)} leave {label(a)} and {label(b)} of a ring {found} to each other: "
                f"a concerted {kind} elimination needs them {need} on the ring (periplanar)",
                st.step.loc, step=st.index, atoms=(label(a), label(b)),
                hint=(("take a hydrogen trans to the leaving group (trans-diaxial in a cyclohexane), from "
                       "another neighbour if this one has none"
                       + ("; in a cyclopentane a syn E2 is known where no trans hydrogen is (March), so this "
                          "may be meant" if _ring_size(st.before.mol, a, b) == 5 else "")) if not syn else
                      "the leaving group takes a hydrogen cis to it through its cyclic transition state: "
                      "take one from the other neighbour"))


def _ring_eliminations(st: StepTrace) -> list[tuple[int, int, int, int, bool]]:
    """The step's concerted eliminations between two configured carbons (as the engine finds them
    to set the new double bond's geometry: configuration.concerted_eliminations) across a bond of
    a ring of five to seven."""
    change = st.change
    if not any(old == 1 and new == 2 for _, old, new in change.reordered):
        return []
    changes = {pair(i, j): (0, 2) for i, j in change.formed}
    changes.update({pair(i, j): (2, 0) for i, j in change.broken})
    changes.update({pair(i, j): (2 * old, 2 * new) for (i, j), old, new in change.reordered})
    found = concerted_eliminations(st.before.mol, changes)
    if not found:
        return []
    rings = Chem.Mol(st.before.mol)   # (a copy: the state's own Mol is shared)
    Chem.FastFindRings(rings)
    return [e for e in found if _in_small_ring(rings, e[0], e[1])]


def _ring_size(mol: Chem.Mol, i: int, j: int) -> int:
    """The smallest ring through the bond i-j of `mol` (0 if none)."""
    work = Chem.Mol(mol)
    Chem.FastFindRings(work)
    bond = work.GetBondBetweenAtoms(i, j)
    return min((n for n in _RING_SIZES if work.GetRingInfo().IsBondInRingOfSize(bond.GetIdx(), n)), default=0)


def _in_small_ring(mol: Chem.Mol, i: int, j: int) -> bool:
    """Whether the bond i-j of `mol` (its rings found) lies on a ring of five to seven atoms."""
    bond = mol.GetBondBetweenAtoms(i, j)
    return bond is not None and any(mol.GetRingInfo().IsBondInRingOfSize(bond.GetIdx(), n) for n in _RING_SIZES)


def _same_face(mol: Chem.Mol, a: int, b: int, p: int, q: int) -> Optional[bool]:
    """Whether p (on a) and q (on b) stand on one face of the ring through a-b, read off an RDKit
    3D model of their molecule. None where RDKit makes no model."""
    import numpy as np               # (both loaded only for a configured ring elimination: start-up)
    from rdkit.Chem import AllChem
    piece_atoms = next(f for f in Chem.GetMolFrags(mol, asMols=False, sanitizeFrags=False) if a in f)
    keep = sorted(piece_atoms)
    index = {atom: k for k, atom in enumerate(keep)}
    work = Chem.RWMol(mol)
    for atom in sorted(set(range(mol.GetNumAtoms())) - set(keep), reverse=True):
        work.RemoveAtom(atom)
    try:
        piece = work.GetMol()
        Chem.SanitizeMol(piece)
        with_h = Chem.AddHs(piece)
        if AllChem.EmbedMolecule(with_h, randomSeed=0xA5) != 0:
            return None
    except Exception:   # an odd intermediate: nothing said
        return None
    xyz = with_h.GetConformer().GetPositions()
    ring = next((r for r in with_h.GetRingInfo().AtomRings() if index[a] in r and index[b] in r
                 and len(r) in _RING_SIZES), None)
    if ring is None:
        return None
    def side(atom: int, group: int) -> float:
        # The plane through a ring carbon and its two ring neighbours parts its two other groups
        # exactly (a tetrahedral centre), whatever the conformer; the neighbours taken in the
        # ring's one cyclic order, its normal points to one face of the ring at every carbon.
        k = ring.index(index[atom])
        centre = xyz[index[atom]]
        normal = np.cross(xyz[ring[k - 1]] - centre, xyz[ring[(k + 1) % len(ring)]] - centre)
        return float(np.dot(xyz[index[group]] - centre, normal))
    return (side(a, p) > 0) == (side(b, q) > 0)
