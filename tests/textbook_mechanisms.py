"""Textbook mechanisms, each written here from the standard arrow-pushing account of a named
reaction (common practice in organic chemistry texts; the products are the textbook outcomes,
from memory). They reach what the gallery does not: phosphorus and magnesium, a four-membered
ring that opens again, a three-membered ring between two species, a ring that grows, a 1,2-shift,
a [3,3] shift, a four-centre addition, aromatic substitutions (electrophilic and nucleophilic),
a 1,3-dipolar cycloaddition, an enol halogenation; carbocations met by water (SN1, E1, Markovnikov
hydration), an acylium, carbonyls protonated on oxygen (acid-catalysed enolisation and aldol), a
tetrahedral intermediate from an amine, a hydride donor, a [3,3] shift through oxygen.

Each entry: (mechanism text, textbook product SMILES, drawn): `drawn` says whether the geometry
tests draw it (all of them do: the nitration's nitronium, straight until the arene bonds to its
nitrogen, gets a straight depiction and then a bent one)."""

WITTIG = '''\
species ylide = "[CH2-:1][P+:2](c1ccccc1)(c1ccccc1)c1ccccc1"
species ketone = "[CH3:3][C:4](=[O:5])[CH3:6]"
step "ring closure"
    :C1 -> C4
    C4=O5 -> O5-P2
end
step "ring opening"
    C1-P2 -> C1=C4
    C4-O5 -> O5=P2
end
product "C=C(C)C.O=P(c1ccccc1)(c1ccccc1)c1ccccc1"
'''

BROMINATION = '''\
species alkene = "[CH:1]1=[CH:2]CCCC1"
species bromine = "[Br:3][Br:4]"
step "bromonium ion"
    C1=C2 -> C1-Br3
    :Br3 -> C2
    Br3-Br4 -> Br4
end
step "anti opening"
    :Br4 -> C1
    Br3-C1 -> Br3
end
product "BrC1CCCCC1Br"
'''

# Baeyer-Villiger oxidation of cyclohexanone: the Criegee adduct, then C2 migrates to O13 as the
# O-O bond breaks (the lactone is left protonated; acetate takes the proton in a later step).
RING_EXPANSION = '''\
species ketone = "[O:20]=[C:1]1[CH2:2]CCCC1"
species peracid = "C[C:10](=[O:11])[O:12][O:13][H:14]"
step "addition"
    :O13 -> C1
    C1=O20 -> O20
end
step "migration"
    C1-C2 -> C2-O13
    O13-O12 -> O12
    :O20 -> C1=O20
end
product "O=C1CCCCC[OH+]1.CC(=O)[O-]"
'''

PINACOL = '''\
species diol = "C[C:1]([CH3:4])([OH:2])[C:3](C)(C)[OH:5]"
species acid = "[OH3+:6]"
step "protonation" reversible
    :O5 -> H(O6)
    O6-H -> O6
end
step "ionisation"
    C3-O5 -> O5
    releases O5
end
step "methyl shift"
    C1-C4 -> C3-C4
end
step "deprotonation"
    :O6 -> H(O2)
    O2-H -> C1=O2
end
product "CC(=O)C(C)(C)C"
'''

COPE = '''\
species diene = "[CH2:1]=[CH:2][CH2:3][CH2:4][CH:5]=[CH2:6]"
step "[3,3] shift"
    C1=C2 -> C1-C6
    C3-C4 -> C2=C3
    C5=C6 -> C4=C5
end
product "C=CCCC=C"
'''

GRIGNARD = '''\
species grignard = "[CH3:1][Mg:2][Br:3]"
species aldehyde = "[CH3:4][CH:5]=[O:6]"
step "addition"
    C1-Mg2 -> C1-C5
    C5=O6 -> O6
end
product "CC(C)[O-].Br[Mg+]"
'''

HYDROBORATION = '''\
species alkene = "C[CH:1]=[CH2:2]"
species borane = "[BH3:3]"
step "concerted addition"
    C1=C2 -> C2-B3
    B3-H -> C1-H(B3)
end
product "CCCB"
'''

FISCHER_ESTERIFICATION = '''\
species acid = "C[C:1](=[O:2])[OH:3]"
species catalyst = "[OH3+:4]"
species methanol = "C[OH:5]"
step "protonation" reversible
    :O2 -> H(O4)
    O4-H -> O4
end
step "addition" reversible
    :O5 -> C1
    C1=O2 -> O2
end
step "proton shuttle" reversible
    :O3 -> H(O5)
    O5-H -> O5
end
step "loss of water" reversible
    :O2 -> C1=O2
    C1-O3 -> O3
    releases O3
end
step "deprotonation" reversible
    :O4 -> H(O2)
    O2-H -> O2
end
product "COC(C)=O"
'''

NITRATION = '''\
species benzene = "[cH:1]1[cH:2]ccc[cH:6]1"
species nitronium = "[O:7]=[N+:8]=[O:9]"
species base = "[OH2:10]"
step "attack"
    C1=C2 -> C1-N8
    N8=O7 -> O7
end
step "rearomatisation"
    :O10 -> H(C1)
    C1-H -> C1=C2
end
product "O=[N+]([O-])c1ccccc1"
'''

# SNAr: methoxide adds to 4-fluoronitrobenzene (the Meisenheimer complex, charge on the nitro
# group), then fluoride leaves.
SNAR = '''\
species arene = "[F:1][c:2]1[cH:3][cH:4][c:5]([N+:6](=[O:7])[O-:8])[cH:9][cH:10]1"
species nucleophile = "C[O-:11]"
step "addition"
    :O11 -> C2
    C2=C3 -> C3=C4
    C4=C5 -> C5=N6
    N6=O7 -> O7
end
step "elimination"
    :O7 -> N6=O7
    C5=N6 -> C4=C5
    C3=C4 -> C2=C3
    C2-F1 -> F1
    releases F1
end
product "COc1ccc([N+](=O)[O-])cc1"
'''

# Ozonolysis, first step: ozone adds to ethene as a 1,3-dipole (the primary ozonide).
OZONE_CYCLOADDITION = '''\
species ozone = "[O:1]=[O+:2][O-:3]"
species ethene = "[CH2:4]=[CH2:5]"
step "1,3-dipolar cycloaddition"
    :O3 -> C4
    C4=C5 -> C5-O1
    O1=O2 -> O2
end
product "C1COOO1"
'''

# Acid-catalysed alpha-bromination of acetone, from the enol.
ENOL_BROMINATION = '''\
species enol = "[CH2:1]=[C:2](C)[OH:3]"
species bromine = "[Br:4][Br:5]"
step "attack on bromine"
    C1=C2 -> C1-Br4
    :O3 -> C2=O3
    Br4-Br5 -> Br5
end
step "deprotonation"
    :Br5 -> H(O3)
    O3-H -> O3
end
product "CC(=O)CBr.Br"
'''

# SN1: ionisation of tert-butyl bromide, capture by water, proton transfer to water.
SN1_HYDROLYSIS = '''\
species substrate = "C[C:1](C)(C)[Br:2]"
species water = "[OH2:3]"
species water_2 = "[OH2:4]"
step "ionisation" under "slow"
    C1-Br2 -> Br2
end
step "capture"
    :O3 -> C1
end
step "proton transfer"
    :O4 -> H(O3)
    O3-H -> O3
end
product "CC(C)(C)O.[Br-].[OH3+]"
'''

# E1: the alcohol protonated, water leaves, water takes a beta proton (Zaitsev alkene).
E1_DEHYDRATION = '''\
species alcohol = "C[CH2:5][C:1](C)(C)[OH:2]"
species acid = "[OH3+:3]"
step "protonation"
    :O2 -> H(O3)
    O3-H -> O3
end
step "loss of water"
    C1-O2 -> O2
end
step "deprotonation"
    :O3 -> H(C5)
    C5-H -> C1=C5
end
product "CC=C(C)C.O.[OH3+]"
'''

# Friedel-Crafts acylation: an acylium attacks benzene; chloride restores the ring.
FRIEDEL_CRAFTS_ACYLATION = '''\
species benzene = "[cH:1]1[cH:2][cH:3][cH:4][cH:5][cH:6]1"
species acylium = "C[C:7]#[O+:8]"
species base = "[Cl-:9]"
step "attack"
    C1=C2 -> C1-C7
    C7#O8 -> O8
end
step "rearomatisation"
    :Cl9 -> H(C1)
    C1-H -> C1=C2
end
product "CC(=O)c1ccccc1.Cl"
'''

# Acid-catalysed enolisation of acetone: O-protonation, then water takes an alpha proton.
ACID_ENOLISATION = '''\
species acetone = "[CH3:1][C:2](=[O:3])C"
species acid = "[OH3+:4]"
species water = "[OH2:5]"
step "protonation"
    :O3 -> H(O4)
    O4-H -> O4
end
step "deprotonation"
    :O5 -> H(C1)
    C1-H -> C1=C2
    C2=O3 -> O3
end
product "C=C(C)O.[OH3+].O"
'''

# Aminolysis of an ester: addition, proton transfer, loss of methoxide. (Its tetrahedral
# intermediate once wrote H2N+ over the O- label beside it.)
AMINOLYSIS = '''\
species ester = "C[C:1](=[O:2])[O:3]C"
species amine = "[NH3:4]"
species amine_2 = "[NH3:5]"
step "addition"
    :N4 -> C1
    C1=O2 -> O2
end
step "proton transfer"
    :N5 -> H(N4)
    N4-H -> N4
end
step "elimination"
    :O2 -> C1=O2
    C1-O3 -> O3
end
product "CC(N)=O.C[O-].[NH4+]"
'''

# Claisen rearrangement of allyl vinyl ether, a [3,3] shift.
CLAISEN_REARRANGEMENT = '''\
species ether = "[CH2:1]=[CH:2][O:3][CH2:4][CH:5]=[CH2:6]"
step "[3,3] shift" over "heat"
    C1=C2 -> C1-C6
    O3-C4 -> C2=O3
    C5=C6 -> C4=C5
end
product "C=CCCC=O"
'''

# Markovnikov hydration of an alkene: protonation to the tertiary cation, water, proton transfer.
ACID_HYDRATION = '''\
species alkene = "[CH2:1]=[C:2](C)C"
species acid = "[OH3+:3]"
species water = "[OH2:4]"
step "protonation"
    C1=C2 -> C1-H(O3)
    O3-H -> O3
end
step "capture"
    :O4 -> C2
end
step "deprotonation"
    :O3 -> H(O4)
    O4-H -> O4
end
product "CC(C)(C)O.[OH3+]"
'''

# Hydride from AlH4- adds to an aldehyde carbonyl.
HYDRIDE_ADDITION = '''\
species aldehyde = "CC[CH:1]=[O:2]"
species hydride = "[AlH4-:3]"
step "hydride transfer"
    Al3-H -> C1-H(Al3)
    C1=O2 -> O2
end
product "CCC[O-].[AlH3]"
'''

# Acid-catalysed aldol addition: the enol attacks the O-protonated ketone.
ACID_ALDOL = '''\
species enol = "[CH2:1]=[C:2](C)[OH:3]"
species ketone = "[CH3:4][C:5](C)=[OH+:6]"
species water = "[OH2:7]"
step "C-C bond formation"
    C1=C2 -> C1-C5
    C5=O6 -> O6
    :O3 -> C2=O3
end
step "deprotonation"
    :O7 -> H(O3)
    O3-H -> O3
end
product "CC(=O)CC(C)(C)O.[OH3+]"
'''

# SN2 on (R)-2-bromobutane; the bromide stays in the picture. (Its product panel once drew the
# OH on top of the departed Br-.)
SN2_INVERSION = '''\
species substrate = "CC[C@@H:1](C)[Br:2]"
species base = "[OH-:3]"
step "backside attack"
    :O3 -> C1
    C1-Br2 -> Br2
end
product "CC[C@H](C)O.[Br-]"
'''

# Acid-catalysed opening of (R)-methyloxirane by methanol at the more substituted carbon.
# (The spectator water once wrote H2O into the hydronium's OH2+.)
EPOXIDE_OPENING = '''\
species epoxide = "C[C@@H:1]1[CH2:2][O:3]1"
species acid = "[OH3+:4]"
species methanol = "C[OH:5]"
species water = "[OH2:6]"
step "protonation"
    :O3 -> H(O4)
    O4-H -> O4
end
step "opening at the more substituted carbon"
    :O5 -> C1
    C1-O3 -> O3
end
step "deprotonation"
    :O6 -> H(O5)
    O5-H -> O5
end
product "COC(C)CO.[OH3+]"
'''

TEXTBOOK = {
    "wittig": (WITTIG, "C=C(C)C.O=P(c1ccccc1)(c1ccccc1)c1ccccc1", True),
    "bromination": (BROMINATION, "BrC1CCCCC1Br", True),
    "ring expansion": (RING_EXPANSION, "O=C1CCCCC[OH+]1.CC(=O)[O-]", True),
    "pinacol": (PINACOL, "CC(=O)C(C)(C)C", True),
    "cope": (COPE, "C=CCCC=C", True),
    "grignard": (GRIGNARD, "CC(C)[O-].Br[Mg+]", True),
    "hydroboration": (HYDROBORATION, "CCCB", True),
    "fischer esterification": (FISCHER_ESTERIFICATION, "COC(C)=O", True),
    "nitration": (NITRATION, "O=[N+]([O-])c1ccccc1", True),
    "snar": (SNAR, "COc1ccc([N+](=O)[O-])cc1", True),
    "ozone cycloaddition": (OZONE_CYCLOADDITION, "C1COOO1", True),
    "enol bromination": (ENOL_BROMINATION, "CC(=O)CBr.Br", True),
    "sn1 hydrolysis": (SN1_HYDROLYSIS, "CC(C)(C)O.[Br-].[OH3+]", True),
    "e1 dehydration": (E1_DEHYDRATION, "CC=C(C)C.O.[OH3+]", True),
    "friedel-crafts acylation": (FRIEDEL_CRAFTS_ACYLATION, "CC(=O)c1ccccc1.Cl", True),
    "acid enolisation": (ACID_ENOLISATION, "C=C(C)O.[OH3+]", True),
    "aminolysis": (AMINOLYSIS, "CC(N)=O.C[O-].[NH4+]", True),
    "claisen rearrangement": (CLAISEN_REARRANGEMENT, "C=CCCC=O", True),
    "acid hydration": (ACID_HYDRATION, "CC(C)(C)O.[OH3+]", True),
    "hydride addition": (HYDRIDE_ADDITION, "CCC[O-].[AlH3]", True),
    "acid aldol": (ACID_ALDOL, "CC(=O)CC(C)(C)O.[OH3+]", True),
    "sn2 inversion": (SN2_INVERSION, "CC[C@H](C)O.[Br-]", True),
    "epoxide opening": (EPOXIDE_OPENING, "CO[C@@H](C)CO.[OH3+]", True),   # (S): inversion at C1
}
