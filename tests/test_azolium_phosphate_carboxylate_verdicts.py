"""Three gaps in the judgement closed: an imidazolium's N-H read as a pyridinium's (AR508), a
phosphate leaving an acetal carbon read by no pKa entry (AR534), and a carbon nucleophile adding
to a carboxylate's carbon unjudged (AR538). Sources are named per test; textbook values are from
memory. The tests named `..._guard` passed before these changes too."""
import pytest
from rdkit import Chem

from arrows.judgement.acidity import acidity_of, perceived
from verdicts import at, codes, findings, only


def _pka(smiles: str, atom: int):
    entry = acidity_of(perceived(Chem.MolFromSmiles(smiles)), atom)
    return None if entry is None else entry.pka


# --- 1. An imidazolium's N-H (AR508) -------------------------------------------------------------
# Aqueous pKa of the conjugate acids (memory): imidazole 7.0 and 1-methylimidazole 7.1 (Joule &
# Mills, Heterocyclic Chemistry), a histidine side chain 6.0 (Lehninger's amino acid table),
# benzimidazole 5.5 (Joule & Mills), pyridine 5.2; 1,3-dimethylimidazolium's C2-H ~23 (Amyes,
# Diver, Richard & Rivas 2004).

@pytest.mark.parametrize("smiles, atom, pka", [
    ("c1c[nH+]c[nH]1", 2, 7.0),                          # imidazolium, the charged N's proton
    ("c1c[nH+]c[nH]1", 4, 7.0),                          # ... and the other N's, across C2
    ("C[n+]1cc[nH]c1", 4, 7.0),                          # 1-methylimidazolium written with N1 charged
    ("N[C@@H](Cc1c[nH+]c[nH]1)C(=O)O", 5, 6.0),          # histidine
    ("CC(=O)N[C@@H](Cc1c[nH]c[nH+]1)C(=O)NC", 8, 6.0),   # a histidine residue, the other tautomer
    ("c1ccc2[nH+]c[nH]c2c1", 4, 5.5),                    # benzimidazolium, not an imidazolium
])
def test_an_imidazolium_n_h_has_its_own_entry(smiles, atom, pka):
    """Each was read as a pyridinium ion (5.2), or (the N-H across C2 from the charge) not at all."""
    assert _pka(smiles, atom) == pka


@pytest.mark.parametrize("smiles, atom, pka", [
    ("C[n+]1ccn(C)c1", 6, 23),    # 1,3-dimethylimidazolium's C2-H: the carbene's acid, not an N-H
    ("Cn1cc[nH+]c1", 5, 23),      # an N-H imidazolium's C2-H reads the same entry
    ("c1cc[nH+]cc1", 3, 5.2),     # pyridinium
    ("Nc1nc2[nH]c[nH+]c2c(=O)[nH]1", 6, 5.2),   # a guanine protonated at N7 (~3): no imidazolium (fused ring)
])
def test_neighbouring_entries_are_not_misread_guard(smiles, atom, pka):
    assert _pka(smiles, atom) == pka


IMIDAZOLE_ON_AN_ALCOHOL = '''species alcohol = "CC(C)(C)[OH:1]"
species base = "{base}"
step "deprotonation"
    :N2 -> H(O1)
    O1-H -> O1
end
'''


@pytest.mark.parametrize("base", [
    "[cH:3]1[nH][cH][n:2][cH]1",                           # imidazole: 18 - 7.0 = 11
    "CC(=O)N[CH](C(=O)NC)C[c:3]1[nH][cH][n:2][cH]1",       # a histidine residue: 18 - 6.0 = 12
], ids=["imidazole", "histidine"])
def test_imidazole_on_a_tertiary_alcohol_is_within_the_gap(base):
    """tert-Butanol (18) losing its proton to imidazole's N3 is 11 units uphill (a histidine's, 12):
    within the default gap of 12. Read as a pyridine (5.2), 12.8 units, it was warned."""
    assert codes(IMIDAZOLE_ON_AN_ALCOHOL.format(base=base)) == []


def test_pyridine_on_a_tertiary_alcohol_is_still_uphill_guard():
    """Pyridine (5.2) on tert-butanol (18): 12.8 units, over the gap."""
    d = only(IMIDAZOLE_ON_AN_ALCOHOL.format(base="[cH:3]1[cH][cH][n:2][cH][cH]1"), "AR508")
    assert "a pyridine (pKa of a pyridinium ion 5.2)" in d.message


# --- 2. A phosphate leaving an acetal carbon (AR534) ---------------------------------------------
# Aqueous pKa (memory): dimethyl phosphate 1.3, methyl phosphate 1.5 and 6.3 (Kumler & Eiler, J. Am.
# Chem. Soc. 1943); phosphoric acid 2.1, 7.2 and 12.3 (CRC Handbook). The table reads a phosphate's
# O-H by the O- already on its P: none ~1.5, one ~6.5, two 12.3.

@pytest.mark.parametrize("smiles, atom, pka", [
    ("COP(=O)(O)OC", 4, 1.5),        # dimethyl phosphate
    ("COP(=O)(O)O", 4, 1.5),         # methyl phosphate, first proton
    ("OP(=O)(O)O", 0, 1.5),          # phosphoric acid
    ("COP(=O)([O-])O", 5, 6.5),      # methyl phosphate, second proton
    ("OP(=O)([O-])OP(=O)([O-])OCC", 0, 6.5),   # a diphosphate's terminal O-H (ADP's, UDP's)
    ("OP(=O)([O-])[O-]", 0, 12.3),   # hydrogen phosphate
])
def test_a_phosphate_o_h_has_an_entry(smiles, atom, pka):
    """Each had no entry: a phosphate leaving, or taking a proton, was not judged."""
    assert _pka(smiles, atom) == pka


ACETAL_OPENS = '''species donor = "[O:1]1CCCC[CH:2]1[O:3]{group}"
step "the ring O pushes, the leaving group goes unprotonated"
    :O1 -> C2=O1
    C2-O3 -> O3
end
'''


@pytest.mark.parametrize("group", ["[P:4](=O)(OC)OC", "[P:4](=O)(O)OC"], ids=["dimethyl phosphate", "methyl phosphate"])
def test_a_phosphate_monoanion_leaves_an_acetal_unaided_guard(group):
    """A glycosyl phosphate triester (or a monoester's neutral form) leaves as a phosphate monoanion
    (conjugate acid ~1-2), a leaving group as good as a sulfonate's: no activation is asked for."""
    assert "AR534" not in codes(ACETAL_OPENS.format(group=group))


def test_methoxide_pushed_out_of_the_same_acetal_is_still_flagged_guard():
    """The same push with methoxide leaving (methanol ~15.5): acetals open only in acid (Clayden)."""
    d = only(ACETAL_OPENS.format(group="C"), "AR534")
    assert "methoxide" in d.message


def test_a_phosphate_dianion_pushed_out_unactivated_is_flagged():
    """A glycosyl phosphate diester anion leaving as the dianion (conjugate acid ~6.5, a poorer
    leaving group than acetate's 4.8): enzymes activate it, a glycosyltransferase's Mn2+ or Mg2+
    holding the sugar nucleotide's UDP, glycogen phosphorylase's PLP phosphate protonating its
    substrate's (Lairson, Henrissat, Davies & Withers, Annu. Rev. Biochem. 2008; memory)."""
    text = ACETAL_OPENS.format(group="[P:4](=O)([O-])OC")
    d = only(text, "AR534")
    assert (d.loc.line, d.loc.column) == at(text, "C2-O3 -> O3")
    assert "a phosphate dianion" in d.message and "~6-7" in d.message
    assert "Mg2+ or Mn2+" in d.hint and "leaves as a weaker base" in d.hint


# --- 3. A carbon nucleophile on a carboxylate's carbon (AR538) -----------------------------------
# Carboxylates are very poor electrophiles: a Grignard carboxylation stops at the carboxylate, and
# enolates, cyanide and ylides do not add to one (common practice; Clayden, memory). Organolithiums
# add to lithium carboxylates, the gem-dialkoxide giving a ketone on work-up (Jorgenson, Org. React.
# 1970; Clayden; memory).

ON_A_CARBOXYLATE = '''species nucleophile = "{nucleophile}"
species acid = "c1ccccc1[C:4](=[O:5]){salt}"
step "addition"
    {attack}
    C4=O5 -> O5
end
'''


@pytest.mark.parametrize("nucleophile, attack, says", [
    ("[CH3:1][Mg:2][Br:3]", "C1-Mg2 -> C1-C4", "a Grignard reagent"),
    ("[CH2-:1]C(=O)C", ":C1 -> C4", "other than an organolithium"),              # an enolate, on carbon
    ("[O-:3][C:2](C)=[CH2:1]", "C1=C2 -> C1-C4\n    :O3 -> C2=O3", "other than an organolithium"),   # its C=C
    ("[C-:1]#N", ":C1 -> C4", "other than an organolithium"),                     # cyanide
    ("[CH2-:1][P+](c1ccccc1)(c1ccccc1)c1ccccc1", ":C1 -> C4", "other than an organolithium"),   # an ylide
], ids=["grignard", "enolate carbanion", "enolate C=C", "cyanide", "ylide"])
@pytest.mark.parametrize("salt", ["[O-:6]", "[O:6][Li]", "[O:6][Mg]Br"], ids=["anion", "Li salt", "Mg salt"])
def test_a_carbon_nucleophile_other_than_an_organolithium_on_a_carboxylate_is_flagged(nucleophile, attack, says,
                                                                                      salt):
    text = ON_A_CARBOXYLATE.format(nucleophile=nucleophile, attack=attack, salt=salt)
    _, found = findings(text)
    assert [f.code for f in found] == ["AR538"], [f.to_text() for f in found]
    d = found[0]
    assert (d.loc.line, d.loc.column) == at(text, attack)
    assert "C1 adds to C4, a carboxylate's carbon" in d.message and says in d.message
    assert "organolithium" in d.hint


@pytest.mark.parametrize("nucleophile, attack", [
    ("CCC[CH2:1][Li:2]", "C1-Li2 -> C1-C4"),   # n-butyllithium, written with its C-Li bond
    ("[CH3-:1].[Li+]", ":C1 -> C4"),           # methyllithium as an ion pair
], ids=["C-Li", "ion pair"])
def test_an_organolithium_on_a_lithium_carboxylate_is_not_flagged_guard(nucleophile, attack):
    """The first step of a ketone synthesis from a carboxylic acid and two equivalents of RLi."""
    text = ON_A_CARBOXYLATE.format(nucleophile=nucleophile, attack=attack, salt="[O:6][Li]")
    assert "AR538" not in codes(text)


@pytest.mark.parametrize("nucleophile, attack", [
    ("[CH3:1][Na:2]", "C1-Na2 -> C1-C4"),        # methylsodium, written with its C-Na bond
    ("CCCC[CH2:1][K:2]", "C1-K2 -> C1-C4"),      # pentylpotassium
    ("[CH3-:1].[K+]", ":C1 -> C4"),              # an ion pair with K+
], ids=["C-Na", "C-K", "K+ ion pair"])
def test_an_organosodium_or_organopotassium_on_a_carboxylate_is_not_judged(nucleophile, attack):
    """Its C-metal bond is more ionic than C-Li (Pauling electronegativities: Li 0.98, Na 0.93, K 0.82)
    and the reagent more reactive than an organolithium (Schlosser, Organoalkali Chemistry, in
    Organometallics in Synthesis: A Manual; memory): the warning's ground, that only an
    organolithium adds (Jorgenson), says nothing of it. It was flagged as "a carbon nucleophile
    other than an organolithium"."""
    text = ON_A_CARBOXYLATE.format(nucleophile=nucleophile, attack=attack, salt="[O:6][Na]")
    assert "AR538" not in codes(text)


def test_an_enolate_beside_a_sodium_cation_on_a_carboxylate_is_still_flagged_guard():
    """A stabilised carbanion is no organoalkali reagent whatever its counter-ion (common practice)."""
    text = ON_A_CARBOXYLATE.format(nucleophile="[CH2-:1]C(=O)C.[Na+]", attack=":C1 -> C4", salt="[O-:6]")
    assert "other than an organolithium" in only(text, "AR538").message


@pytest.mark.parametrize("electrophile", ["c1ccccc1[C:4](=[O:5])OC", "O=[C:4]=[O:5]"], ids=["ester", "CO2"])
def test_a_grignard_on_an_ester_or_co2_is_not_flagged_guard(electrophile):
    """The carbonyl carbons a Grignard reagent does add to (Clayden, memory)."""
    text = (f'species grignard = "[CH3:1][Mg:2][Br:3]"\nspecies e = "{electrophile}"\n'
            'step "addition"\n    C1-Mg2 -> C1-C4\n    C4=O5 -> O5\nend\n')
    assert "AR538" not in codes(text)


def test_an_enol_on_oxaloacetate_s_carboxylate_names_its_ketone():
    """Citrate synthase's enol adds to oxaloacetate's ketone C=O (Berg/Stryer ch.17, memory): the
    slip that sends it to the neighbouring carboxylate is flagged, and the hint names the ketone."""
    text = '''species enol = "[CH2:1]=[C:2]([OH:3])[S:4]C"
species oaa = "[O-]C(=O)[CH2:26][C:20](=[O:21])[C:27](=[O:28])[O-]"
step "the enol adds"
    :O3 -> C2=O3
    C1=C2 -> C1-C27
    C27=O28 -> O28
end
'''
    d = only(text, "AR538")
    assert (d.loc.line, d.loc.column) == at(text, "C1=C2 -> C1-C27")
    assert "C20" in d.hint
