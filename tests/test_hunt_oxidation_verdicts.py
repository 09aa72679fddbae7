"""Oxidation mechanisms a synthetic chemist writes up in SI, and the slip `arrows check` once let
pass in one of them: hydroxide or an alkoxide displaced from an sp3 carbon in one step (an SN2 of
an alcohol, as a Kornblum oxidation drawn from benzyl alcohol in place of the bromide). Hydroxide
and alkoxides leave carbon in E1cB eliminations and tetrahedral intermediates, not in an SN2: an
alcohol is protonated, or made a sulfonate or halide, first (common practice; Clayden, from memory).
Each correct mechanism must stay clean. Mechanisms are the textbook accounts (common practice, from
memory)."""
import sys
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent))
from textbook_mechanisms import COREY_KIM, RUBOTTOM  # noqa: E402
from verdicts import at, codes, only  # noqa: E402


# --- 1. Hydroxide or an alkoxide displaced in one step (AR510) -----------------------------------
# Kornblum oxidation of benzyl bromide (Kornblum 1957; Kurti-Czako; from memory): DMSO's oxygen
# displaces bromide, triethylamine makes the sulfonium ylide, which takes the benzylic hydrogen
# round five atoms as dimethyl sulfide leaves.
KORNBLUM = '''species substrate = "c1ccc(cc1)[CH2:1]{group}"
species dmso = "[CH3:3][S+:4](C)[O-:5]"
species base = "CC[N:6](CC)CC"
step "DMSO displaces the leaving group"
    :O5 -> C1
    {leaves}
end
step "ylide formation"
    :N6 -> H(C3)
    C3-H -> C3
end
step "intramolecular elimination"
    :C3 -> H(C1)
    C1-H -> C1=O5
    O5-S4 -> S4
end
product "O=Cc1ccccc1"
'''
KORNBLUM_BROMIDE = KORNBLUM.format(group="[Br:2]", leaves="C1-Br2 -> Br2")
KORNBLUM_ALCOHOL = KORNBLUM.format(group="[OH:2]", leaves="C1-O2 -> O2")
KORNBLUM_METHYL_ETHER = KORNBLUM.format(group="[O:2]C", leaves="C1-O2 -> O2")

# Guards. An epoxide's alkoxide leaves in one step (ring strain: hydroxide opens an epoxide in base,
# Clayden, from memory); a thiolate takes the methyl of an aryl methyl ether, phenoxide (phenol 10)
# leaving (demethylation by EtSNa, Greene's Protective Groups, from memory); a tetrahedral
# intermediate pushes its methoxide out (ester hydrolysis: a C=O made, not an SN2).
EPOXIDE_OPENED = '''species epoxide = "C[CH:1]1[O:2][CH2:3]1"
species base = "[OH-:4]"
step "hydroxide opens the epoxide"
    :O4 -> C3
    C3-O2 -> O2
end
'''
ARYL_METHYL_ETHER = '''species ether = "c1ccc(cc1)[O:2][CH3:1]"
species thiolate = "CC[S-:3]"
step "the thiolate takes the methyl"
    :S3 -> C1
    C1-O2 -> O2
end
'''
ESTER_COLLAPSE = '''species ester = "C[C:1](=[O:2])[O:3]C"
species base = "[OH-:4]"
step "hydroxide adds"
    :O4 -> C1
    C1=O2 -> O2
end
step "methoxide leaves"
    :O2 -> C1=O2
    C1-O3 -> O3
end
'''


def test_hydroxide_displaced_from_an_alcohol_in_one_step_is_flagged():
    """Failed before the change: no finding (hydroxide, pKa of water 15.7, was let leave an sp3
    carbon in an SN2; only pKa 35 or more was flagged)."""
    d = only(KORNBLUM_ALCOHOL, "AR510")
    assert "O5 displaces O2 from C1 in one step" in d.message and "hydroxide" in d.message
    assert (d.loc.line, d.loc.column) == at(KORNBLUM_ALCOHOL, "C1-O2 -> O2")
    assert "protonated" in d.hint


def test_methoxide_displaced_from_an_ether_in_one_step_is_flagged():
    """Failed before the change: no finding."""
    assert codes(KORNBLUM_METHYL_ETHER) == ["AR510"]


def test_weaker_leaving_groups_and_strained_or_pushed_oxygens_stay_clean():
    """(guards) clean before and after: bromide in the Kornblum itself, an epoxide opened by
    hydroxide, phenoxide leaving a methyl group, methoxide pushed out of a tetrahedral intermediate."""
    assert codes(KORNBLUM_BROMIDE) == []
    assert codes(EPOXIDE_OPENED) == []
    assert codes(ARYL_METHYL_ETHER) == []
    assert codes(ESTER_COLLAPSE) == []


# --- 2. Correct oxidations stay clean (guards) ---------------------------------------------------
# Pinnick oxidation of propanal (Lindgren-Nilsson, Pinnick; Kurti-Czako; from memory): chlorous acid
# (written charge-separated, as RDKit holds it) protonates the aldehyde, chlorite adds, the chlorite
# ester fragments round five atoms to the acid and HOCl, which 2-methylbut-2-ene takes up.
PINNICK = '''species aldehyde = "CC[CH:1]=[O:2]"
species chlorous = "[OH:3][Cl+:4][O-:5]"
species scavenger = "C[C:6](C)=[CH:7]C"
step "chlorous acid protonates the aldehyde" reversible
    :O2 -> H(O3)
    O3-H -> O3
end
step "chlorite adds"
    :O3 -> C1
    C1=O2 -> O2
end
step "fragmentation: HOCl leaves"
    :O5 -> H(C1)
    C1-H -> C1=O3
    O3-Cl4 -> Cl4
    expect "CCC(=O)O"
end
step "the alkene takes Cl from HOCl"
    C6=C7 -> C7-Cl4
    Cl4-O5 -> O5
end
step "hydroxide caught by the cation"
    :O5 -> C6
end
product "CCC(=O)O"
'''

# TEMPO (oxoammonium) oxidation in base (Semmelhack; Bobbitt; Kurti-Czako; from memory): the
# alcohol adds to the oxoammonium nitrogen, bicarbonate takes the O-H proton, and the N-O- oxygen
# takes the carbinol hydrogen round five atoms as the N-O bond breaks.
TEMPO = '''species oxoammonium = "CC1(C)CCCC(C)(C)[N+:1]1=[O:2]"
species alcohol = "CC[CH2:3][OH:4]"
species bicarbonate = "O[C:5](=O)[O-:6]"
step "the alcohol adds to the oxoammonium nitrogen" reversible
    :O4 -> N1
    N1=O2 -> O2
end
step "bicarbonate takes the O-H proton" reversible
    :O6 -> H(O4)
    O4-H -> O4
end
step "elimination round five atoms"
    :O2 -> H(C3)
    C3-H -> C3=O4
    O4-N1 -> N1
end
product "CCC=O"
'''

# Criegee glycol cleavage by lead tetraacetate (Criegee 1931; Kurti-Czako; from memory): each OH
# exchanges onto lead, acetate taking its proton, and the cyclic plumbate ester fragments round
# five atoms (lead(IV) to lead(II)): hexanedial.
CRIEGEE_GLYCOL = '''species diol = "[OH:1][C@H:2]1CCCC[C@@H:3]1[OH:4]"
species lead = "CC(=O)[O:10][Pb:5]([O:11]C(C)=O)([O:12]C(C)=O)[O:13]C(C)=O"
step "the first OH adds, acetate leaves"
    :O1 -> Pb5
    Pb5-O10 -> O10
end
step "acetate takes the proton"
    :O10 -> H(O1)
    O1-H -> O1
end
step "the second OH closes the plumbate ester, acetate leaves"
    :O4 -> Pb5
    Pb5-O11 -> O11
end
step "acetate takes the proton"
    :O11 -> H(O4)
    O4-H -> O4
end
step "fragmentation round five atoms"
    O1-Pb5 -> C2=O1
    C2-C3 -> C3=O4
    O4-Pb5 -> Pb5
end
product "O=CCCCCC=O"
'''


def test_correct_oxidations_stay_clean():
    """(guards) clean before and after."""
    for text in (KORNBLUM_BROMIDE, PINNICK, TEMPO, CRIEGEE_GLYCOL, RUBOTTOM, COREY_KIM):
        assert codes(text) == [], text.splitlines()[0]


# --- 3. The S-CH3 of a sulfonium that bears O, N or a halogen is unjudged (AR508) ----------------
# Pfitzner-Moffatt oxidation of propan-2-ol (Pfitzner & Moffatt 1963; Kurti-Czako; from memory):
# phosphoric acid protonates DCC, DMSO's oxygen adds to the carbodiimide carbon, the alcohol
# displaces the isourea at sulfur, and pyridine makes the ylide of the alkoxysulfonium ion, which
# takes the carbinol hydrogen round five atoms. A mild amine makes that ylide in the Swern, Moffatt
# and Parikh-Doering oxidations (common practice): the O on S+ makes the C-H more acidic than
# trimethylsulfonium's ~18 (memory), by how much no measured value says, so it is left unjudged.
MOFFATT = '''species dcc = "C1CCC(CC1)[N:20]=[C:21]=[N:22]C1CCCCC1"
species acid = "[OH:30]P(=O)(O)O"
species dmso = "[CH3:1][S+:2](C)[O-:3]"
species alcohol = "C[CH:10](C)[OH:11]"
species base = "c1cc[n:12]cc1"
species base_2 = "c1cc[n:13]cc1"
step "DCC protonated" reversible
    :N20 -> H(O30)
    O30-H -> O30
end
step "DMSO adds to the carbodiimide carbon"
    :O3 -> C21
    C21=N20 -> N20
end
step "the alcohol displaces the isourea at sulfur"
    :O11 -> S2
    S2-O3 -> O3
end
step "pyridine takes the O-H proton"
    :N12 -> H(O11)
    O11-H -> O11
end
step "the urea takes its proton"
    :O3 -> C21=O3
    C21=N22 -> N22-H(N12)
    N12-H -> N12
end
step "ylide formation"
    :N13 -> H(C1)
    C1-H -> C1
    expect "[CH2-][S+](C)OC(C)C"
end
step "intramolecular elimination"
    :C1 -> H(C10)
    C10-H -> C10=O11
    O11-S2 -> S2
end
product "CC(C)=O.CSC"
'''

# A C-H beside an S+ that bears no heteroatom, taken by pyridine (pyridinium 5.2, textbook aqueous,
# memory): trimethylsulfonium's ~18 (memory), 13 units uphill. DMSO written charge-separated,
# S+-O-, is a sulfoxide: its C-H 35 (Bordwell, memory), not a sulfonium's 18.
YLIDE_BY_PYRIDINE = '''species sulfur = "[CH3:1]{rest}"
species base = "c1cc[n:2]cc1"
step "the base takes the S-methyl proton"
    :N2 -> H(C1)
    C1-H -> C1
end
'''


def test_alkoxysulfonium_ylide_made_by_pyridine_is_not_judged():
    """Failed before the change: AR508, pyridine 13 units uphill of a C-H read as
    trimethylsulfonium's ~18."""
    assert codes(MOFFATT) == []


def test_heteroatom_bearing_sulfonium_c_h_has_no_table_value():
    """Failed before the change: each read as 'a C-H beside a sulfonium' (~18). Chloro- (Corey-Kim),
    acyloxy- (Moffatt's isourea adduct, an acetoxysulfonium) and succinimidosulfonium ions."""
    from rdkit import Chem
    from arrows.judgement.acidity import acidity_of, perceived
    for smiles in ("C[S+](C)Cl", "C[S+](C)OC(C)=O", "C[S+](C)OC(C)C", "C[S+](C)N1C(=O)CCC1=O"):
        assert acidity_of(perceived(Chem.MolFromSmiles(smiles)), 0) is None, smiles


def test_trimethylsulfonium_with_a_weak_base_still_warns():
    """(guard, passes before and after) trimethylsulfonium's C-H (~18) taken by pyridine."""
    d = only(YLIDE_BY_PYRIDINE.format(rest="[S+](C)C"), "AR508")
    assert "a C-H beside a sulfonium (~18)" in d.message


def test_dmso_written_charge_separated_is_read_as_a_sulfoxide():
    """Failed before the change on its value: AR508 all the same, but DMSO's C-H read as a
    sulfonium's ~18; now a sulfoxide's ~35, as written S=O."""
    d = only(YLIDE_BY_PYRIDINE.format(rest="[S+](C)[O-]"), "AR508")
    assert "a C-H beside a sulfoxide (~35)" in d.message


# --- 4. AR533 names only the heteroatom the alkene bore before the step -------------------------
# A plain alkene (2-methylbut-2-ene) bonding to the oxygen of HOCl, chloride leaving: C7 bears no
# O before the step, so no enol ether is bonded at its wrong carbon. Before the change AR533 read
# the incoming O5 as the alkene's own ("O5 bonds to C7, the carbon that bears O5").
ALKENE_ON_HOCL_OXYGEN = PINNICK.replace("    C6=C7 -> C7-Cl4\n    Cl4-O5 -> O5\n",
                                        "    C6=C7 -> C7-O5\n    Cl4-O5 -> Cl4\n").replace(":O5 -> C6", ":Cl4 -> C6")
# Rubottom oxidation drawn stepwise at the wrong carbon (Rubottom 1974; from memory): the silyl enol
# ether bonds to the peracid's O at C3, the carbon that bears O2 (common practice: at C4).
RUBOTTOM_WRONG_CARBON = '''species enol_ether = "C[Si:1](C)(C)[O:2][C:3]1=[CH:4]CCCC1"
species peracid = "Clc1cccc(c1)[C:5](=[O:6])[O:7][O:8][H:9]"
step "the enol ether attacks the peracid oxygen"
    C3=C4 -> C3-O8
    O8-O7 -> O7
end
'''


def test_incoming_oxygen_is_not_read_as_the_alkenes_own():
    """Failed before the change: AR533 'O5 bonds to C7, the carbon that bears O5'. The slip is
    AR539's (below)."""
    assert ALKENE_ON_HOCL_OXYGEN != PINNICK
    assert "AR533" not in codes(ALKENE_ON_HOCL_OXYGEN)


def test_enol_ether_bonded_at_its_oxygen_bearing_carbon_still_warns():
    """(guard, passes before and after) the silyl enol ether's own O2 is named."""
    d = only(RUBOTTOM_WRONG_CARBON, "AR533")
    assert "O8 bonds to C3, the carbon that bears O2" in d.message


# --- 5. A carbon nucleophile on the oxygen of HOCl (AR539) ---------------------------------------
# The O-Cl bond's electrophilic end is Cl, the less electronegative atom (Pauling O 3.44, Cl 3.16;
# memory): the Pinnick's scavenger takes Cl (common practice, from memory). An enone's epoxidation
# by hypochlorite closes the enolate onto its own O-Cl oxygen, chloride leaving (the Weitz-Scheffer
# route, as with hydroperoxide; from memory): a ring closure, not judged.
ENONE_EPOXIDATION_BY_HYPOCHLORITE = '''species enone = "C[C:1](=[O:2])[CH:3]=[CH:4]C"
species hypochlorite = "[O-:5][Cl:6]"
step "hypochlorite adds"
    :O5 -> C4
    C3=C4 -> C1=C3
    C1=O2 -> O2
end
step "the enolate closes onto O5, chloride leaves"
    :O2 -> C1=O2
    C1=C3 -> C3-O5
    O5-Cl6 -> Cl6
end
product "CC(=O)C1OC1C"
'''


def test_alkene_bonded_to_the_oxygen_of_hocl_is_flagged():
    """Failed before the change: AR533 for the wrong reason (section 4), then nothing."""
    d = only(ALKENE_ON_HOCL_OXYGEN, "AR539")
    assert "C7 bonds to O5 and the pair of O5-Cl4 goes to Cl4" in d.message
    assert (d.loc.line, d.loc.column) == at(ALKENE_ON_HOCL_OXYGEN, "C6=C7 -> C7-O5")
    assert "`C6=C7 -> C7-Cl4`" in d.hint


def test_enolate_closing_onto_its_own_hypochlorite_oxygen_is_not_judged():
    """(guard, passes before and after) the epoxide ring closure."""
    assert "AR539" not in codes(ENONE_EPOXIDATION_BY_HYPOCHLORITE)
