"""Small correct mechanisms, each with the outside source that says why it is correct. The broken
twins (test_codes.py), the CLI tests and the property tests start from them."""

# Acetic acid (pKa ~4.8) is deprotonated by hydroxide (water pKa 15.7) to acetate and water:
# references.md acidity table (memory); the arrow pattern (base lone pair to H, O-H pair to O) is
# common practice.
ACID_BASE = '''\
species acid = "[CH3:1][C:2](=[O:3])[OH:4]"
species base = "[OH-:5]"
step "deprotonation"
    :O5 -> H(O4)
    O4-H -> O4
end
product "CC(=O)[O-].O"
'''

# SN2: hydroxide attacks bromomethane from the back, bromide leaves, giving methanol (textbook SN2,
# common practice).
SN2 = '''\
species hydroxide = "[OH-:1]"
species bromomethane = "[CH3:2][Br:3]"
step "backside attack"
    :O1 -> C2
    C2-Br3 -> Br3
end
product "CO.[Br-]"
'''

# E2: hydroxide removes a beta hydrogen of bromoethane as bromide leaves, giving ethene
# (textbook E2, common practice).
E2 = '''\
species hydroxide = "[OH-:1]"
species bromoethane = "[CH3:2][CH2:3][Br:4]"
step "anti elimination"
    :O1 -> H(C2)
    C2-H -> C2=C3
    C3-Br4 -> Br4
end
product "C=C.O.[Br-]"
'''

# HBr adds to propene through the secondary cation: 2-bromopropane (Markovnikov addition,
# textbook outcome, common practice).
HBR_ADDITION = '''\
species propene = "[CH3:1][CH:2]=[CH2:3]"
species hbr = "[Br:4][H:5]"
step "protonation"
    C2=C3 -> C3-H5
    H5-Br4 -> Br4
end
step "bromide capture"
    :Br4 -> C2
end
product "CC(C)Br"
'''

# Retro-aldol of the 3-hydroxybutanal alkoxide: acetaldehyde and the acetaldehyde enolate, the
# reverse of the acetaldehyde aldol addition (references.md worked outcome; common practice).
RETRO_ALDOL = '''\
species aldolate = "[CH3:1][CH:2]([O-:3])[CH2:4][CH:5]=[O:6]"
step "retro-aldol"
    :O3 -> C2=O3
    C2-C4 -> C4=C5
    C5=O6 -> O6
end
product "CC=O.C=C[O-]"
'''

# Two methyl radicals combine to ethane, one electron from each (radical termination, textbook,
# common practice).
RADICALS = '''\
species methyl_a = "[CH3:1]"
species methyl_b = "[CH3:2]"
step "radical recombination"
    .C1 ~> C1-C2
    .C2 ~> C1-C2
end
product "CC"
'''

# The acetone enolate: carbanion and alkoxide contributors differ only in pi and lone-pair
# electrons (textbook resonance, common practice).
ENOLATE_RESONANCE = '''\
species enolate = "[CH2-:1][C:2](=[O:3])[CH3:4]"
step "enolate resonance" resonance
    :C1 -> C1=C2
    C2=O3 -> O3
    expect "C=C(C)[O-]"
end
'''

# Acetaldehyde aldol addition: the enolate adds to acetaldehyde, water protonates the alkoxide:
# 3-hydroxybutanal (references.md worked outcome, memory).
ALDOL = '''\
species enolate = "[CH2-:1][CH:2]=[O:3]"
species acetaldehyde = "[CH3:4][CH:5]=[O:6]"
step "addition"
    :C1 -> C5
    C5=O6 -> O6
end
step "proton transfer"
    uses water = "[OH2:7]"
    :O6 -> H(O7)
    O7-H -> O7
    expect "CC(O)CC=O"
end
product "CC(O)CC=O"
'''

# E1: tert-butyl bromide ionizes, bromide leaves the scheme, water removes a beta proton:
# 2-methylpropene (textbook E1, common practice).
E1 = '''\
species tbubr = "[CH3:1][C:2]([CH3:3])([CH3:4])[Br:5]"
step "ionization"
    C2-Br5 -> Br5
    releases Br5
end
step "deprotonation"
    uses water = "[OH2:6]"
    :O6 -> H(C1)
    C1-H -> C1=C2
end
product "C=C(C)C"
'''

# 4-Bromobutoxide closes tetrahydrofuran (intramolecular Williamson ether synthesis, 5-exo-tet,
# favoured by Baldwin's rules: J. E. Baldwin, J. Chem. Soc., Chem. Commun. 1976, 734, memory).
RING_CLOSURE = '''\
species bromobutoxide = "[O-:1][CH2:2][CH2:3][CH2:4][CH2:5][Br:6]"
step "ring closure"
    :O1 -> C5
    C5-Br6 -> Br6
end
'''

# Cyanide displaces bromide from bromomethane: acetonitrile (Kolbe nitrile synthesis, SN2; common
# practice).
NITRILE = '''\
species cyanide = "[C-:1]#[N:2]"
species bromomethane = "[CH3:3][Br:4]"
step "substitution"
    :C1 -> C3
    C3-Br4 -> Br4
end
product "CC#N.[Br-]"
'''

# Hydroxide and water exchange a proton (degenerate acid-base step, common practice).
PROTON_EXCHANGE = '''\
species hydroxide = "[OH-:1]"
species water = "[OH2:2]"
step "proton exchange"
    :O1 -> H(O2)
    O2-H -> O2
end
'''

# Hydroxide attacks chlorine as the Cl-Cl bond breaks: hypochlorous acid and chloride
# (hydrolysis of chlorine, common practice).
CHLORINE = '''\
species chlorine = "[Cl:1][Cl:2]"
species hydroxide = "[OH-:3]"
step "attack on chlorine"
    :O3 -> Cl1
    Cl1-Cl2 -> Cl2
end
product "OCl.[Cl-]"
'''

# Hydroxide takes a methyl group from trimethylsulfonium, dimethyl sulfide leaves (sulfonium salts
# as methylating agents, common practice).
SULFONIUM = '''\
species hydroxide = "[OH-:1]"
species trimethylsulfonium = "[CH3:2][S+:3](C)C"
step "methyl transfer"
    :O1 -> C2
    C2-S3 -> S3
end
'''

# Cannizzaro reaction, hydride-transfer step: the tetrahedral adduct of hydroxide and benzaldehyde
# gives a hydride to a second benzaldehyde, leaving benzoic acid and benzyl alkoxide (textbook
# Cannizzaro mechanism, common practice).
HYDRIDE_TRANSFER = '''\
species adduct = "[O-:1][CH:2]([OH:3])c1ccccc1"
species aldehyde = "[O:4]=[CH:5]c1ccccc1"
step "hydride transfer"
    :O1 -> C2=O1
    C2-H -> C5-H(C2)
    C5=O4 -> O4
end
product "OC(=O)c1ccccc1.[O-]Cc1ccccc1"
'''

# Beckmann rearrangement of (E)-acetophenone oxime, O-protonated: the phenyl, anti to the leaving
# water, migrates to nitrogen as water leaves, giving the N-phenyl nitrilium ion (textbook: the
# group anti to the leaving group migrates; the E oxime gives acetanilide).
BECKMANN_SHIFT = '''\
species oxime = "C[C:2](=[N:3]\\[OH2+:4])/[c:1]1ccccc1"
step "migration"
    C1-C2 -> C1-N3
    N3-O4 -> O4
    :N3 -> C2#N3
end
product "CC#[N+]c1ccccc1.O"
'''

# Sodium hands one electron to acetone: the ketyl radical anion (charge on O, unpaired electron on
# C) and Na+ (textbook dissolving-metal reduction, the first step of a pinacol coupling).
KETYL = '''\
species sodium = "[Na:1]"
species ketone = "[O:3]=[C:2](C)C"
step "electron transfer"
    .Na1 ~> :O3
    C2=O3 ~> O3
    C2=O3 ~> C2
end
'''

CORRECT = {name: text for name, text in globals().items() if name.isupper() and isinstance(text, str)}
