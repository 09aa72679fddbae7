"""A ready .mech text for one candidate closure under basic conditions (hydroxide; for a closure
onto an ester, the ester's own alkoxide): forming the
nucleophile, the ring closure, the steps that finish it (collapse of an ester adduct, proton
transfers), optionally the E1cB dehydration of an aldol, and the product the moves give.

The product line is not guessed: the text is replayed and the product read from the final state,
so the skeleton passes `arrows check` whenever its moves are sound.
"""
from __future__ import annotations

from dataclasses import dataclass, field

from rdkit import Chem

from ..rdkit_io import canonical
from .closures import Closure
from .sites import (ALDEHYDE, CARBOXYLATE, CONJUGATE, DISPLACED, ENOLATE, ESTER, KETONE, NITRILE_ANION, NITROGEN,
                    OXYGEN)


@dataclass
class _Step:
    label: str
    moves: list[str]
    options: str = ""
    extra: list[str] = field(default_factory=list)


class _Writer:
    def __init__(self, mol: Chem.Mol, closure: Closure):
        self.mol, self.c = mol, closure
        self.base = max(a.GetAtomMapNum() for a in mol.GetAtoms()) + 1
        self.base_smiles, over, under = self._base()
        self.conditions = f'reversible over "{over}" under "{under}"'
        self.steps: list[_Step] = []
        self.base_is_water = False     # after the base has taken a proton (water, or the alcohol)

    def _base(self) -> tuple[str, str, str]:
        """The base's SMILES (its oxygen numbered `base`) and the conditions written over and under
        its arrow: hydroxide in water; for a closure onto an ester (a Dieckmann), the alkoxide of
        the ester's own alcohol in that alcohol, as hydroxide would saponify the ester (common
        practice: NaOEt in EtOH for an ethyl ester)."""
        el = self.c.electrophile
        if el.kind != ESTER:
            return f"[OH-:{self.base}]", "NaOH", "H2O"
        alkyl = [n for n in self.mol.GetAtomWithIdx(el.leaving_group).GetNeighbors() if n.GetIdx() != el.atom]
        if alkyl and alkyl[0].GetAtomicNum() == 6 and alkyl[0].GetDegree() == 1:
            return f"C[O-:{self.base}]", "NaOMe", "MeOH"
        return f"CC[O-:{self.base}]", "NaOEt", "EtOH"

    def _base_name(self) -> str:
        return "hydroxide" if self.base_smiles.startswith("[OH-") else "alkoxide"

    def L(self, i: int) -> str:
        atom = self.mol.GetAtomWithIdx(i)
        return f"{atom.GetSymbol()}{atom.GetAtomMapNum()}"

    @property
    def B(self) -> str:
        return f"O{self.base}"

    def bond(self, i: int, j: int) -> str:
        b = self.mol.GetBondBetweenAtoms(i, j)
        return {1: "-", 2: "=", 3: "#"}[int(b.GetBondTypeAsDouble())]

    def deprotonate(self, label: str, atom: str, into: str, extra_moves: list[str] = (), options: str = "reversible"):
        self.steps.append(_Step(label, [f":{self.B} -> H({atom})", f"{atom}-H -> {into}", *extra_moves], options))
        self.base_is_water = True

    def protonate_oxygen(self, oxygen: str) -> None:
        self.steps.append(_Step("proton transfer", [f":{oxygen} -> H({self.B})", f"{self.B}-H -> {self.B}"],
                                "reversible"))
        self.base_is_water = False

    # the nucleophile
    def partner(self) -> tuple[int, int]:
        c = self.c
        nu = c.nucleophile
        if nu.ready:
            # An enolate drawn: its own C=C, whichever carbonyl names the class.
            drawn = [p for p in nu.partners if self.mol.GetBondBetweenAtoms(nu.atom, p[0]).GetBondTypeAsDouble() == 2]
            if drawn:
                return drawn[0]
        return next((p for p in nu.partners if p[0] == c.enol_partner), nu.partners[0])

    def activate(self) -> None:
        nu = self.c.nucleophile
        x = self.L(nu.atom)
        if nu.kind in (ENOLATE, NITRILE_ANION) and not nu.ready:
            carbon, acceptor = self.partner()
            self.deprotonate("enolate formation" if nu.kind == ENOLATE else "nitrile anion", x,
                             f"{x}={self.L(carbon)}",
                             [f"{self.L(carbon)}{self.bond(carbon, acceptor)}{self.L(acceptor)} -> {self.L(acceptor)}"])
            self.steps[-1].options = self.conditions
        elif nu.kind == ENOLATE and self.mol.GetAtomWithIdx(self.partner()[1]).GetTotalNumHs():
            acceptor = self.L(self.partner()[1])
            self.deprotonate("enolate from the enol", acceptor, acceptor)
        elif nu.kind in (OXYGEN, CARBOXYLATE) and not nu.ready:
            self.deprotonate("alkoxide formation" if nu.kind == OXYGEN else "carboxylate formation", x, x)
            self.steps[-1].options = self.conditions

    def nucleophile_moves(self, y: str) -> list[str]:
        nu = self.c.nucleophile
        x = self.L(nu.atom)
        if nu.kind in (ENOLATE, NITRILE_ANION):
            carbon, acceptor = self.partner()
            if self.mol.GetAtomWithIdx(nu.atom).GetFormalCharge() < 0:     # drawn as a carbanion
                return [f":{x} -> {y}"]
            c, a = self.L(carbon), self.L(acceptor)
            restored = "#" if nu.kind == NITRILE_ANION else "="
            return [f":{a} -> {c}{restored}{a}", f"{x}={c} -> {x}-{y}"]
        return [f":{x} -> {y}"]

    # the closure and what follows it
    def close(self) -> None:
        el = self.c.electrophile
        y, w = self.L(el.atom), self.L(el.broken_partner)
        moves = self.nucleophile_moves(y)
        extra: list[str] = []
        if el.kind == CONJUGATE:
            alpha, carbon, acceptor = (self.L(i) for i in el.relay)
            order = self.bond(el.relay[1], el.relay[2])
            moves += [f"{y}={alpha} -> {alpha}={carbon}", f"{carbon}{order}{acceptor} -> {acceptor}"]
        elif el.kind in DISPLACED:
            moves += [f"{y}-{w} -> {w}"]
            if self.mol.GetAtomWithIdx(el.broken_partner).GetDegree() == 1:
                extra.append(f"releases {w}")
        else:     # a carbonyl's C=O or a nitrile's C#N
            moves += [f"{y}{self.bond(el.atom, el.broken_partner)}{w} -> {w}"]
        self.steps.append(_Step("ring closure", moves, "reversible" if el.kind not in DISPLACED else "", extra))

    def finish(self) -> None:
        el, nu = self.c.electrophile, self.c.nucleophile
        x, y, w = self.L(nu.atom), self.L(el.atom), self.L(el.broken_partner)
        if nu.kind == NITROGEN and nu.has_hydrogen:      # the ammonium formed gives its proton to the base
            self.deprotonate("deprotonation of the nitrogen", x, x)
        if el.kind == ESTER:
            lg = self.L(el.leaving_group)
            self.steps.append(_Step("loss of alkoxide", [f":{w} -> {y}={w}", f"{y}-{lg} -> {lg}"], "reversible"))
            if self.base_is_water:
                self.protonate_oxygen(lg)
        elif el.kind == CONJUGATE:
            alpha, carbon, acceptor = (self.L(i) for i in el.relay)
            restored = "#" if self.bond(el.relay[1], el.relay[2]) == "#" else "="
            if self.base_is_water:
                self.steps.append(_Step("protonation at carbon", [
                    f":{acceptor} -> {carbon}{restored}{acceptor}", f"{alpha}={carbon} -> {alpha}-H({self.B})",
                    f"{self.B}-H -> {self.B}"], "reversible"))
                self.base_is_water = False
        elif self.base_is_water and (el.kind not in DISPLACED or (
                el.bridge is not None and self.mol.GetAtomWithIdx(el.broken_partner).GetAtomicNum() in (7, 8))):
            self.protonate_oxygen(w)     # the alkoxide or amide ion an addition or a ring opening leaves

    def condense(self) -> bool:
        """E1cB dehydration of an aldol whose nucleophilic carbon still carries a hydrogen and whose
        new C=C would not be strained (Closure.driven)."""
        c = self.c
        if c.nucleophile.kind != ENOLATE or c.electrophile.kind not in (ALDEHYDE, KETONE) or self.base_is_water:
            return False
        if not c.driven or c.nucleophile.ready:
            return False
        x, y, w = self.L(c.nucleophile.atom), self.L(c.electrophile.atom), self.L(c.electrophile.broken_partner)
        carbon, acceptor = (self.L(i) for i in self.partner())
        self.deprotonate("enolate of the aldol", x, f"{x}={carbon}", [f"{carbon}={acceptor} -> {acceptor}"],
                         'reversible under "heat"')
        self.steps.append(_Step("loss of hydroxide (E1cB)", [
            f":{acceptor} -> {carbon}={acceptor}", f"{x}={carbon} -> {x}={y}", f"{y}-{w} -> {w}"],
            extra=[f"releases {w}"]))
        return True

    def text(self, title: str, species_name: str) -> str:
        smiles = Chem.MolToSmiles(self.mol, canonical=False)
        lines = [f"# {self.c.closure.name} ring closure, drafted by `arrows closures`; edit freely",
                 f'title   "{title}"', "",
                 f'species {species_name} = "{smiles}"',
                 f'species {"base" if species_name in ("hydroxide", "alkoxide") else self._base_name()} = '
                 f'"{self.base_smiles}"']
        for step in self.steps:
            lines += ["", f'step "{step.label}"' + (f" {step.options}" if step.options else "")]
            lines += [f"    {m}" for m in step.moves] + [f"    {e}" for e in step.extra] + ["end"]
        return "\n".join(lines) + "\n"


def skeleton(mol: Chem.Mol, closure: Closure, condense: bool = False, species_name: str = "substrate") -> str:
    """.mech text for `closure` in `mol` (every heavy atom must carry a map number)."""
    if any(a.GetAtomicNum() > 1 and not a.GetAtomMapNum() for a in mol.GetAtoms()):
        raise ValueError("every heavy atom needs a map number (see closures.with_atom_maps)")
    writer = _Writer(mol, closure)
    writer.activate()
    writer.close()
    writer.finish()
    condensed = condense and writer.condense()
    what = "ring closure and dehydration" if condensed else "ring closure"
    nu, el = writer.L(closure.nucleophile.atom), writer.L(closure.electrophile.atom)
    text = writer.text(f"{closure.closure.name} {what}: {nu} onto {el}", species_name)
    product = product_of(text, mol.GetAtomWithIdx(closure.nucleophile.atom).GetAtomMapNum())
    return text + ("" if product is None else f'\nproduct "{product}"\n')


def product_of(text: str, map_number: int) -> str | None:
    """Canonical SMILES of the fragment holding the atom with `map_number` after the last step, or
    None if the text does not replay."""
    fragment = product_fragment(text, map_number)
    return None if fragment is None else canonical(fragment)


def product_fragment(text: str, map_number: int) -> Chem.Mol | None:
    """The fragment (atom maps kept) holding the atom with `map_number` after the last step of a
    replayed text."""
    from ..diagnostics import MechanismError
    from ..language import parse
    from ..trace import replay
    try:
        final = replay(parse(text, "<skeleton>")).final
    except MechanismError:
        return None
    if final is None:
        return None
    atom = next(a.GetIdx() for a in final.mol.GetAtoms() if a.GetAtomMapNum() == map_number)
    return fragment_containing(final.mol, atom)


def fragment_containing(mol: Chem.Mol, atom: int) -> Chem.Mol:
    for indices, frag in zip(Chem.GetMolFrags(mol, asMols=False, sanitizeFrags=False),
                             Chem.GetMolFrags(mol, asMols=True, sanitizeFrags=False)):
        if atom in indices:
            return frag
    raise ValueError(f"no atom {atom}")
