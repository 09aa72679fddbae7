"""Textbook mechanisms, each written here from the standard arrow-pushing account of a named
reaction (common practice in organic chemistry texts; the products are the textbook outcomes,
from memory). They reach what the gallery does not: phosphorus and magnesium, a four-membered
ring that opens again, a three-membered ring between two species, a ring that grows, a 1,2-shift,
a [3,3] shift, a four-centre addition, aromatic substitutions (electrophilic and nucleophilic),
a 1,3-dipolar cycloaddition, an enol halogenation.

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
}
