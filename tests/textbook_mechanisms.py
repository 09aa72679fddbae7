"""Textbook mechanisms, each written here from the standard arrow-pushing account of a named
reaction (common practice in organic chemistry texts; the products are the textbook outcomes,
from memory). They reach what the gallery does not: phosphorus and magnesium, a four-membered
ring that opens again, a three-membered ring between two species, a ring that grows, a 1,2-shift,
a [3,3] shift, a four-centre addition, aromatic substitutions (electrophilic and nucleophilic),
a 1,3-dipolar cycloaddition, an enol halogenation; carbocations met by water (SN1, E1, Markovnikov
hydration), an acylium, carbonyls protonated on oxygen (acid-catalysed enolisation and aldol), a
tetrahedral intermediate from an amine, a hydride donor, a [3,3] shift through oxygen. Then: a
hydride passed between two carbonyls (Cannizzaro), an iminium reduced by a borohydride, carbanions
beside nitriles (Knoevenagel with an E1cB loss of hydroxide, the cyanide-catalysed benzoin),
addition to a C#N, a radical chain adding against Markovnikov, a shift to nitrogen that makes a
nitrilium (Beckmann, from the E oxime), a carbanion as leaving group (CBr3-, N2 from a diazene
anion), a retro-aldol, a five-membered ring closed by an enolate (Dieckmann), ammonium and
sulfonium leaving groups (Hofmann, Corey-Chaykovsky), an arene made by a tautomerisation, an
epoxide closed by a backside attack at a configured carbon, a configured carbon that migrates
(Baeyer-Villiger, retention), a radical that closes a ring (tin hydride, 5-exo-trig), a sulfonate
leaving group made (mesylation) and displaced (SN2), a bromonium opened by water, a thiolate, a diazonium ion made from an amine and
NO+, an isocyanate that loses CO2 (Hofmann rearrangement), a five-arrow concerted oxygen
transfer (peracid epoxidation), and a hydrogen passed round a six-membered cyclic array (carbonyl-ene).
Then: an iminium met by an enol (Mannich) and made from an enamine (Stork), a 1,3-dicarbonyl
enolate in a conjugate addition, phosphorus and a hydride ion as base (Horner-Wadsworth-Emmons), a
cyclopropanone (Favorskii), 1,2-shifts to carbon and to nitrogen (benzilic acid, Curtius, Wolff,
Tiffeneau-Demjanov) with N2 lost, sulfonium chemistry with CO and CO2 given off (Swern), an epoxide
closed by an aldol alkoxide (Darzens), zinc and aluminium passing through six-membered rings
(Reformatsky, Meerwein-Ponndorf-Verley), an alkoxide-driven [3,3] and a carbanion [2,3] shift, a
nitrilium met by an alcohol (Pinner), imines and enamines, acyl substitutions (transesterification,
Schotten-Baumann), a dehydration through the enol, an iodonium opened by a carboxylate, hydrate and
cyanohydrin, a sulfonamide anion, a cycloreversion and cycloaddition (Criegee ozonide), an aryne
(benzyne), a carbene from an alpha-elimination, phosphorus made P=O and P=N (Arbuzov, Staudinger),
a configured carbon inverted by a carboxylate (Mitsunobu), a radical chain through an allyl
radical in its other resonance form, an allyl cation caught at its far end (1,4-addition), a
4-electron electrocyclic closure of a cation (Nazarov), an arene closing onto an iminium
(Pictet-Spengler), an ammonium enolate that expels its amine (Baylis-Hillman), a syn elimination
through a five-membered ring (Cope elimination), a thionium ion (Pummerer), a hydride reduction that
passes through the aldehyde, a five-coordinate silicate (Peterson), and a heteroarene whose
nitrogen lone pair pushes through the ring (bromination of pyrrole at C2), and a chlorosulfite
that falls apart to SO2 (an acid chloride from thionyl chloride); and electrons handed over by a
metal with no bond made (Birch reduction); a phosphonium that trades its bromide for an alkoxide, the
bromide waiting off phosphorus before it displaces the oxygen at carbon (Appel); an azo initiator
that falls apart into two tertiary radicals and N2, every bond split evenly (AIBN); an amine
acetylated by an anhydride, a third species (pyridine) taking the proton once acetate has left.
Then: CO2 lost from a beta-keto acid and an alkene made from an ester, each through a six-membered
cyclic array (the ketone's enol; Ei), a nitrile caught by a carbocation (Ritter), a 1,2-methyl
shift (Wagner-Meerwein), an oxocarbenium met by an alkene (Prins), a five-membered ether closed by
an alkoxide (5-exo-tet), a malonate enolate alkylated, a furan made by acid (Paal-Knorr), an
iminium met by cyanide (Strecker) and a lactone closed and dehydrated in acid; an acetylide
alkylated, a vinyl cation made from an alkyne and caught by water, a nitrile oxide's 1,3-dipolar
cycloaddition, an oxime; a hydrogen shifted round a six-membered array
([1,5]) and a xanthate's syn elimination (Chugaev); an alkyl shifted from boron to oxygen. Then:
ring closures onto sp carbons (a nitrile, Thorpe-Ziegler; an alkyne, a 5-exo-dig radical) and a
boron enolate's aldol through a six-membered cyclic array (Zimmerman-Traxler); an amide made
through a carbodiimide, its urea redrawn by a resonance step; a Boc group taken off by acid, and
a THP ether through its cyclic oxocarbenium ion; a ring closed by an enamine onto a ring
carbonyl, its iminium ion then hydrolysed (the Hajos-Parrish ketol); the Fischer indole synthesis
through its [3,3] shift (ten steps); a Friedel-Crafts alkylation through the AlCl3 complex of
tert-butyl chloride; an amine added to acrylonitrile, its ketenimine anion protonated on nitrogen and
tautomerised by water (aza-Michael); a phthalimide anion alkylated by benzyl bromide (Gabriel); a silyl enol ether added to an
aldehyde held by TiCl4 (Mukaiyama); an alcohol acetylated through DMAP's acylpyridinium ion.
Then: an epoxide that migrates along its chain (Payne) and a cyclopropane closed by an enolate
(Michael-initiated ring closure), both 3-exo-tet; a concerted fragmentation (Grob); an aryl that
moves to oxygen (Dakin); oxygen silylated (a silyl enol ether); an enol ether hydrolysed; a lactam
closed by an amine onto its own ester; a magnesium chelate held until work-up (Weinreb); SO3 attacked
at sulfur by an arene, an acid chloride that takes two Grignard methyls, a kinetic enolate made
by LDA and methylated, an alkyne from two eliminations, anisole brominated para through FeBr4-,
and an iminium ion hydrolysed; an Fmoc group taken off by piperidine (E1cB) and a Boc group put on.
Then: electrocyclic opening and closing (a cyclobutene, a hexatriene), a retro-Diels-Alder and an
intramolecular one, an azide-alkyne cycloaddition, the Vilsmeier reagent, Kolbe-Schmitt, a
dithioacetal, a tributyltin reduction, the Lossen and Meinwald rearrangements, Eschweiler-Clarke,
a chromic acid oxidation, HBr added 1,4 to butadiene (with a resonance step), an aluminate
reduction, oxymercuration, a phosphonium ylide, aspirin from salicylic acid, a nitrile Grignard,
an SN2' and a cation-alkene cyclisation cascade; and seventeen more, from Hell-Volhard-Zelinsky to
Corey-Fuchs, written while hunting for defects; and eighteen more of that kind, from the Passerini
reaction to the Dess-Martin oxidation (a silyl group passed between two oxygens, silver bromide let
go as it forms, a ketyl radical anion, a cheletropic loss of SO2, a five-coordinate silicate); and
ten heterocycle syntheses (Paal-Knorr and Knorr pyrroles, Hantzsch dihydropyridine, Biginelli,
Doebner-Miller, Bischler-Napieralski, Robinson-Gabriel, Gewald, Friedlander).

Each entry: (mechanism text, textbook product SMILES, drawn): `drawn` says whether the geometry
tests draw it. All do but twenty-five. (Fixed in the layout and the tests since: the Dieckmann
ethoxide, which stays where it was bonded, and the Cope elimination's oxide waited 1.0 and 1.34
bond lengths from the hydrogen they take, where the proton-transfer test wants 1.4; the mesylate
SN2 pushed the ethyl that iodide takes 0.9 bond lengths out along its broken C-O bond, as if it
were the leaving group; the Hofmann rearrangement, whose skeletal bonds but C=O all make or break
at some step, so that the molecule falls into clusters of one or two atoms, drew C1-N3 2.73 bond
lengths long with the methyl hidden under it and N3-Br4 1.34, each cluster placed against one
partner only, and its methyl's shift arrow bulged toward the pivot; the Stork alkylation's N<-H-O+
proton transfer and the Curtius azide's leaving N-N pair ran their arrows over a charge sign; the
Tiffeneau-Demjanov ring, redrawn as it grows, was held to 0.05 bond lengths, as the test read no
rings in the state before the step; the Staudinger azide, depicted with the four-membered ring
its P-N bonds make over the mechanism, had its middle nitrogen bent to 135 degrees while sp, and
the two arrows into N3#N4, both from N4, ended at one point; the ester reduction's O2, giving its
pair back to C1=O2, put its dots between itself and the hydrogen on C1, its arrow a tick; the
Reformatsky zinc enolate moved out of shape by 0.03 bond lengths (2% allowed) as it joined the
ketone, its ZnBr, passed from one oxygen to the other, placed afresh: the six-membered ring the
step goes round is now drawn as one.)
Still undrawn: the Swern oxalyl fragment (its C-C bond once drawn 1.15 bond lengths long as it falls
apart) moves Cl4 out of shape against C7 by 0.53 bond lengths as it joins the sulfoxide (each of its
one- and two-atom clusters placed afresh; 0.81 before a placed cluster kept clear of every panel's
spots of the others), and sets a carbon 0.44 bond lengths from a chlorine in its first panel; the Wolff
carbanion C4 sets the dots of its pair into C2=C4 45 degrees from that bond, the free side beside
the vertex taken by its minus sign (its methyl, once drawn leaning onto C4, now stands at 120
degrees and its shift arrow arcs round the outside). The Mitsunobu scheme crosses bonds and moves the ester
2.86 bond lengths out of shape as its parts join. The Baylis-Hillman scheme draws DABCO's middle
bridge inside the hexagon of the other two (the perspective drawing of the cage, its bonds of one
length: the ring test reads the bridge as an atom inside a ring) and leaves the alkoxide 1.26 bond
lengths from the hydrogen it takes (1.4 wanted). The thionyl chloride scheme
draws a bond 1.47 bond lengths long and moves the chlorosulfite out of shape as chloride leaves.
The Fischer indole synthesis draws its [3,3] array as the closed hexagon, the forming C-C bond's
atoms 1.0 bond lengths apart (a benzene carbon cannot swing out), and its indole's methyl moves
0.19 as the ring turns aromatic. The Friedel-Crafts alkylation's arenium ion has no room for
its hydrogen: the tert-butyl group, on the bisector of the ring bonds with a methyl 60 degrees
either side, takes both spots, and the hydrogen stands 0.26 bond lengths from one (drawn splayed,
30 degrees off the bisector, the methyl stood 0.5 away, and the product kept the skew). (The benzyne's ring C#C was held to the
straight-sp test, and its triple bond, which RDKit flags aromatic, to a single or double one, and
thionyl chloride's SO2, bent at S, which keeps a lone pair, to the straight-sp test: both tests
now follow the chemistry.) The benzoin condensation draws the proton its cyanohydrin anion passes on behind its holder (panels 3 and 5,
175-178 degrees round from the oxygen that takes it), the arrow running round the holder's label.
The Weinreb ketone synthesis waits its MgBr+ beside the adduct where both
oxygens' arrows cross the propyl chain (the two donors stand on opposite sides of the tetrahedral
carbon), then redraws the adduct as the chelate ring closes, O3 moving 1.9 bond lengths. (The Fmoc removal's carbanion sent its lone-pair arrow into C3=C4 over its own
minus sign, dots, sign and arrow sharing one gap at the ring carbon: a sign moved off an arrow may
now stand a little further out, in the free gap above.) The Boc protection's
tert-butoxide, waiting where it left the carbonate, takes the N-H proton across the nitrogen's
label, the hydrogen on the far side of N from it. The nitration's nitronium, straight until the arene bonds to its
nitrogen, gets a straight depiction and then a bent one; the Beckmann nitrilium a bent one, a
straight one, and a bent one again."""

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

# Bromine adds anti to cyclohexene: trans-1,2-dibromocyclohexane, racemic (textbook).
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

# E1 of tert-butanol (common practice; the textbook outcome is 2-methylpropene): the alcohol
# protonated, water leaves the tertiary centre (shown leaving over the reaction arrow), and water
# takes a proton from a methyl. The centre carries three carbons that never change, so the
# protonated alcohol's C-O bond stands between two methyls, 60 degrees from each.
E1_TERT_BUTANOL = '''\
species alcohol = "[CH3:1][C:2]([CH3:3])([CH3:4])[OH:5]"
species acid = "[OH3+:6]"
step "protonation" reversible over "H2SO4"
    :O5 -> H(O6)
    O6-H -> O6
end
step "ionisation"
    C2-O5 -> O5
    releases O5
end
step "deprotonation"
    :O6 -> H(C1)
    C1-H -> C1=C2
end
product "C=C(C)C.[OH3+]"
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

# Cannizzaro reaction of benzaldehyde: hydroxide adds, the tetrahedral anion hands a hydride to a
# second aldehyde, and the acid gives its proton to the alkoxide (benzoate and benzyl alcohol).
CANNIZZARO = '''\
species aldehyde = "c1ccccc1[CH:1]=[O:2]"
species aldehyde_2 = "c1ccccc1[CH:3]=[O:4]"
species base = "[OH-:5]"
step "addition of hydroxide"
    :O5 -> C1
    C1=O2 -> O2
end
step "hydride transfer"
    :O2 -> C1=O2
    C1-H -> C3-H(C1)
    C3=O4 -> O4
end
step "proton transfer"
    :O4 -> H(O5)
    O5-H -> O5
end
product "O=C([O-])c1ccccc1.OCc1ccccc1"
'''

# Reductive amination of acetone with methylamine: the carbinolamine by explicit proton transfers,
# loss of water to the iminium, then hydride from cyanoborohydride (N-methylpropan-2-amine).
REDUCTIVE_AMINATION = '''\
species ketone = "[CH3:1][C:2](=[O:3])C"
species amine = "C[NH2:4]"
species acid = "[OH3+:5]"
step "addition"
    :N4 -> C2
    C2=O3 -> O3
end
step "protonation of oxygen"
    :O3 -> H(O5)
    O5-H -> O5
end
step "deprotonation of nitrogen"
    :O5 -> H(N4)
    N4-H -> N4
end
step "protonation of the hydroxyl"
    uses acid_2 = "[OH3+:6]"
    :O3 -> H(O6)
    O6-H -> O6
end
step "loss of water"
    :N4 -> C2=N4
    C2-O3 -> O3
    releases O3
    expect "C[NH+]=C(C)C"
end
step "hydride transfer"
    uses hydride = "[BH3-:7]C#N"
    B7-H -> C2-H(B7)
    C2=N4 -> N4
end
product "CNC(C)C"
'''

# Knoevenagel condensation of benzaldehyde and malononitrile: the carbanion adds, the alkoxide is
# protonated, and an E1cB elimination (deprotonation, then loss of hydroxide) gives
# benzylidenemalononitrile.
KNOEVENAGEL = '''\
species aldehyde = "c1ccccc1[CH:1]=[O:2]"
species malononitrile = "N#C[CH2:3]C#N"
species base = "CC[O-:4]"
step "deprotonation"
    :O4 -> H(C3)
    C3-H -> C3
end
step "addition"
    :C3 -> C1
    C1=O2 -> O2
end
step "protonation"
    :O2 -> H(O4)
    O4-H -> O4
end
step "deprotonation"
    :O4 -> H(C3)
    C3-H -> C3
end
step "loss of hydroxide"
    :C3 -> C1=C3
    C1-O2 -> O2
end
product "N#CC(C#N)=Cc1ccccc1.[OH-]"
'''

# Benzoin condensation catalysed by cyanide: the cyanohydrin anion, its C-H taken (umpolung), the
# carbanion adds to a second benzaldehyde, a proton moves, cyanide leaves (benzoin).
BENZOIN = '''\
species aldehyde = "c1ccccc1[CH:1]=[O:2]"
species cyanide = "[C-:3]#[N:4]"
species aldehyde_2 = "c1ccccc1[CH:5]=[O:6]"
species ethanol = "CC[OH:7]"
step "cyanide addition"
    :C3 -> C1
    C1=O2 -> O2
end
step "protonation of the alkoxide"
    :O2 -> H(O7)
    O7-H -> O7
end
step "deprotonation at carbon"
    :O7 -> H(C1)
    C1-H -> C1
end
step "addition to the second aldehyde"
    :C1 -> C5
    C5=O6 -> O6
end
step "proton transfer"
    :O6 -> H(O2)
    O2-H -> O2
end
step "loss of cyanide"
    :O2 -> C1=O2
    C1-C3 -> C3
end
product "O=C(c1ccccc1)C(O)c1ccccc1.[C-]#N"
'''

# Base hydrolysis of acetonitrile to acetamide: hydroxide adds to C#N, the imidate is protonated
# on nitrogen, and the imidic acid tautomerises through its anion (protonation at N by water).
NITRILE_HYDROLYSIS = '''\
species nitrile = "C[C:1]#[N:2]"
species base = "[OH-:3]"
species water = "[OH2:4]"
step "addition"
    :O3 -> C1
    C1#N2 -> N2
end
step "protonation at nitrogen"
    :N2 -> H(O4)
    O4-H -> O4
end
step "deprotonation at oxygen"
    :O4 -> H(O3)
    O3-H -> O3
end
step "protonation at nitrogen"
    uses water_2 = "[OH2:5]"
    :O3 -> C1=O3
    C1=N2 -> N2-H(O5)
    O5-H -> O5
end
product "CC(N)=O.[OH-]"
'''

# Anti-Markovnikov addition of HBr to propene with a peroxide: homolysis, hydrogen abstraction
# from HBr, a bromine atom adds to the terminal carbon (the secondary radical), which takes H from
# HBr (1-bromopropane and a new bromine atom).
RADICAL_HBR_ADDITION = '''\
species peroxide = "CC(C)(C)[O:1][O:2]C(C)(C)C"
species hbr = "[Br:3][H:10]"
species propene = "C[CH:4]=[CH2:5]"
species hbr_2 = "[Br:6][H:11]"
step "initiation" under "heat"
    O1-O2 ~> O1
    O1-O2 ~> O2
    releases O2
end
step "hydrogen abstraction"
    .O1 ~> H10
    Br3-H10 ~> O1-H10
    Br3-H10 ~> Br3
    releases O1
end
step "addition to the alkene"
    .Br3 ~> C5
    C4=C5 ~> C5-Br3
    C4=C5 ~> C4
end
step "hydrogen transfer"
    .C4 ~> H11
    Br6-H11 ~> C4-H11
    Br6-H11 ~> Br6
end
product "CCCBr"
'''

# Beckmann rearrangement of (E)-acetophenone oxime: the protonated OH leaves as phenyl, anti to it,
# moves to nitrogen (a nitrilium ion); water adds and the imidic acid tautomerises (acetanilide).
BECKMANN = '''\
species oxime = "C[C:2](=[N:3]\\[OH:4])/[c:1]1ccccc1"
species acid = "[OH3+:5]"
species water = "[OH2:6]"
step "protonation"
    :O4 -> H(O5)
    O5-H -> O5
end
step "migration anti to the leaving group"
    C1-C2 -> C1-N3
    N3-O4 -> O4
    :N3 -> C2#N3
    releases O4
    expect "CC#[N+]c1ccccc1"
end
step "capture by water"
    :O6 -> C2
    C2#N3 -> N3
end
step "deprotonation"
    :O5 -> H(O6)
    O6-H -> O6
end
step "protonation at nitrogen"
    :N3 -> H(O5)
    O5-H -> O5
end
step "deprotonation at oxygen"
    uses water_2 = "[OH2:7]"
    :O7 -> H(O6)
    O6-H -> C2=O6
    C2=N3 -> N3
end
product "CC(=O)Nc1ccccc1"
'''

# Haloform reaction, the cleavage: hydroxide adds to the tribromomethyl ketone, CBr3- leaves, and
# takes the acid's proton (acetate and bromoform).
HALOFORM_CLEAVAGE = '''\
species ketone = "C[C:1](=[O:2])[C:3](Br)(Br)Br"
species base = "[OH-:4]"
step "addition"
    :O4 -> C1
    C1=O2 -> O2
end
step "loss of tribromomethanide"
    :O2 -> C1=O2
    C1-C3 -> C3
end
step "proton transfer"
    :C3 -> H(O4)
    O4-H -> O4
end
product "CC(=O)[O-].BrC(Br)Br"
'''

# Retro-aldol of diacetone alcohol in base: the alkoxide breaks the C-C bond to acetone and the
# acetone enolate, which water protonates on carbon (two acetones).
RETRO_ALDOL = '''\
species aldol = "[CH3:1][C:2](=[O:3])[CH2:4][C:5](C)(C)[OH:6]"
species base = "[OH-:7]"
species water = "[OH2:8]"
step "deprotonation"
    :O7 -> H(O6)
    O6-H -> O6
end
step "carbon-carbon cleavage"
    :O6 -> C5=O6
    C4-C5 -> C2=C4
    C2=O3 -> O3
end
step "protonation of the enolate"
    :O3 -> C2=O3
    C2=C4 -> C4-H(O8)
    O8-H -> O8
end
product "CC(C)=O.CC(C)=O"
'''

# Dieckmann condensation of diethyl hexanedioate: the ester enolate closes a five-membered ring
# (5-exo-trig), ethoxide leaves, ethoxide takes the doubly activated C-H, and acid on work-up
# protonates it on carbon (ethyl 2-oxocyclopentanecarboxylate).
DIECKMANN = '''\
species diester = "CC[O:1][C:2](=[O:3])[CH2:4][CH2:5][CH2:6][CH2:7][C:8](=[O:9])[O:10]CC"
species base = "CC[O-:11]"
step "enolate formation"
    :O11 -> H(C4)
    C4-H -> C2=C4
    C2=O3 -> O3
end
step "ring closure"
    :O3 -> C2=O3
    C2=C4 -> C4-C8
    C8=O9 -> O9
end
step "loss of ethoxide"
    :O9 -> C8=O9
    C8-O10 -> O10
end
step "deprotonation of the keto ester"
    :O10 -> H(C4)
    C4-H -> C4=C8
    C8=O9 -> O9
end
step "protonation on work-up"
    uses acid = "[OH3+:12]"
    :O9 -> C8=O9
    C4=C8 -> C4-H(O12)
    O12-H -> O12
end
product "CCOC(=O)C1CCCC1=O"
'''

# Wolff-Kishner reduction of acetone hydrazone: N-H taken, the anion protonated on carbon (a
# diazene), the second N-H taken, N2 leaves as the carbanion forms, water protonates it (propane).
# (Its first step was once judged as hydroxide taking an amine N-H, ~38: AR508.)
WOLFF_KISHNER = '''\
species hydrazone = "C[C:1](C)=[N:2][NH2:3]"
species base = "[OH-:4]"
species water = "[OH2:5]"
step "deprotonation at nitrogen"
    :O4 -> H(N3)
    N3-H -> N3
end
step "protonation at carbon"
    :N3 -> N2=N3
    C1=N2 -> C1-H(O4)
    O4-H -> O4
end
step "deprotonation at nitrogen"
    :O4 -> H(N3)
    N3-H -> N3
end
step "loss of nitrogen"
    :N3 -> N2#N3
    C1-N2 -> C1
    releases N2
end
step "protonation at carbon"
    :C1 -> H(O5)
    O5-H -> O5
end
product "CCC"
'''

# Hofmann elimination of butan-2-yltrimethylammonium hydroxide: E2 at the methyl (the less
# substituted alkene, but-1-ene), trimethylamine leaves.
HOFMANN_ELIMINATION = '''\
species ammonium = "C[N+:1](C)(C)[CH:2]([CH3:3])[CH2:4]C"
species base = "[OH-:5]"
step "anti elimination"
    :O5 -> H(C3)
    C3-H -> C2=C3
    C2-N1 -> N1
end
product "C=CCC.CN(C)C.O"
'''

# Tautomerisation of cyclohexa-2,4-dienone to phenol in base: the sp3 C-H taken (the phenoxide,
# aromatic), then water protonates the oxygen.
PHENOL_TAUTOMERISATION = '''\
species dienone = "[O:7]=[C:1]1[CH:2]=[CH:3][CH:4]=[CH:5][CH2:6]1"
species base = "[OH-:8]"
step "deprotonation"
    :O8 -> H(C6)
    C6-H -> C1=C6
    C1=O7 -> O7
end
step "protonation at oxygen"
    :O7 -> H(O8)
    O8-H -> O8
end
product "Oc1ccccc1.[OH-]"
'''

# Epoxide from (1R,2R)-2-bromocyclohexan-1-ol in base: the alkoxide displaces bromide from the
# back (3-exo-tet, inversion at C2), giving the cis-fused (meso) cyclohexene oxide.
EPOXIDE_CLOSURE = '''\
species bromohydrin = "[Br:3][C@@H:2]1CCCC[C@H:1]1[OH:4]"
species base = "[OH-:5]"
step "deprotonation"
    :O5 -> H(O4)
    O4-H -> O4
end
step "ring closure"
    :O4 -> C2
    C2-Br3 -> Br3
end
product "C1CC[C@H]2O[C@H]2C1"
'''

# Corey-Chaykovsky epoxidation of cyclohexanone: tert-butoxide takes a proton of trimethylsulfonium
# (the ylide; once judged as an alkane C-H, ~50, AR508), the ylide carbon adds, the alkoxide closes
# the three-membered ring and dimethyl sulfide leaves.
COREY_CHAYKOVSKY = '''\
species salt = "[CH3:1][S+:2](C)C"
species base = "CC(C)(C)[O-:5]"
species ketone = "[O:4]=[C:3]1CCCCC1"
step "ylide formation"
    :O5 -> H(C1)
    C1-H -> C1
end
step "addition"
    :C1 -> C3
    C3=O4 -> O4
end
step "ring closure"
    :O4 -> C1
    C1-S2 -> S2
end
product "C1CCC2(CC1)CO2.CSC"
'''

# Tin hydride reduction of 6-bromohex-1-ene: the stannyl radical takes the bromine atom, the
# hex-5-enyl radical closes a five-membered ring (5-exo-trig, the textbook radical clock) and the
# cyclopentylmethyl radical takes H from the stannane (methylcyclopentane).
RADICAL_CYCLISATION = '''\
species bromide = "[Br:1][CH2:2][CH2:3]CC[CH:6]=[CH2:7]"
species stannyl = "CCCC[Sn:8](CCCC)CCCC"
species stannane = "CCCC[SnH:9](CCCC)CCCC"
step "bromine abstraction"
    .Sn8 ~> Br1
    C2-Br1 ~> Br1-Sn8
    C2-Br1 ~> C2
end
step "5-exo-trig cyclisation"
    .C2 ~> C6
    C6=C7 ~> C2-C6
    C6=C7 ~> C7
end
step "hydrogen transfer"
    .C7 ~> H(Sn9)
    Sn9-H ~> C7-H(Sn9)
    Sn9-H ~> Sn9
end
product "CC1CCCC1"
'''

# SN2 of ethyl methanesulfonate with iodide: a sulfonate leaves (ethyl iodide).
MESYLATE_SN2 = '''\
species mesylate = "CS(=O)(=O)[O:1][CH2:2]C"
species iodide = "[I-:3]"
step "substitution"
    :I3 -> C2
    C2-O1 -> O1
end
product "CCI.CS(=O)(=O)[O-]"
'''

# Bromohydrin from cyclohexene, bromine and water: the bromonium ion, opened from the back by
# water, then deprotonated: trans-2-bromocyclohexan-1-ol, racemic (the bromonium ion is made on
# one face of the ring's cis double bond and opened from the other).
HALOHYDRIN = '''\
species alkene = "[CH:1]1=[CH:2]CCCC1"
species bromine = "[Br:3][Br:4]"
species water = "[OH2:5]"
species water_2 = "[OH2:6]"
step "bromonium ion"
    C1=C2 -> C1-Br3
    :Br3 -> C2
    Br3-Br4 -> Br4
end
step "anti opening by water"
    :O5 -> C1
    Br3-C1 -> Br3
end
step "deprotonation"
    :O6 -> H(O5)
    O5-H -> O5
end
product "OC1CCCCC1Br"
'''

# Conjugate addition of methanethiolate to but-3-en-2-one, the enolate protonated on carbon by
# methanol (4-(methylsulfanyl)butan-2-one).
THIA_MICHAEL = '''\
species enone = "[CH2:1]=[CH:2][C:3](=[O:4])C"
species thiolate = "C[S-:5]"
species methanol = "C[OH:6]"
step "conjugate addition"
    :S5 -> C1
    C1=C2 -> C2=C3
    C3=O4 -> O4
end
step "protonation at carbon"
    :O4 -> C3=O4
    C2=C3 -> C2-H(O6)
    O6-H -> O6
end
product "CSCCC(C)=O"
'''

# Baeyer-Villiger oxidation of (S)-3-phenylbutan-2-one: the Criegee intermediate made neutral by
# acetic acid (two proton transfers), then the secondary carbon migrates to oxygen with retention
# of configuration ((S)-1-phenylethyl acetate). (Its migrating carbon once lost its configuration.)
BAEYER_VILLIGER_RETENTION = '''\
species ketone = "C[C:1](=[O:2])[C@@H:3](C)c1ccccc1"
species peracid = "C[C:10](=[O:11])[O:12][O:13][H:14]"
species acid = "CC(=O)[OH:20]"
step "addition"
    :O13 -> C1
    C1=O2 -> O2
end
step "protonation of the alkoxide"
    :O2 -> H(O20)
    O20-H -> O20
end
step "deprotonation"
    :O20 -> H14
    O13-H14 -> O13
end
step "migration with retention"
    C1-C3 -> C3-O13
    O13-O12 -> O12
    :O2 -> C1=O2
end
step "deprotonation"
    :O12 -> H(O2)
    O2-H -> O2
end
product "CC(=O)O[C@@H](C)c1ccccc1"
'''

# Diazotisation of aniline: the amine adds to the nitrosonium ion, the N-nitrosamine tautomerises
# to the diazohydroxide through explicit proton transfers, and loss of water gives the
# benzenediazonium ion (N#N+ drawn straight).
DIAZOTISATION = '''\
species aniline = "c1ccccc1[NH2:1]"
species nitrosonium = "[N:2]#[O+:3]"
species water = "[OH2:4]"
step "N-nitrosation"
    :N1 -> N2
    N2#O3 -> O3
end
step "deprotonation"
    :O4 -> H(N1)
    N1-H -> N1
end
step "protonation at oxygen"
    :O3 -> H(O4)
    O4-H -> O4
end
step "deprotonation at nitrogen"
    uses water_2 = "[OH2:5]"
    :O5 -> H(N1)
    N1-H -> N1=N2
    N2=O3 -> O3
end
step "protonation of the hydroxyl"
    :O3 -> H(O5)
    O5-H -> O5
end
step "loss of water"
    :N1 -> N1#N2
    N2-O3 -> O3
    releases O3
end
product "N#[N+]c1ccccc1"
'''

# Hofmann rearrangement of N-bromoacetamide: the N-anion, the methyl shifts to nitrogen as bromide
# leaves (methyl isocyanate), hydroxide adds, the carbamic acid is deprotonated on oxygen and the
# carbamate protonated on nitrogen, and the zwitterion loses CO2 (methylamine). (Written first with
# the carbamate losing CO2 to leave the methylamide ion, pKa ~38, which AR510 flags; then with the
# neutral carbamic acid protonated on nitrogen by water, an N-acylammonium ion ~-7: AR508.)
HOFMANN_REARRANGEMENT = '''\
species bromoamide = "[CH3:6][C:1](=[O:2])[NH:3][Br:4]"
species base = "[OH-:5]"
step "deprotonation"
    :O5 -> H(N3)
    N3-H -> N3
end
step "rearrangement"
    C1-C6 -> C6-N3
    N3-Br4 -> Br4
    :N3 -> C1=N3
    releases Br4
    expect "CN=C=O"
end
step "addition of hydroxide"
    uses base_2 = "[OH-:7]"
    :O7 -> C1
    C1=N3 -> N3
end
step "protonation at nitrogen"
    :N3 -> H(O5)
    O5-H -> O5
end
step "deprotonation of the carbamic acid"
    :O5 -> H(O7)
    O7-H -> O7
end
step "the carbamate's nitrogen takes a proton"
    uses water = "[OH2:8]"
    :N3 -> H(O8)
    O8-H -> O8
end
step "loss of carbon dioxide"
    :O7 -> C1=O7
    C1-N3 -> N3
    releases C1
end
product "CN.O=C=O"
'''

# Mesylation of ethanol: the alcohol oxygen displaces chloride at sulfur, triethylamine takes the
# proton (ethyl methanesulfonate). (Its sulfur, written with twelve electrons as sulfonyl groups
# are, was once flagged as an expanded octet though the step only kept it so: AR504.)
MESYLATION = '''\
species alcohol = "CC[OH:1]"
species mscl = "C[S:2](=O)(=O)[Cl:3]"
species base = "CC[N:4](CC)CC"
step "substitution at sulfur"
    :O1 -> S2
    S2-Cl3 -> Cl3
end
step "deprotonation"
    :N4 -> H(O1)
    O1-H -> O1
end
product "CCOS(C)(=O)=O"
'''

# Epoxidation of (Z)-but-2-ene by peracetic acid in one concerted step (five arrows: the alkene
# pi to the far oxygen, O-O to the new C=O, C=O pi to oxygen, that oxygen takes the proton, the
# O-H pair closes the epoxide). The textbook product is cis (meso, (2R,3S)): the oxygen adds to
# one face (syn), and the replay derives that configuration from the written Z.
EPOXIDATION = '''\
species alkene = "C/[CH:1]=[CH:2]\\C"
species peracid = "C[C:10](=[O:11])[O:12][O:13][H:14]"
step "concerted oxygen transfer"
    C1=C2 -> C1-O13
    O13-O12 -> C10=O12
    C10=O11 -> O11
    :O11 -> H14
    O13-H14 -> C2-O13
end
product "CC1OC1C.CC(=O)O"
'''

# Carbonyl-ene reaction of propene with formaldehyde: the alkene bonds to the carbonyl carbon as
# the allylic hydrogen moves to oxygen, round a six-membered cyclic array (but-3-en-1-ol). (It was
# once judged as an alkoxide taking an alkane C-H, AR508.)
ENE_REACTION = '''\
species ene = "[CH3:3][CH:2]=[CH2:1]"
species enophile = "[CH2:4]=[O:5]"
step "ene reaction" over "Lewis acid"
    C1=C2 -> C1-C4
    C3-H -> C2=C3
    C4=O5 -> O5-H(C3)
end
product "C=CCCO"
'''

# Mannich reaction: the enol of acetone attacks the dimethyliminium ion; water takes the O-H proton
# (4-(dimethylamino)butan-2-one).
MANNICH = '''\
species enol = "[CH2:1]=[C:2](C)[OH:3]"
species iminium = "C[N+:4](C)=[CH2:5]"
species water = "[OH2:6]"
step "C-C bond formation"
    C1=C2 -> C1-C5
    C5=N4 -> N4
    :O3 -> C2=O3
end
step "deprotonation"
    :O6 -> H(O3)
    O3-H -> O3
end
product "CN(C)CCC(C)=O"
'''

# Stork enamine alkylation: the pyrrolidine enamine of cyclohexanone takes methyl iodide on carbon
# (an iminium), water adds, a proton moves to nitrogen, pyrrolidine leaves, and pyrrolidine takes
# the proton of the protonated ketone (2-methylcyclohexanone).
STORK_ENAMINE = '''\
species enamine = "[CH:1]1=[C:2]([N:3]2CCCC2)CCCC1"
species iodomethane = "[CH3:4][I:5]"
species water = "[OH2:6]"
step "C-alkylation"
    :N3 -> C2=N3
    C1=C2 -> C1-C4
    C4-I5 -> I5
    expect "CC1CCCCC1=[N+]1CCCC1"
end
step "addition of water"
    :O6 -> C2
    C2=N3 -> N3
end
step "proton transfer to nitrogen"
    :N3 -> H(O6)
    O6-H -> O6
end
step "loss of pyrrolidine"
    :O6 -> C2=O6
    C2-N3 -> N3
end
step "deprotonation"
    :N3 -> H(O6)
    O6-H -> O6
end
product "CC1CCCCC1=O"
'''

# Michael addition of ethyl acetoacetate to but-3-en-2-one: ethoxide makes the 1,3-dicarbonyl
# enolate, which adds at the enone's beta carbon; ethanol protonates the new enolate on carbon.
KETO_ESTER_MICHAEL = '''\
species ketoester = "CC(=O)[CH2:1][C:2](=[O:3])OCC"
species base = "CC[O-:4]"
species enone = "[CH2:5]=[CH:6][C:7](=[O:8])C"
step "enolate formation"
    :O4 -> H(C1)
    C1-H -> C1=C2
    C2=O3 -> O3
end
step "conjugate addition"
    :O3 -> C2=O3
    C1=C2 -> C1-C5
    C5=C6 -> C6=C7
    C7=O8 -> O8
end
step "protonation at carbon"
    :O8 -> C7=O8
    C6=C7 -> C6-H(O4)
    O4-H -> O4
end
product "CCOC(=O)C(CCC(C)=O)C(C)=O"
'''

# Horner-Wadsworth-Emmons olefination of benzaldehyde: hydride (NaH) takes the phosphonate C-H,
# the carbanion adds to the aldehyde, the alkoxide closes the oxaphosphetane at phosphorus, which
# collapses to ethyl cinnamate and diethyl phosphate. The textbook product is the E ester; the replay
# makes no configuration for a new double bond, so it is compared without it. (Its hydride once could
# not be a base, AR204, and the H2 it gives off hid every stereo element of the states after.)
HORNER_WADSWORTH_EMMONS = '''\
species phosphonate = "CC[O:20][P:1](=[O:2])(OCC)[CH2:3][C:4](=O)OCC"
species base = "[H-:10]"
species aldehyde = "c1ccccc1[CH:5]=[O:6]"
step "deprotonation"
    :H10 -> H(C3)
    C3-H -> C3
end
step "addition"
    :C3 -> C5
    C5=O6 -> O6
end
step "oxaphosphetane"
    :O6 -> P1
    P1=O2 -> O2
    expect "CCOC(=O)C1C(c2ccccc2)OP1([O-])(OCC)OCC"
end
step "elimination"
    :O2 -> P1=O2
    P1-C3 -> C3=C5
    C5-O6 -> O6
end
product "CCOC(=O)C=Cc1ccccc1.CCOP(=O)([O-])OCC"
'''

# Favorskii rearrangement of 2-chlorocyclohexanone with methoxide: the enolate on the far side
# displaces chloride (a cyclopropanone), methoxide adds to its carbonyl, the tetrahedral anion
# opens the three-membered ring to the more stable carbanion, and methanol protonates it (methyl
# cyclopentanecarboxylate). Baldwin-Lusch class the enolate's own closure 3-(enolendo)-exo-tet,
# disfavoured: AR502 is the rules' verdict (the oxyallyl-cation route is drawn for that reason).
FAVORSKII = '''\
species ketone = "[O:1]=[C:2]1[CH:3]([Cl:4])CCC[CH2:5]1"
species base = "C[O-:6]"
species base_2 = "C[O-:7]"
step "enolate formation"
    :O6 -> H(C5)
    C5-H -> C2=C5
    C2=O1 -> O1
end
step "cyclopropanone"
    :O1 -> C2=O1
    C2=C5 -> C3-C5
    C3-Cl4 -> Cl4
    expect "O=C1C2CCCC12"
end
step "addition of methoxide"
    :O7 -> C2
    C2=O1 -> O1
end
step "ring opening"
    :O1 -> C2=O1
    C2-C5 -> C5
end
step "protonation"
    :C5 -> H(O6)
    O6-H -> O6
end
product "COC(=O)C1CCCC1"
'''

# Benzilic acid rearrangement: hydroxide adds to benzil, a phenyl moves to the other carbonyl
# carbon as the first C=O re-forms, and the carboxylic acid gives its proton to the alkoxide.
BENZILIC_ACID = '''\
species benzil = "c1ccccc1[C:1](=[O:2])[C:3](=[O:4])[c:5]1ccccc1"
species base = "[OH-:6]"
step "addition"
    :O6 -> C3
    C3=O4 -> O4
end
step "1,2-phenyl shift"
    :O4 -> C3=O4
    C3-C5 -> C1-C5
    C1=O2 -> O2
    expect "[O-]C(c1ccccc1)(c1ccccc1)C(=O)O"
end
step "proton transfer"
    :O2 -> H(O6)
    O6-H -> O6
end
product "OC(C(=O)[O-])(c1ccccc1)c1ccccc1"
'''

# Curtius rearrangement of acetyl azide: the methyl moves to nitrogen as N2 leaves (methyl
# isocyanate), then methanol adds and a proton moves (methyl N-methylcarbamate).
CURTIUS = '''\
species azide = "[CH3:1][C:2](=[O:3])[N-:4][N+:5]#[N:6]"
species methanol = "C[OH:7]"
step "rearrangement" over "heat"
    C2-C1 -> C1-N4
    :N4 -> C2=N4
    N4-N5 -> N5
    releases N5
    expect "CN=C=O"
end
step "addition of methanol"
    :O7 -> C2
    C2=N4 -> N4
end
step "proton transfer"
    :N4 -> H(O7)
    O7-H -> O7
end
product "CNC(=O)OC"
'''

# Swern oxidation of propan-2-ol: DMSO attacks oxalyl chloride, chloride leaves; chloride attacks
# sulfur and the leaving group falls apart to CO2, CO and chloride; the alcohol displaces chloride
# at sulfur; triethylamine takes the O-H proton and then a methyl proton (the sulfonium ylide),
# which takes the carbinol hydrogen through a five-membered ring as dimethyl sulfide leaves.
SWERN = '''\
species dmso = "[CH3:1][S+:2](C)[O-:3]"
species oxalyl = "[Cl:4][C:5](=[O:6])[C:7](=[O:8])[Cl:9]"
species alcohol = "C[CH:10](C)[OH:11]"
species base = "CC[N:12](CC)CC"
species base_2 = "CC[N:13](CC)CC"
step "acylation at oxygen"
    :O3 -> C5
    C5=O6 -> O6
end
step "loss of chloride"
    :O6 -> C5=O6
    C5-Cl4 -> Cl4
end
step "chloride at sulfur, fragmentation"
    :Cl4 -> S2
    S2-O3 -> O3=C5
    C5-C7 -> C7
    C7-Cl9 -> Cl9
    :O8 -> C7#O8
    releases C5
    releases C7
    expect "C[S+](C)Cl"
end
step "alcohol at sulfur"
    :O11 -> S2
    S2-Cl4 -> Cl4
end
step "deprotonation at oxygen"
    :N12 -> H(O11)
    O11-H -> O11
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

# Darzens condensation of ethyl chloroacetate with acetone: ethoxide makes the ester enolate, which
# adds to the ketone, and the alkoxide displaces chloride (an alpha,beta-epoxy ester).
DARZENS = '''\
species ester = "CCO[C:1](=[O:2])[CH2:3][Cl:4]"
species base = "CC[O-:5]"
species ketone = "C[C:6](C)=[O:7]"
step "enolate formation"
    :O5 -> H(C3)
    C3-H -> C1=C3
    C1=O2 -> O2
end
step "aldol-type addition"
    :O2 -> C1=O2
    C1=C3 -> C3-C6
    C6=O7 -> O7
    expect "CCOC(=O)C(Cl)C(C)(C)[O-]"
end
step "ring closure"
    :O7 -> C3
    C3-Cl4 -> Cl4
end
product "CCOC(=O)C1OC1(C)C"
'''

# Reformatsky reaction: the zinc enolate of ethyl bromoacetate adds to acetone through a
# six-membered ring (zinc moves from the ester oxygen to the ketone oxygen), and acid work-up
# takes the zinc alkoxide off (ethyl 3-hydroxy-3-methylbutanoate).
REFORMATSKY = '''\
species enolate = "CC[O:9][C:4](=[CH2:5])[O:3][Zn:2][Br:1]"
species ketone = "[CH3:6][C:7](C)=[O:8]"
species acid = "[OH3+:10]"
step "addition through a six-membered ring"
    C4=C5 -> C5-C7
    C7=O8 -> O8-Zn2
    Zn2-O3 -> C4=O3
    expect "CCOC(=O)CC(C)(C)O[Zn]Br"
end
step "work-up"
    Zn2-O8 -> O8-H(O10)
    O10-H -> O10
end
product "CCOC(=O)CC(C)(C)O"
'''

# Meerwein-Ponndorf-Verley reduction of cyclohexanone by aluminium isopropoxide: the ketone oxygen
# binds aluminium, then a hydride moves from an isopropoxide carbon to the carbonyl carbon through a
# six-membered ring, acetone leaving (aluminium cyclohexyloxide).
MEERWEIN_PONNDORF_VERLEY = '''\
species alkoxide = "C[CH:1](C)[O:2][Al:3]([O:4]C(C)C)[O:5]C(C)C"
species ketone = "[O:6]=[C:7]1CCCCC1"
step "coordination"
    :O6 -> Al3
    expect "CC(C)O[Al-](OC(C)C)(OC(C)C)[O+]=C1CCCCC1"
end
step "hydride transfer"
    C1-H -> C7-H(C1)
    C7=O6 -> O6
    Al3-O2 -> C1=O2
end
product "CC(C)=O.CC(C)O[Al](OC(C)C)OC1CCCCC1"
'''

# Anionic oxy-Cope rearrangement of hexa-1,5-dien-3-ol: potassium hydride takes the O-H proton,
# the alkoxide undergoes a [3,3] shift to the enolate, and water protonates it on carbon (hex-5-enal).
ANIONIC_OXY_COPE = '''\
species dienol = "[CH2:1]=[CH:2][CH:3]([OH:7])[CH2:4][CH:5]=[CH2:6]"
species base = "[H-:8]"
species water = "[OH2:9]"
step "deprotonation"
    :H8 -> H(O7)
    O7-H -> O7
end
step "[3,3] shift"
    C3-C4 -> C2=C3
    C1=C2 -> C1-C6
    C5=C6 -> C4=C5
    expect "C=CCCC=C[O-]"
end
step "protonation at carbon"
    :O7 -> C3=O7
    C2=C3 -> C2-H(O9)
    O9-H -> O9
end
product "C=CCCCC=O"
'''

# Tiffeneau-Demjanov ring expansion: the diazonium ion from 1-(aminomethyl)cyclohexan-1-ol loses
# N2 as a ring carbon moves to the CH2 and the hydroxyl oxygen pushes (an oxocarbenium), then water
# takes the O-H proton (cycloheptanone).
TIFFENEAU_DEMJANOV = '''\
species diazonium = "[OH:1][C:2]1([CH2:3][N+:4]#[N:5])[CH2:6]CCCC1"
species water = "[OH2:7]"
step "ring expansion"
    :O1 -> C2=O1
    C2-C6 -> C3-C6
    C3-N4 -> N4
    releases N4
    expect "[OH+]=C1CCCCCC1"
end
step "deprotonation"
    :O7 -> H(O1)
    O1-H -> O1
end
product "O=C1CCCCCC1"
'''

# Pinner reaction: HCl protonates acetonitrile on nitrogen, ethanol adds to the nitrilium ion, and
# the proton moves from oxygen to nitrogen by way of chloride (ethyl acetimidate hydrochloride).
PINNER = '''\
species nitrile = "C[C:1]#[N:2]"
species hcl = "[Cl:3][H:10]"
species ethanol = "CC[OH:4]"
step "protonation at nitrogen"
    :N2 -> H10
    Cl3-H10 -> Cl3
end
step "addition of ethanol"
    :O4 -> C1
    C1#N2 -> N2
    expect "CC[OH+]C(C)=N"
end
step "deprotonation at oxygen"
    :Cl3 -> H(O4)
    O4-H -> O4
end
step "protonation at nitrogen"
    uses hcl_2 = "[ClH:5]"
    :N2 -> H(Cl5)
    Cl5-H -> Cl5
end
product "CCOC(C)=[NH2+].[Cl-]"
'''

# Imine formation from benzaldehyde and methylamine under mild acid: the amine adds, proton
# transfers give the carbinolamine, its hydroxyl is protonated and leaves as water (the iminium),
# and water takes the N-H proton (N-benzylidenemethylamine).
IMINE_FORMATION = '''\
species aldehyde = "c1ccccc1[CH:1]=[O:2]"
species amine = "C[NH2:3]"
species acid = "[OH3+:4]"
species water = "[OH2:5]"
step "addition"
    :N3 -> C1
    C1=O2 -> O2
end
step "protonation at oxygen"
    :O2 -> H(O4)
    O4-H -> O4
end
step "deprotonation at nitrogen"
    :O4 -> H(N3)
    N3-H -> N3
    expect "CNC(O)c1ccccc1"
end
step "protonation of the hydroxyl"
    :O2 -> H(O4)
    O4-H -> O4
end
step "loss of water"
    :N3 -> C1=N3
    C1-O2 -> O2
end
step "deprotonation of the iminium"
    :O5 -> H(N3)
    N3-H -> N3
end
product "CN=Cc1ccccc1"
'''

# Transesterification of methyl acetate by ethoxide: addition to the carbonyl, then methoxide
# leaves from the tetrahedral intermediate (ethyl acetate).
TRANSESTERIFICATION = '''\
species ester = "C[C:1](=[O:2])[O:3]C"
species base = "CC[O-:4]"
step "addition"
    :O4 -> C1
    C1=O2 -> O2
end
step "loss of methoxide"
    :O2 -> C1=O2
    C1-O3 -> O3
end
product "CCOC(C)=O.C[O-]"
'''

# Schotten-Baumann acylation of methylamine by acetyl chloride: addition, loss of chloride, and
# hydroxide takes the N-H proton (N-methylacetamide).
SCHOTTEN_BAUMANN = '''\
species chloride = "C[C:1](=[O:2])[Cl:3]"
species amine = "C[NH2:4]"
species base = "[OH-:5]"
step "addition"
    :N4 -> C1
    C1=O2 -> O2
end
step "loss of chloride"
    :O2 -> C1=O2
    C1-Cl3 -> Cl3
end
step "deprotonation"
    :O5 -> H(N4)
    N4-H -> N4
end
product "CNC(C)=O.[Cl-].O"
'''

# Enamine formation from cyclohexanone and pyrrolidine with acid: addition, proton transfers, the
# protonated hydroxyl leaves (an iminium), and water takes an alpha C-H (1-(cyclohex-1-enyl)pyrrolidine).
ENAMINE_FORMATION = '''\
species ketone = "[O:1]=[C:2]1[CH2:3]CCCC1"
species amine = "C1CC[NH:4]C1"
species acid = "[OH3+:5]"
species water = "[OH2:6]"
step "addition"
    :N4 -> C2
    C2=O1 -> O1
end
step "protonation at oxygen"
    :O1 -> H(O5)
    O5-H -> O5
end
step "deprotonation at nitrogen"
    :O5 -> H(N4)
    N4-H -> N4
end
step "protonation of the hydroxyl"
    :O1 -> H(O5)
    O5-H -> O5
end
step "loss of water"
    :N4 -> C2=N4
    C2-O1 -> O1
    expect "C1CCC(=[N+]2CCCC2)CC1"
end
step "deprotonation at carbon"
    :O6 -> H(C3)
    C3-H -> C2=C3
    C2=N4 -> N4
end
product "C1=C(N2CCCC2)CCCC1"
'''

# Acid-catalysed dehydration of 4-hydroxy-4-methylpentan-2-one: the ketone enolises (O-protonation,
# then water takes an alpha C-H), the hydroxyl is protonated, the enol pushes it out as water, and
# water takes the proton of the protonated enone (mesityl oxide; an E1cB-like loss through the enol).
ACID_ALDOL_DEHYDRATION = '''\
species aldol = "[CH3:9][C:1](=[O:2])[CH2:3][C:4](C)(C)[OH:5]"
species acid = "[OH3+:6]"
species water = "[OH2:7]"
species acid_2 = "[OH3+:8]"
step "protonation of the carbonyl"
    :O2 -> H(O6)
    O6-H -> O6
end
step "enolisation"
    :O7 -> H(C3)
    C3-H -> C1=C3
    C1=O2 -> O2
end
step "protonation of the hydroxyl"
    :O5 -> H(O8)
    O8-H -> O8
end
step "loss of water"
    :O2 -> C1=O2
    C1=C3 -> C3=C4
    C4-O5 -> O5
end
step "deprotonation"
    :O6 -> H(O2)
    O2-H -> O2
end
product "CC(=O)C=C(C)C"
'''

# Iodolactonisation of pent-4-enoate: the alkene takes I+ from iodine (an iodonium ion), and the
# carboxylate opens it at the inner carbon, closing a five-membered lactone
# (5-(iodomethyl)oxolan-2-one).
IODOLACTONISATION = '''\
species acid = "[O-:1][C:2](=O)CC[CH:3]=[CH2:4]"
species iodine = "[I:5][I:6]"
step "iodonium ion"
    C3=C4 -> C4-I5
    :I5 -> C3
    I5-I6 -> I6
    expect "[O-]C(=O)CCC1C[I+]1"
end
step "ring closure"
    :O1 -> C3
    C3-I5 -> I5
end
product "O=C1CCC(CI)O1.[I-]"
'''

# Hydration of acetaldehyde in base: hydroxide adds, water protonates the alkoxide (ethane-1,1-diol).
ALDEHYDE_HYDRATE = '''\
species aldehyde = "C[CH:1]=[O:2]"
species base = "[OH-:3]"
species water = "[OH2:4]"
step "addition"
    :O3 -> C1
    C1=O2 -> O2
end
step "protonation"
    :O2 -> H(O4)
    O4-H -> O4
end
product "CC(O)O.[OH-]"
'''

# Cyanohydrin formation: cyanide adds to acetone, and the alkoxide takes the proton of HCN,
# making cyanide again (2-hydroxy-2-methylpropanenitrile).
CYANOHYDRIN = '''\
species ketone = "C[C:1](C)=[O:2]"
species cyanide = "[C-:3]#[N:4]"
species hcn = "[CH:5]#[N:6]"
step "addition"
    :C3 -> C1
    C1=O2 -> O2
end
step "proton transfer"
    :O2 -> H(C5)
    C5-H -> C5
end
product "CC(C)(O)C#N.[C-]#N"
'''

# N-Alkylation of N-methyl-p-toluenesulfonamide: carbonate takes the N-H proton, and the
# sulfonamide anion displaces iodide from iodomethane (N,N-dimethyl-p-toluenesulfonamide).
SULFONAMIDE_ALKYLATION = '''\
species sulfonamide = "Cc1ccc(cc1)S(=O)(=O)[NH:1]C"
species base = "[O-:2]C(=O)[O-]"
species iodomethane = "[CH3:3][I:4]"
step "deprotonation"
    :O2 -> H(N1)
    N1-H -> N1
end
step "substitution"
    :N1 -> C3
    C3-I4 -> I4
end
product "Cc1ccc(cc1)S(=O)(=O)N(C)C.[I-]"
'''

# [2,3]-Wittig rearrangement of benzyl allyl ether: butyllithium takes a benzylic proton, and the
# carbanion moves to the far end of the allyl group as the C-O bond breaks (1-phenylbut-3-en-1-olate).
# (Its shift was once judged a 5-endo-trig ring closure, disfavoured: AR502.)
WITTIG_2_3 = '''\
species ether = "[CH2:1]=[CH:2][CH2:3][O:4][CH2:5]c1ccccc1"
species base = "CCC[CH2-:6]"
step "deprotonation"
    :C6 -> H(C5)
    C5-H -> C5
end
step "[2,3] shift"
    :C5 -> C1-C5
    C1=C2 -> C2=C3
    C3-O4 -> O4
end
product "C=CCC([O-])c1ccccc1"
'''

# Ozonolysis after the first cycloaddition (Criegee): the primary ozonide of ethene falls apart
# in a retro-[3+2] to formaldehyde and the carbonyl oxide, which add again the other way round to
# the secondary ozonide (1,2,4-trioxolane).
CRIEGEE_OZONIDE = '''\
species primary = "[O:1]1[O:2][O:3][CH2:4][CH2:5]1"
step "cycloreversion"
    O1-O2 -> O2
    C4-C5 -> C5=O1
    :O3 -> C4=O3
    expect "C=O"
    expect "C=[O+][O-]"
end
step "cycloaddition"
    :O2 -> C5
    C5=O1 -> O1-C4
    C4=O3 -> O3
end
product "C1OCOO1"
'''

# Wolff rearrangement of 1-diazopropan-2-one (the Arndt-Eistert homologation): the methyl moves to
# the diazo carbon as N2 leaves (methylketene); water adds to the ketene carbonyl carbon, and the
# enol of the acid tautomerises through explicit proton transfers (propanoic acid).
WOLFF = '''\
species diazoketone = "[CH3:1][C:2](=[O:3])[CH-:4][N+:5]#[N:6]"
species water = "[OH2:7]"
species water_2 = "[OH2:8]"
step "rearrangement" over "Ag2O, heat"
    C2-C1 -> C1-C4
    C4-N5 -> N5
    :C4 -> C2=C4
    releases N5
    expect "CC=C=O"
end
step "addition of water"
    :O7 -> C2
    C2=O3 -> O3
end
step "proton transfer"
    :O8 -> H(O7)
    O7-H -> O7
end
step "protonation at carbon"
    :O3 -> C2=O3
    C2=C4 -> C4-H(O8)
    O8-H -> O8
end
product "CCC(=O)O"
'''

# Benzyne: amide takes the proton ortho to chlorine, chloride leaves (benzyne), amide adds, and
# ammonia protonates the aryl anion (aniline).
BENZYNE = '''\
species arene = "[Cl:1][c:2]1[cH:3][cH:4][cH:5][cH:6][cH:7]1"
species amide = "[NH2-:8]"
species ammonia = "[NH3:9]"
step "deprotonation"
    :N8 -> H(C3)
    C3-H -> C3
end
step "loss of chloride"
    :C3 -> C2#C3
    C2-Cl1 -> Cl1
end
step "addition"
    uses amide_2 = "[NH2-:10]"
    :N10 -> C2
    C2#C3 -> C3
end
step "protonation"
    :C3 -> H(N9)
    N9-H -> N9
end
product "Nc1ccccc1"
'''

# Dichlorocyclopropanation of cyclohexene: hydroxide takes the proton of chloroform, the
# trichloromethanide loses chloride (dichlorocarbene, an alpha-elimination), and the carbene adds to
# the alkene in one step, its pair to one carbon as the pi pair bonds to it from the other
# (7,7-dichlorobicyclo[4.1.0]heptane). (The deprotonation was once judged as hydroxide taking an
# alkane C-H, AR508.)
DICHLOROCARBENE = '''\
species chloroform = "[Cl:1][CH:2](Cl)Cl"
species base = "[OH-:3]"
species alkene = "[CH:4]1=[CH:5]CCCC1"
step "deprotonation"
    :O3 -> H(C2)
    C2-H -> C2
end
step "alpha-elimination"
    C2-Cl1 -> Cl1
    expect "Cl[C]Cl"
end
step "cheletropic addition"
    C4=C5 -> C2-C4
    :C2 -> C2-C5
end
product "ClC1(Cl)C2CCCCC21"
'''

# Mitsunobu esterification of (R)-butan-2-ol with benzoic acid: triphenylphosphine adds to DEAD
# (a betaine), which takes the acid's proton; the alcohol displaces the hydrazide anion at
# phosphorus, the hydrazide takes the O-H proton, and benzoate displaces triphenylphosphine oxide
# from the back ((S)-butan-2-yl benzoate, inversion).
MITSUNOBU = '''\
species alcohol = "CC[C@@H:10](C)[OH:11]"
species dead = "CCO[C:1](=O)[N:2]=[N:3][C:4](=O)OCC"
species phosphine = "c1ccccc1[P:5](c1ccccc1)c1ccccc1"
species acid = "c1ccccc1[C:6](=[O:7])[OH:8]"
step "phosphine adds to DEAD"
    :P5 -> N2
    N2=N3 -> N3
end
step "protonation of the betaine"
    :N3 -> H(O8)
    O8-H -> O8
end
step "alkoxyphosphonium ion"
    :O11 -> P5
    P5-N2 -> N2
end
step "deprotonation"
    :N2 -> H(O11)
    O11-H -> O11
end
step "SN2 with inversion"
    :O8 -> C10
    C10-O11 -> O11
end
product "CC[C@H](C)OC(=O)c1ccccc1.[O-][P+](c1ccccc1)(c1ccccc1)c1ccccc1.CCOC(=O)NNC(=O)OCC"
'''

# Michaelis-Arbuzov reaction: triethyl phosphite displaces iodide from iodomethane (a phosphonium
# ion), and iodide takes an ethyl group off oxygen in an SN2 as the C-O pair makes the P=O bond
# (diethyl methylphosphonate and iodoethane).
ARBUZOV = '''\
species phosphite = "C[CH2:5][O:1][P:2](OCC)OCC"
species iodomethane = "[CH3:3][I:4]"
step "alkylation at phosphorus"
    :P2 -> C3
    C3-I4 -> I4
    expect "CCO[P+](C)(OCC)OCC"
end
step "dealkylation"
    :I4 -> C5
    C5-O1 -> P2=O1
end
product "CCOP(C)(=O)OCC.CCI"
'''

# Staudinger reaction: triphenylphosphine adds to the terminal nitrogen of methyl azide (a
# phosphazide), which gives N2 off through a four-membered cyclic transition state (the
# iminophosphorane, drawn P=N).
STAUDINGER = '''\
species azide = "[CH3:1][N:2]=[N+:3]=[N-:4]"
species phosphine = "c1ccccc1[P:5](c1ccccc1)c1ccccc1"
step "addition"
    :P5 -> P5-N4
    N3=N4 -> N3
end
step "loss of nitrogen"
    :N4 -> N3#N4
    P5-N4 -> N3#N4
    N2=N3 -> N2=P5
    N2-N3 -> N2=P5
end
product "CN=P(c1ccccc1)(c1ccccc1)c1ccccc1.N#N"
'''

# Allylic bromination of cyclohexene (Wohl-Ziegler chain): a bromine atom takes an allylic
# hydrogen; the allyl radical, drawn in its other resonance form, takes a bromine atom from Br2.
ALLYLIC_BROMINATION = '''\
species alkene = "[CH:1]1=[CH:2][CH2:3]CCC1"
species bromine_atom = "[Br:4]"
species bromine = "[Br:5][Br:6]"
step "hydrogen abstraction"
    .Br4 ~> H(C3)
    C3-H ~> Br4-H(C3)
    C3-H ~> C3
end
step "allyl radical" resonance
    .C3 ~> C2=C3
    C1=C2 ~> C2=C3
    C1=C2 ~> C1
end
step "bromine transfer"
    .C1 ~> Br5
    Br5-Br6 ~> C1-Br5
    Br5-Br6 ~> Br6
end
product "BrC1C=CCCC1.Br"
'''

# Conjugate (1,4-) addition of HBr to buta-1,3-diene: protonation at C1 gives the allyl cation,
# drawn in its other resonance form, and bromide adds at C4 (1-bromobut-2-ene).
CONJUGATE_HBR_ADDITION = '''\
species diene = "[CH2:1]=[CH:2][CH:3]=[CH2:4]"
species hbr = "[Br:5][H:6]"
step "protonation"
    C1=C2 -> C1-H6
    Br5-H6 -> Br5
end
step "allyl cation" resonance
    C3=C4 -> C2=C3
end
step "capture at C4"
    :Br5 -> C4
end
product "CC=CCBr"
'''

# Nazarov cyclisation of penta-1,4-dien-3-one: the O-protonated dienone (a pentadienyl cation)
# closes conrotatorily, a 4-electron electrocyclic ring closure, to the hydroxyallyl cation; water
# takes a proton next to it (the dienol), and the enol is protonated on carbon and gives up its O-H
# proton (cyclopent-2-en-1-one). (The closure was once judged 5-endo-trig, disfavoured: AR502.)
NAZAROV = '''\
species dienone = "[CH2:1]=[CH:2][C:3](=[O:6])[CH:4]=[CH2:5]"
species acid = "[OH3+:7]"
species water = "[OH2:8]"
step "protonation"
    :O6 -> H(O7)
    O7-H -> O7
end
step "4-electron electrocyclisation"
    C1=C2 -> C1-C5
    C4=C5 -> C3=C4
    C3=O6 -> O6
    expect "OC1=CC[CH2][CH+]1"
end
step "deprotonation"
    :O8 -> H(C1)
    C1-H -> C1=C2
end
step "protonation at carbon"
    :O6 -> C3=O6
    C3=C4 -> C4-H(O8)
    O8-H -> O8
end
step "deprotonation at oxygen"
    :O7 -> H(O6)
    O6-H -> O6
end
product "O=C1C=CCC1"
'''

# Pictet-Spengler reaction of 2-phenylethylamine's iminium with formaldehyde (N-methylidene
# 2-phenylethaniminium): the arene's pi pair bonds to the iminium carbon, closing a six-membered ring
# (6-endo-trig onto the iminium), and water takes the proton to restore the arene
# (1,2,3,4-tetrahydroisoquinoline).
PICTET_SPENGLER = '''\
species iminium = "[cH:1]1[c:2]([CH2:3][CH2:4][NH+:5]=[CH2:6])cccc1"
species water = "[OH2:7]"
step "ring closure"
    C1=C2 -> C1-C6
    C6=N5 -> N5
end
step "rearomatisation"
    :O7 -> H(C1)
    C1-H -> C1=C2
end
product "C1Cc2ccccc2CN1"
'''

# Morita-Baylis-Hillman reaction of methyl acrylate and benzaldehyde: DABCO adds to the acrylate
# (an ammonium enolate), the enolate adds to the aldehyde, a proton moves from carbon to the
# alkoxide, and the enolate so made expels DABCO (E1cB).
BAYLIS_HILLMAN = '''\
species acrylate = "[CH2:1]=[CH:2][C:3](=[O:4])OC"
species dabco = "C1C[N:5]2CC[N:6]1CC2"
species aldehyde = "c1ccccc1[CH:7]=[O:8]"
step "conjugate addition"
    :N5 -> C1
    C1=C2 -> C2=C3
    C3=O4 -> O4
end
step "aldol addition"
    :O4 -> C3=O4
    C2=C3 -> C2-C7
    C7=O8 -> O8
end
step "proton transfer"
    :O8 -> H(C2)
    C2-H -> C2=C3
    C3=O4 -> O4
end
step "elimination of DABCO"
    :O4 -> C3=O4
    C2=C3 -> C1=C2
    C1-N5 -> N5
end
product "C=C(C(O)c1ccccc1)C(=O)OC"
'''

# Cope elimination of N,N-dimethylbutan-2-amine N-oxide: the oxide takes a beta hydrogen through a
# five-membered ring as the C-N bond breaks (syn elimination; but-1-ene and but-2-ene can form;
# the methyl hydrogen is taken here) and N,N-dimethylhydroxylamine leaves.
COPE_ELIMINATION = '''\
species oxide = "C[N+:1](C)([O-:2])[CH:3]([CH3:4])[CH2:5]C"
step "syn elimination" over "heat"
    :O2 -> H(C4)
    C4-H -> C3=C4
    C3-N1 -> N1
end
product "C=CCC.CN(C)O"
'''

# Pummerer rearrangement of dimethyl sulfoxide with acetic anhydride: the sulfoxide oxygen is
# acylated (acetate leaves), acetate takes a methyl proton as acetate leaves from sulfur (a thionium
# ion, in one E2-like step), and acetate adds to its carbon (acetoxymethyl methyl sulfide).
PUMMERER = '''\
species sulfoxide = "[CH3:1][S+:2](C)[O-:3]"
species anhydride = "C[C:4](=[O:5])[O:6]C(C)=O"
step "acylation at oxygen"
    :O3 -> C4
    C4=O5 -> O5
end
step "loss of acetate"
    :O5 -> C4=O5
    C4-O6 -> O6
end
step "thionium ion"
    :O6 -> H(C1)
    C1-H -> C1=S2
    S2-O3 -> O3
    expect "C=[S+]C"
end
step "addition of acetate"
    :O3 -> C1
    C1=S2 -> S2
end
product "CSCOC(C)=O.CC(=O)O"
'''

# Reduction of methyl benzoate by lithium aluminium hydride: hydride adds to the ester carbonyl,
# methoxide leaves (benzaldehyde), a second hydride adds, and acid work-up protonates the alkoxide
# (benzyl alcohol).
ESTER_REDUCTION = '''\
species ester = "c1ccccc1[C:1](=[O:2])[O:3]C"
species alanate = "[AlH4-:4]"
step "hydride addition"
    Al4-H -> C1-H(Al4)
    C1=O2 -> O2
end
step "loss of methoxide"
    :O2 -> C1=O2
    C1-O3 -> O3
    expect "O=Cc1ccccc1"
end
step "second hydride addition"
    uses alanate_2 = "[AlH4-:5]"
    Al5-H -> C1-H(Al5)
    C1=O2 -> O2
end
step "work-up"
    uses acid = "[OH3+:6]"
    :O2 -> H(O6)
    O6-H -> O6
end
product "OCc1ccccc1"
'''

# Peterson olefination: (trimethylsilyl)methanide adds to acetone, the alkoxide bonds to silicon
# (a four-membered ring with a five-coordinate silicate), and the ring falls apart in a syn
# elimination (2-methylpropene and trimethylsilanolate).
PETERSON = '''\
species carbanion = "[CH2-:2][Si:1](C)(C)C"
species ketone = "C[C:3](C)=[O:4]"
step "addition"
    :C2 -> C3
    C3=O4 -> O4
end
step "silicate"
    :O4 -> Si1
end
step "syn elimination"
    C2-Si1 -> C2=C3
    C3-O4 -> O4
end
product "C=C(C)C.C[Si](C)(C)[O-]"
'''

# Bromination of pyrrole at C2: the nitrogen lone pair pushes through the ring as C2 takes Br+ from
# bromine (an iminium sigma complex), and bromide takes the C2 proton (2-bromopyrrole).
PYRROLE_BROMINATION = '''\
species pyrrole = "[nH:1]1[cH:2][cH:3][cH:4][cH:5]1"
species bromine = "[Br:6][Br:7]"
step "attack at C2"
    :N1 -> N1=C5
    C4=C5 -> C3=C4
    C2=C3 -> C2-Br6
    Br6-Br7 -> Br7
end
step "rearomatisation"
    :Br7 -> H(C2)
    C2-H -> C2=C3
    C3=C4 -> C4=C5
    N1=C5 -> N1
end
product "Brc1ccc[nH]1.Br"
'''

# Appel reaction: triphenylphosphine takes a bromine from CBr4 (a bromophosphonium and the
# tribromomethanide), the carbanion takes the alcohol's proton (bromoform), the alkoxide displaces
# bromide at phosphorus (an alkoxyphosphonium), and bromide displaces the phosphine oxide at carbon
# (SN2): 1-bromobutane, Ph3P+-O- (the oxide written as its ylide form) and CHBr3.
APPEL = '''\
species phosphine = "c1ccc(cc1)[P:1](c1ccccc1)c1ccccc1"
species tetrabromomethane = "[Br:2][C:3]([Br:4])([Br:5])[Br:6]"
species butanol = "CCC[CH2:7][OH:8]"
step "phosphine takes bromine"
    :P1 -> Br2
    C3-Br2 -> C3
end
step "alkoxide"
    :C3 -> H(O8)
    O8-H -> O8
end
step "alkoxyphosphonium"
    :O8 -> P1
    P1-Br2 -> Br2
end
step "bromide displaces the oxide"
    :Br2 -> C7
    C7-O8 -> O8
end
product "CCCCBr"
'''

# Thermal decomposition of AIBN (azobisisobutyronitrile), the common radical initiator: both C-N
# bonds split evenly, their inner electrons pairing up into the new N-N pi bonds of N2, leaving two
# 2-cyano-2-propyl radicals.
AIBN = '''\
species initiator = "N#C[C:1](C)(C)[N:2]=[N:3][C:4](C)(C)C#N"
step "homolysis" under "heat"
    C1-N2 ~> C1
    C1-N2 ~> N2#N3
    C4-N3 ~> C4
    C4-N3 ~> N2#N3
end
product "C[C](C)C#N"
'''

# N-Acetylation of ethylamine by acetic anhydride with pyridine as the base: the amine adds to a
# carbonyl carbon (a zwitterionic tetrahedral intermediate), the intermediate collapses and expels
# acetate, and pyridine takes the proton from the acylammonium ion (N-ethylacetamide, acetate and
# pyridinium).
ACETYLATION = '''\
species amine = "CC[NH2:1]"
species anhydride = "C[C:2](=[O:3])[O:4][C:5](C)=O"
species pyridine = "c1cc[n:6]cc1"
step "addition"
    :N1 -> C2
    C2=O3 -> O3
end
step "collapse"
    :O3 -> C2=O3
    C2-O4 -> O4
end
step "deprotonation"
    :N6 -> H(N1)
    N1-H -> N1
end
product "CCNC(C)=O"
'''

# Azo coupling of benzenediazonium with phenoxide: a ring carbon para to the oxygen attacks the
# terminal nitrogen (the sigma complex is a neutral dienone), and water takes the proton, which
# restores the aromatic ring (4-hydroxyazobenzene, as its phenoxide).
AZO_COUPLING = '''\
species diazonium = "c1ccc(cc1)[N+:1]#[N:2]"
species phenoxide = "[O-:3][c:4]1[cH:5][cH:6][c:7]([H:10])[cH:8][cH:9]1"
step "attack at the terminal nitrogen"
    :O3 -> C4=O3
    C4=C5 -> C5=C6
    C6=C7 -> C7-N2
    N2#N1 -> N1
end
step "rearomatisation"
    uses water = "[OH2:11]"
    :O11 -> H(C7)
    C7-H -> C6=C7
    C5=C6 -> C4=C5
    C4=O3 -> O3
end
product "[O-]c1ccc(cc1)/N=N/c1ccccc1"
'''

# Intramolecular Friedel-Crafts acylation: the acylium ion of 4-phenylbutanoic acid (made with
# AlCl3) closes a six-membered ring onto the ortho carbon, and the arenium ion loses its proton
# (1-tetralone).
INTRAMOLECULAR_ACYLATION = '''\
species acylium = "[O:11]=[C+:10][CH2:9][CH2:8][CH2:7][C:6]1=[CH:5][CH:4]=[CH:3][CH:2]=[CH:1]1"
step "ring closure at the ortho carbon" under "AlCl3"
    C5=C6 -> C5-C10
end
step "rearomatisation"
    uses water = "[OH2:12]"
    :O12 -> H(C5)
    C5-H -> C5=C6
end
product "O=C1CCCc2ccccc21"
'''

# Robinson annulation of 2-methylcyclohexanone with methyl vinyl ketone: the more substituted
# (thermodynamic) enolate adds to MVK, the new methyl ketone's enolate closes the six-membered ring
# onto the ring ketone, and E1cB dehydration gives the octalone (4a-methyl-4,4a,5,6,7,8-hexahydro-
# naphthalen-2(3H)-one).
ROBINSON_METHYLCYCLOHEXANONE = '''\
species ketone = "[CH3:7][CH:6]1[CH2:5][CH2:4][CH2:3][CH2:2][C:1]1=[O:8]"
species mvk = "[CH2:9]=[CH:10][C:11](=[O:12])[CH3:13]"
species base = "CC[O-:14]"
step "enolate (more substituted side)" reversible over "NaOEt" under "EtOH"
    :O14 -> H(C6)
    C6-H -> C1=C6
    C1=O8 -> O8
end
step "conjugate addition"
    :O8 -> C1=O8
    C1=C6 -> C6-C9
    C9=C10 -> C10=C11
    C11=O12 -> O12
end
step "protonation of the enolate at carbon" reversible
    :O12 -> C11=O12
    C10=C11 -> C10-H(O14)
    O14-H -> O14
end
step "enolate at the methyl ketone" reversible
    :O14 -> H(C13)
    C13-H -> C11=C13
    C11=O12 -> O12
end
step "ring-closing aldol" reversible
    :O12 -> C11=O12
    C11=C13 -> C13-C1
    C1=O8 -> O8
end
step "protonation of the alkoxide" reversible
    :O8 -> H(O14)
    O14-H -> O14
end
step "enolate for dehydration" reversible
    :O14 -> H(C13)
    C13-H -> C11=C13
    C11=O12 -> O12
end
step "E1cB"
    :O12 -> C11=O12
    C11=C13 -> C13=C1
    C1-O8 -> O8
end
product "CC12CCCCC1=CC(=O)CC2"
'''

# Acid-catalysed hydrolysis of ethyl acetate (AAC2): the protonated carbonyl takes water, a proton
# moves to the ethoxy oxygen, ethanol leaves and the protonated acid loses its proton.
ACID_ESTER_HYDROLYSIS = '''\
species ester = "[CH3:1][C:2](=[O:3])[O:4][CH2:5][CH3:6]"
species acid = "[OH3+:7]"
species water = "[OH2:8]"
step "protonation of the carbonyl" reversible over "H3O+ (cat.)"
    :O3 -> H(O7)
    O7-H -> O7
end
step "water adds" reversible
    :O8 -> C2
    C2=O3 -> O3
end
step "proton off the new OH" reversible
    :O7 -> H(O8)
    O8-H -> O8
end
step "proton onto the ethoxy oxygen" reversible
    uses acid_2 = "[OH3+:9]"
    :O4 -> H(O9)
    O9-H -> O9
end
step "ethanol leaves" reversible
    :O3 -> C2=O3
    C2-O4 -> O4
    releases O4
end
step "deprotonation" reversible
    :O9 -> H(O3)
    O3-H -> O3
end
product "CC(=O)O"
'''

# Henry (nitroaldol) reaction: triethylamine makes the nitronate of nitromethane, which adds to
# benzaldehyde; the alkoxide takes the proton back (2-nitro-1-phenylethanol).
HENRY = '''\
species nitro = "[CH3:1][N+:2](=[O:3])[O-:4]"
species base = "CC[N:5](CC)CC"
species aldehyde = "c1ccccc1[CH:6]=[O:7]"
step "nitronate formation" reversible over "Et3N"
    :N5 -> H(C1)
    C1-H -> C1=N2
    N2=O3 -> O3
end
step "addition to the aldehyde" reversible
    :O3 -> N2=O3
    C1=N2 -> C1-C6
    C6=O7 -> O7
end
step "proton transfer"
    :O7 -> H(N5)
    N5-H -> N5
end
product "OC(C[N+](=O)[O-])c1ccccc1"
'''

# Acid-catalysed ring closure of 5-hydroxypentanal to the cyclic hemiacetal (tetrahydropyran-2-ol),
# as sugars close to pyranoses.
CYCLIC_HEMIACETAL = '''\
species chain = "[O:1]=[CH:2][CH2:3][CH2:4][CH2:5][CH2:6][OH:7]"
species acid = "[OH3+:8]"
step "protonation of the carbonyl" reversible
    :O1 -> H(O8)
    O8-H -> O8
end
step "ring closure" reversible
    :O7 -> C2
    C2=O1 -> O1
end
step "loss of the proton" reversible
    :O8 -> H(O7)
    O7-H -> O7
end
product "OC1CCCCO1"
'''

# 2-Chloroethylamine closes to aziridine: the amine displaces chloride intramolecularly (3-exo-tet)
# and hydroxide takes the proton from the aziridinium ion.
AZIRIDINE_CLOSURE = '''\
species amine = "[NH2:1][CH2:2][CH2:3][Cl:4]"
species base = "[OH-:5]"
step "intramolecular substitution"
    :N1 -> C3
    C3-Cl4 -> Cl4
end
step "deprotonation"
    :O5 -> H(N1)
    N1-H -> N1
end
product "C1CN1"
'''

# Claisen-Schmidt condensation: acetone's enolate adds to benzaldehyde and the aldol dehydrates by
# E1cB to (E)-4-phenylbut-3-en-2-one (benzalacetone).
CLAISEN_SCHMIDT = '''\
species ketone = "[CH3:1][C:2](=[O:3])[CH3:4]"
species base = "[OH-:5]"
species aldehyde = "c1ccccc1[CH:6]=[O:7]"
step "enolate" reversible over "NaOH" under "EtOH, H2O"
    :O5 -> H(C1)
    C1-H -> C1=C2
    C2=O3 -> O3
end
step "addition" reversible
    :O3 -> C2=O3
    C1=C2 -> C1-C6
    C6=O7 -> O7
end
step "proton transfer" reversible
    :O7 -> H(O5)
    O5-H -> O5
end
step "second enolate" reversible
    :O5 -> H(C1)
    C1-H -> C1=C2
    C2=O3 -> O3
end
step "E1cB"
    :O3 -> C2=O3
    C1=C2 -> C1=C6
    C6-O7 -> O7
end
product "CC(=O)/C=C/c1ccccc1"
'''

# Butyllithium adds to acetone: the C-Li pair makes the C-C bond and the alkoxide binds lithium
# (the lithium alkoxide of 2-methylhexan-2-ol).
ORGANOLITHIUM_ADDITION = '''\
species buli = "CCC[CH2:1][Li:2]"
species ketone = "C[C:3](=[O:4])C"
step "addition"
    C1-Li2 -> C1-C3
    C3=O4 -> O4
end
step "lithium alkoxide"
    :O4 -> Li2
end
product "CCCCC(C)(C)O[Li]"
'''

# Methyl ester from acetic acid and diazomethane: the acid protonates diazomethane at carbon (its
# C=N pair takes the proton as N=N- becomes N#N+), and the carboxylate displaces N2 from the
# methyldiazonium ion.
DIAZOMETHANE_ESTERIFICATION = '''\
species acid = "C[C:1](=[O:2])[OH:3]"
species diazomethane = "[CH2:4]=[N+:5]=[N-:6]"
step "proton transfer to carbon"
    :N6 -> N5#N6
    C4=N5 -> C4-H(O3)
    O3-H -> O3
end
step "substitution with loss of nitrogen"
    :O3 -> C4
    C4-N5 -> N5
    releases N5
end
product "CC(=O)OC"
'''

# Acid-catalysed opening of 2,2-dimethyloxirane by methanol: the protonated epoxide is attacked at
# the more substituted carbon (2-methoxy-2-methylpropan-1-ol).
ACID_EPOXIDE_OPENING = '''\
species epoxide = "C[C:1]1(C)[CH2:2][O:3]1"
species acid = "[OH3+:4]"
species methanol = "C[OH:5]"
step "protonation of the epoxide" reversible
    :O3 -> H(O4)
    O4-H -> O4
end
step "methanol at the more substituted carbon"
    :O5 -> C1
    C1-O3 -> O3
end
step "deprotonation"
    :O4 -> H(O5)
    O5-H -> O5
end
product "COC(C)(C)CO"
'''

# Ionic addition of HBr to propene: protonation at the terminal carbon gives the secondary cation
# (Markovnikov), which bromide captures (2-bromopropane).
MARKOVNIKOV_HBR = '''\
species propene = "C[CH:1]=[CH2:2]"
species hbr = "[H:3][Br:4]"
step "protonation at the terminal carbon"
    C1=C2 -> C2-H3
    H3-Br4 -> Br4
end
step "bromide captures the cation"
    :Br4 -> C1
end
product "CC(C)Br"
'''

# Diels-Alder of cyclopentadiene with acrolein: three arrows round the six-membered cyclic array make
# the bicyclo[2.2.1] adduct (5-norbornene-2-carbaldehyde, endo and exo not told apart by the bookkeeping).
CYCLOPENTADIENE_DIELS_ALDER = '''\
species diene = "[CH:1]1=[CH:2][CH:3]=[CH:4][CH2:5]1"
species dienophile = "[CH2:6]=[CH:7][CH:8]=O"
step "cycloaddition" under "heat"
    C1=C2 -> C2=C3
    C3=C4 -> C4-C6
    C6=C7 -> C7-C1
end
product "O=CC1CC2C=CC1C2"
'''

# Acid chloride from acetic acid and thionyl chloride: the acid oxygen attacks sulfur, chloride
# leaves (an acyl chlorosulfite, protonated), chloride takes the proton, chloride adds to the
# carbonyl carbon, and the tetrahedral intermediate expels SO2 and chloride (acetyl chloride).
THIONYL_CHLORIDE = '''\
species acid = "C[C:1](=[O:2])[OH:3]"
species thionyl = "[O:4]=[S:5]([Cl:6])[Cl:7]"
step "attack at sulfur"
    :O3 -> S5
    S5=O4 -> O4
end
step "loss of chloride"
    :O4 -> S5=O4
    S5-Cl6 -> Cl6
end
step "deprotonation"
    :Cl6 -> H(O3)
    O3-H -> O3
end
step "chloride adds"
    uses chloride = "[Cl-:8]"
    :Cl8 -> C1
    C1=O2 -> O2
end
step "collapse"
    :O2 -> C1=O2
    C1-O3 -> O3=S5
    S5-Cl7 -> Cl7
end
product "CC(=O)Cl.O=S=O"
'''

# Birch reduction of benzene (sodium in ammonia with ethanol): an electron onto the ring gives the
# radical anion, ethanol protonates its carbanion, a second electron makes the pentadienyl anion
# with its charge para to the new CH2, and a second protonation gives cyclohexa-1,4-diene, the
# textbook product (not the conjugated 1,3-diene). The electrons from sodium end on carbon with no
# bond to sodium (`:C1`), and the ring's pi pair splits in two fishhooks.
BIRCH = '''\
species benzene = "[CH:1]1=[CH:2][CH:3]=[CH:4][CH:5]=[CH:6]1"
species sodium = "[Na:7]"
species ethanol = "CC[O:8][H:9]"
step "electron transfer"
    .Na7 ~> :C1
    C1=C2 ~> C1
    C1=C2 ~> C2
end
step "protonation"
    :C1 -> H9
    O8-H9 -> O8
end
step "second electron transfer"
    uses sodium2 = "[Na:10]"
    .C2 ~> C2=C3
    C3=C4 ~> C2=C3
    C3=C4 ~> C4
    .Na10 ~> :C4
end
step "second protonation"
    uses ethanol2 = "CC[O:11][H:12]"
    :C4 -> H12
    O11-H12 -> O11
end
product "C1=CCC=CC1"
'''

# A beta-keto acid (acetoacetic acid) loses CO2 on heating through a six-membered cyclic array: the
# ketone oxygen takes the acid proton as C3-C4 breaks, giving the enol of acetone and CO2.
BETA_KETO_ACID_DECARBOXYLATION = '''\
species acid = "[CH3:8][C:1](=[O:2])[CH2:3][C:4](=[O:5])[O:6][H:7]"
step "decarboxylation" under "heat"
    C1=O2 -> O2-H7
    O6-H7 -> C4=O6
    C3-C4 -> C1=C3
end
product "CC(O)=C.O=C=O"
'''

# Ester pyrolysis (Ei): ethyl acetate on strong heating gives ethene and acetic acid, the carbonyl
# oxygen taking a beta hydrogen through a six-membered cyclic array (a syn elimination).
ESTER_PYROLYSIS = '''\
species ester = "[CH3:9][C:1](=[O:2])[O:3][CH2:4][CH2:5][H:6]"
step "syn elimination" under "500 °C"
    C1=O2 -> O2-H6
    C5-H6 -> C4=C5
    C4-O3 -> C1=O3
end
product "C=C.CC(=O)O"
'''

# Ritter reaction: the tert-butyl cation is caught by acetonitrile's nitrogen; water adds to the
# nitrilium ion, and proton transfers and a tautomerisation give N-tert-butylacetamide.
RITTER = '''\
species cation = "[CH3:10][C+:1]([CH3:11])[CH3:12]"
species nitrile = "[CH3:13][C:2]#[N:3]"
step "nitrile attacks the cation"
    :N3 -> C1
end
step "water adds to the nitrilium ion"
    uses water = "[OH2:4]"
    :O4 -> C2
    C2#N3 -> N3
end
step "deprotonation"
    uses water2 = "[OH2:5]"
    :O5 -> H(O4)
    O4-H -> O4
end
step "tautomerisation"
    :N3 -> H(O5)
    O5-H -> O5
    releases O5
end
step "amide"
    :O4 -> C2=O4
    C2=N3 -> N3
end
step "deprotonation of the amide"
    uses water3 = "[OH2:14]"
    :O14 -> H(O4)
    O4-H -> O4
end
product "CC(=O)NC(C)(C)C.[OH3+]"
'''

# Wagner-Meerwein 1,2-methyl shift: the 3,3-dimethyl-2-butyl cation becomes the tertiary
# 2,3-dimethyl-2-butyl cation, which loses a proton to water (2,3-dimethylbut-2-ene).
METHYL_SHIFT = '''\
species cation = "[CH3:5][CH+:1][C:2]([CH3:3])([CH3:6])[CH3:7]"
step "1,2-methyl shift"
    C2-C3 -> C1-C3
end
step "deprotonation"
    uses water = "[OH2:8]"
    :O8 -> H(C1)
    C1-H -> C1=C2
end
product "CC(C)=C(C)C.[OH3+]"
'''

# Prins reaction: protonated formaldehyde adds to 2-methylpropene at its CH2 end (the tertiary
# cation), water captures the cation, and a proton transfer gives 3-methylbutane-1,3-diol.
PRINS = '''\
species oxonium = "[CH2:1]=[OH+:2]"
species alkene = "[CH2:3]=[C:4]([CH3:5])[CH3:6]"
step "alkene attacks"
    C3=C4 -> C1-C3
    C1=O2 -> O2
end
step "water captures the cation"
    uses water = "[OH2:7]"
    :O7 -> C4
end
step "deprotonation"
    uses water2 = "[OH2:8]"
    :O8 -> H(O7)
    O7-H -> O7
end
product "CC(C)(O)CCO.[OH3+]"
'''

# Intramolecular Williamson ether synthesis: 4-chlorobutoxide closes tetrahydrofuran (5-exo-tet).
INTRAMOLECULAR_WILLIAMSON = '''\
species alkoxide = "[O-:1][CH2:2][CH2:3][CH2:4][CH2:5][Cl:6]"
step "ring closure"
    :O1 -> C5
    C5-Cl6 -> Cl6
end
product "C1CCOC1.[Cl-]"
'''

# Malonic ester synthesis, alkylation: ethoxide forms the enolate of diethyl malonate, which
# takes a methyl group from iodomethane (SN2) to give diethyl methylmalonate.
MALONIC_ESTER_ALKYLATION = '''\
species malonate = "[CH3:20][CH2:21][O:22][C:1](=[O:2])[CH2:3][C:4](=[O:5])[O:23][CH2:24][CH3:25]"
species ethoxide = "[CH3:26][CH2:27][O-:6]"
step "enolate formation" reversible
    :O6 -> H(C3)
    C3-H -> C3=C1
    C1=O2 -> O2
end
step "alkylation"
    uses iodomethane = "[CH3:7][I:8]"
    C3=C1 -> C3-C7
    :O2 -> C1=O2
    C7-I8 -> I8
end
product "CCOC(=O)C(C)C(=O)OCC.CCO.[I-]"
'''

# Paal-Knorr furan synthesis: hexane-2,5-dione in aqueous acid; one carbonyl enolises, its enol
# oxygen closes onto the other (protonated) carbonyl, and loss of water and a proton gives
# 2,5-dimethylfuran.
PAAL_KNORR = '''\
species dione = "[CH3:7][C:1](=[O:2])[CH2:3][CH2:4][C:5](=[O:6])[CH3:8]"
species acid = "[OH3+:9]"
step "protonation" reversible
    :O2 -> H(O9)
    O9-H -> O9
end
step "enolisation" reversible
    :O9 -> H(C3)
    C3-H -> C3=C1
    C1=O2 -> O2
end
step "second protonation" reversible
    uses acid2 = "[OH3+:10]"
    :O6 -> H(O10)
    O10-H -> O10
end
step "enol oxygen closes the ring"
    :O2 -> C5
    C5=O6 -> O6
end
step "deprotonation" reversible
    :O10 -> H(O2)
    O2-H -> O2
end
step "loss of water"
    uses acid3 = "[OH3+:11]"
    :O6 -> H(O11)
    O11-H -> O11
end
step "oxocarbenium"
    :O2 -> C5=O2
    C5-O6 -> O6
    releases O6
end
step "aromatisation"
    :O11 -> H(C4)
    C4-H -> C4=C5
    C5=O2 -> O2
end
product "Cc1ccc(C)o1"
'''

# Strecker synthesis, the C-C bond: cyanide adds to the iminium ion of acetaldehyde and ammonia,
# giving 2-aminopropanenitrile (racemic).
STRECKER = '''\
species iminium = "[CH3:5][CH:1]=[NH2+:2]"
species cyanide = "[C-:3]#[N:4]"
step "cyanide adds"
    :C3 -> C1
    C1=N2 -> N2
end
product "CC(N)C#N"
'''

# Acid-catalysed lactonisation: 5-hydroxypentanoic acid closes to delta-valerolactone through a
# tetrahedral intermediate (6-exo-trig onto the protonated carbonyl), losing water.
LACTONISATION = '''\
species acid = "[OH:1][CH2:2][CH2:3][CH2:4][CH2:5][C:6](=[O:7])[OH:8]"
species h3o = "[OH3+:9]"
step "protonation" reversible
    :O7 -> H(O9)
    O9-H -> O9
end
step "ring closure" reversible
    :O1 -> C6
    C6=O7 -> O7
end
step "proton shuttle" reversible
    :O9 -> H(O1)
    O1-H -> O1
end
step "protonation of OH" reversible
    uses h3o2 = "[OH3+:10]"
    :O8 -> H(O10)
    O10-H -> O10
end
step "loss of water"
    :O7 -> C6=O7
    C6-O8 -> O8
    releases O8
end
step "deprotonation"
    :O10 -> H(O7)
    O7-H -> O7
end
product "O=C1CCCCO1"
'''

# Acetylide alkylation: amide takes propyne's terminal proton, and the acetylide displaces bromide
# from bromoethane (SN2), giving pent-2-yne.
ACETYLIDE_ALKYLATION = '''\
species propyne = "[CH3:5][C:1]#[C:2][H:3]"
species amide = "[NH2-:4]"
step "deprotonation"
    :N4 -> H3
    C2-H3 -> C2
end
step "alkylation"
    uses bromoethane = "[CH3:8][CH2:6][Br:7]"
    :C2 -> C6
    C6-Br7 -> Br7
end
product "CC#CCC.N.[Br-]"
'''

# Acid-catalysed hydration of propyne (Markovnikov): protonation gives the secondary vinyl cation,
# water adds, and the enol tautomerises through its oxocarbenium ion to acetone.
ALKYNE_HYDRATION = '''\
species propyne = "[CH3:5][C:1]#[CH:2]"
species h3o = "[OH3+:3]"
step "protonation"
    C1#C2 -> C2-H(O3)
    O3-H -> O3
end
step "water adds"
    uses water = "[OH2:4]"
    :O4 -> C1
end
step "deprotonation"
    :O3 -> H(O4)
    O4-H -> O4
end
step "enol protonation"
    uses h3o2 = "[OH3+:6]"
    :O4 -> C1=O4
    C1=C2 -> C2-H(O6)
    O6-H -> O6
end
step "deprotonation of the oxocarbenium"
    :O6 -> H(O4)
    O4-H -> O4
end
product "CC(C)=O"
'''

# 1,3-Dipolar cycloaddition of benzonitrile oxide to ethene (three arrows round five atoms):
# 3-phenyl-4,5-dihydroisoxazole.
NITRILE_OXIDE_CYCLOADDITION = '''\
species dipole = "c1ccccc1[C:1]#[N+:2][O-:3]"
species alkene = "[CH2:4]=[CH2:5]"
step "cycloaddition"
    :O3 -> O3-C4
    C4=C5 -> C5-C1
    C1#N2 -> N2
end
product "C1CC(c2ccccc2)=NO1"
'''

# Oxime formation: hydroxylamine's nitrogen adds to acetone, proton transfers make the
# carbinolamine and protonate its OH, water leaves and deprotonation gives acetone oxime.
OXIME_FORMATION = '''\
species acetone = "[CH3:8][C:1](=[O:2])[CH3:9]"
species hydroxylamine = "[NH2:3][OH:4]"
step "addition"
    :N3 -> C1
    C1=O2 -> O2
end
step "proton transfer"
    :O2 -> H(N3)
    N3-H -> N3
end
step "protonation"
    uses h3o = "[OH3+:5]"
    :O2 -> H(O5)
    O5-H -> O5
end
step "loss of water"
    :N3 -> C1=N3
    C1-O2 -> O2
    releases O2
end
step "deprotonation"
    :O5 -> H(N3)
    N3-H -> N3
end
product "CC(C)=NO"
'''

# A suprafacial [1,5]-hydrogen shift in (Z)-penta-1,3-diene: the hydrogen moves from C5 to C1 round
# a six-membered cyclic array (degenerate: the product is (Z)-penta-1,3-diene again).
HYDROGEN_SHIFT_1_5 = '''\
species diene = "[CH2:1]=[CH:2]/[CH:3]=[CH:4]\\[CH2:5][H:6]"
step "[1,5]-H shift" under "heat"
    C5-H6 -> C4=C5
    C3=C4 -> C2=C3
    C1=C2 -> C1-H6
end
product "C/C=C\\C=C"
'''

# Chugaev elimination of ethyl S-methyl xanthate: the thione sulfur takes a beta hydrogen through
# a six-membered cyclic array (syn), giving ethene and S-methyl dithiocarbonate.
CHUGAEV = '''\
species xanthate = "[CH3:10][S:1][C:2](=[S:3])[O:4][CH2:5][CH2:6][H:7]"
step "syn elimination" under "heat"
    C2=S3 -> S3-H7
    C6-H7 -> C5=C6
    C5-O4 -> C2=O4
end
product "C=C.CSC(=O)S"
'''

# Oxidation of an alkylborane (the second half of hydroboration-oxidation): hydroperoxide adds to
# boron, and the propyl group shifts from boron to oxygen as hydroxide leaves (the borate ester,
# hydrolysed later to propan-1-ol).
BORANE_OXIDATION = '''\
species borane = "[CH3:10][CH2:11][CH2:1][BH2:2]"
species hydroperoxide = "[O-:3][OH:4]"
step "hydroperoxide adds to boron"
    :O3 -> B2
end
step "1,2-shift from boron to oxygen"
    B2-C1 -> C1-O3
    O3-O4 -> O4
end
product "CCCO[BH2].[OH-]"
'''

# Thorpe-Ziegler cyclisation: the anion alpha to one nitrile of heptanedinitrile (drawn as its
# ketenimine resonance form) adds to the other nitrile, 6-exo-dig; the imine anion is protonated and
# tautomerises to the conjugated enamine, 2-aminocyclohex-1-ene-1-carbonitrile.
THORPE_ZIEGLER = '''\
species dinitrile = "[N:1]#[C:2][CH2:3][CH2:4][CH2:5][CH2:6][CH2:7][C:8]#[N:9]"
species base = "[CH3:20][CH2:21][O-:22]"
step "deprotonation alpha to a nitrile" reversible
    :O22 -> H(C3)
    C3-H -> C2=C3
    C2#N1 -> N1
end
step "the anion adds to the other nitrile"
    :N1 -> C2#N1
    C2=C3 -> C3-C8
    C8#N9 -> N9
end
step "proton to nitrogen" reversible
    :N9 -> H(O22)
    O22-H -> O22
end
step "deprotonation at C3" reversible
    :O22 -> H(C3)
    C3-H -> C3=C8
    C8=N9 -> N9
end
step "protonation on nitrogen gives the enamine" reversible
    :N9 -> H(O22)
    O22-H -> O22
end
product "N#CC1=C(N)CCCC1"
'''

# Hex-5-ynyl radical: 5-exo-dig ring closure onto the alkyne gives the (cyclopentylidene)methyl
# vinyl radical (the 5-exo mode is the one observed; Baldwin 1976, favoured).
RADICAL_EXO_DIG = '''\
species radical = "[CH2:1][CH2:2][CH2:3][CH2:4][C:5]#[CH:6]"
step "5-exo-dig ring closure"
    .C1 ~> C1-C5
    C5#C6 ~> C1-C5
    C5#C6 ~> C6
end
product "[CH]=C1CCCC1"
'''

# Boron aldol (Zimmerman-Traxler): the aldehyde binds the boron of the enol borinate, then one
# six-membered cyclic array makes the C-C bond and hands boron from the enol oxygen to the aldehyde
# oxygen: the boron aldolate of the beta-hydroxy ketone.
BORON_ALDOL = '''\
species enolate = "[CH3:1][CH:2]=[C:3]([O:4][B:5]([CH3:6])[CH3:7])[CH2:8][CH3:9]"
species aldehyde = "[CH3:10][CH:11]=[O:12]"
step "the aldehyde binds boron" reversible
    :O12 -> B5
end
step "six-membered cyclic transition state"
    C2=C3 -> C2-C11
    C11=O12 -> O12
    B5-O4 -> O4
    :O4 -> C3=O4
end
product "CCC(=O)C(C)C(C)OB(C)C"
'''

# Amide coupling through a carbodiimide (dimethyl standing for DCC or DIC): the acid protonates
# the carbodiimide and adds to its central carbon (the O-acylisourea); the amine adds to that
# activated carbonyl, the tetrahedral intermediate expels the urea, which takes the proton and is
# redrawn in its usual resonance form.
CARBODIIMIDE_COUPLING = '''\
species acid = "[CH3:1][C:2](=[O:3])[OH:4]"
species carbodiimide = "[CH3:10][N:11]=[C:12]=[N:13][CH3:14]"
species amine = "[CH3:20][NH2:21]"
step "proton transfer to the carbodiimide" reversible
    :N11 -> H(O4)
    O4-H -> O4
end
step "the carboxylate adds to the central carbon"
    :O4 -> C12
    C12=N11 -> N11
end
step "the amine adds to the activated carbonyl"
    :N21 -> C2
    C2=O3 -> O3
end
step "the tetrahedral intermediate collapses, the urea leaving"
    :O3 -> C2=O3
    C2-O4 -> O4
end
step "proton transfer to the urea" reversible
    :N13 -> H(N21)
    N21-H -> N21
end
step "the urea in its usual form" resonance
    :O4 -> C12=O4
    C12=N13 -> N13
end
product "CNC(C)=O.CNC(=O)NC"
'''

# A Boc group removed by acid: the carbamate's carbonyl protonated, the tert-butyl cation lost
# (and deprotonated to isobutene), then the carbamic acid loses CO2 from its N-protonated form.
BOC_REMOVAL = '''\
species carbamate = "[CH3:1][NH:2][C:3](=[O:4])[O:5][C:6]([CH3:7])([CH3:8])[CH3:9]"
species acid = "[OH3+:20]"
step "protonation of the carbonyl" reversible
    :O4 -> H(O20)
    O20-H -> O20
end
step "the tert-butyl cation leaves"
    C6-O5 -> O5
    :O5 -> C3=O5
    C3=O4 -> O4
end
step "isobutene by loss of a proton"
    :O20 -> H(C7)
    C7-H -> C6=C7
end
step "protonation of nitrogen" reversible
    uses acid2 = "[OH3+:21]"
    :N2 -> H(O21)
    O21-H -> O21
end
step "loss of carbon dioxide"
    :O21 -> H(O4)
    O4-H -> C3=O4
    C3-N2 -> N2
end
product "CN"
'''

# A tetrahydropyranyl (THP) ether cleaved by aqueous acid: the exocyclic oxygen protonated,
# methanol expelled by the ring oxygen's push (a cyclic oxocarbenium ion), water added, the proton
# handed on: the lactol and methanol.
THP_REMOVAL = '''\
species thp = "[CH3:20][O:7][CH:2]1[O:1][CH2:6][CH2:5][CH2:4][CH2:3]1"
species acid = "[OH3+:10]"
step "the exocyclic oxygen is protonated" reversible
    :O7 -> H(O10)
    O10-H -> O10
end
step "methanol leaves, the ring oxygen pushing" reversible
    :O1 -> C2=O1
    C2-O7 -> O7
    releases O7
end
step "water adds to the oxocarbenium ion" reversible
    :O10 -> C2
    C2=O1 -> O1
end
step "water takes the proton" reversible
    uses water = "[OH2:11]"
    :O11 -> H(O10)
    O10-H -> O10
end
product "OC1CCCCO1.CO"
'''

# Intramolecular aldol through an enamine (the Hajos-Parrish ketol, with pyrrolidine standing in
# for proline and no stereocontrol): the enamine of the side-chain methyl ketone of
# 2-methyl-2-(3-oxobutyl)cyclopentane-1,3-dione closes a six-membered ring onto a ring carbonyl
# (6-exo-trig), the alkoxide is protonated and the iminium ion hydrolysed, the amine leaving from
# nitrogen once protonated: the bicyclic ketol.
ENAMINE_ALDOL = '''\
species enamine = "[CH3:11][C:2]1([CH2:6][CH2:7][C:8](=[CH2:10])[N:20]2[CH2:21][CH2:22][CH2:23][CH2:24]2)[C:1](=[O:12])[CH2:5][CH2:4][C:3]1=[O:13]"
species water = "[OH2:30]"
step "the enamine closes the ring"
    :N20 -> C8=N20
    C8=C10 -> C10-C1
    C1=O12 -> O12
end
step "the alkoxide takes a proton from water" reversible
    :O12 -> H(O30)
    O30-H -> O30
end
step "hydroxide adds to the iminium ion" reversible
    :O30 -> C8
    C8=N20 -> N20
end
step "nitrogen takes a proton from water" reversible
    uses water2 = "[OH2:31]"
    :N20 -> H(O31)
    O31-H -> O31
end
step "pyrrolidine leaves" reversible
    :O30 -> C8=O30
    C8-N20 -> N20
end
step "hydroxide takes the proton" reversible
    :O31 -> H(O30)
    O30-H -> O30
end
product "CC12CCC(=O)CC1(O)CCC2=O"
'''

# Friedel-Crafts alkylation of benzene by 2-chloro-2-methylpropane and AlCl3 (Clayden, Greeves and
# Warren, Organic Chemistry, 2nd ed., ch. 21, from memory): the Lewis acid takes a chlorine lone
# pair, the complex ionises to the tert-butyl cation and AlCl4-, the arene attacks, and a chloride
# of AlCl4- takes the arenium ion's proton, giving back AlCl3 and HCl: tert-butylbenzene.
FRIEDEL_CRAFTS_ALKYLATION = '''\
species chloride = "[CH3:5][C:1]([CH3:6])([CH3:7])[Cl:2]"
species lewis = "[Al:3]([Cl:8])([Cl:9])[Cl:4]"
species benzene = "[cH:11]1[cH:12][cH:13][cH:14][cH:15][cH:16]1"
step "Lewis acid complex" reversible
    :Cl2 -> Al3
end
step "ionisation" reversible
    C1-Cl2 -> Cl2
end
step "attack by the arene"
    C11=C12 -> C11-C1
end
step "rearomatisation"
    :Cl2 -> H(C11)
    C11-H -> C11=C12
    Al3-Cl2 -> Cl2
    releases Cl2
end
product "CC(C)(C)c1ccccc1.Cl[Al](Cl)Cl"
'''

# Aza-Michael addition of piperidine to acrylonitrile (Clayden, Greeves and Warren, Organic
# Chemistry, 2nd ed., ch. 22, from memory): the amine adds at the alkene's beta carbon, the
# ketenimine anion takes the ammonium's proton on nitrogen, and water moves that proton to carbon
# (tautomerisation to the nitrile): 3-(piperidin-1-yl)propanenitrile.
AZA_MICHAEL = '''\
species amine = "C1CC[NH:1]CC1"
species acceptor = "[CH2:2]=[CH:3][C:4]#[N:5]"
step "conjugate addition"
    :N1 -> C2
    C2=C3 -> C3=C4
    C4#N5 -> N5
end
step "proton transfer"
    :N5 -> H(N1)
    N1-H -> N1
end
step "tautomerisation"
    uses water = "[OH2:6]"
    C3=C4 -> C3-H(O6)
    O6-H -> O6
    :O6 -> H(N5)
    N5-H -> C4#N5
end

product "N#CCCN1CCCCC1"
'''

# Gabriel synthesis, first step (Clayden, Greeves and Warren, Organic Chemistry, 2nd ed., ch. 15,
# from memory): the phthalimide anion displaces bromide from benzyl bromide (SN2) to give
# N-benzylphthalimide.
GABRIEL = '''\
species imide = "O=C1c2ccccc2C(=O)[N-:1]1"
species bromide = "[Br:2][CH2:3]c1ccccc1"
step "SN2 at the benzylic carbon" under "DMF"
    :N1 -> C3
    C3-Br2 -> Br2
    releases Br2
end
product "O=C1c2ccccc2C(=O)N1Cc1ccccc1"
'''

# Mukaiyama aldol (Clayden, Greeves and Warren, Organic Chemistry, 2nd ed., ch. 26, from memory):
# TiCl4 takes benzaldehyde's oxygen, the silyl enol ether of acetone adds, the silyl group moves to
# the new alkoxide through a six-membered array, and TiCl4 lets go: the silyl ether of the aldol.
MUKAIYAMA = '''\
species enol_ether = "[CH2:1]=[C:2]([CH3:3])[O:4][Si:5](C)(C)C"
species aldehyde = "[O:6]=[CH:7]c1ccccc1"
species lewis = "Cl[Ti:8](Cl)(Cl)Cl"
step "activation" reversible over "TiCl4" under "CH2Cl2, -78 C"
    :O6 -> Ti8
end
step "C-C bond formation"
    C1=C2 -> C1-C7
    C7=O6 -> O6
    :O4 -> C2=O4
end
step "silyl transfer"
    :O6 -> Si5
    Si5-O4 -> O4
end
step "loss of the Lewis acid"
    Ti8-O6 -> O6
    releases Ti8
end

product "CC(=O)CC(O[Si](C)(C)C)c1ccccc1"
'''

# Nucleophilic catalysis of an acetylation by DMAP (Clayden, Greeves and Warren, Organic
# Chemistry, 2nd ed., ch. 10, from memory): the pyridine nitrogen adds to acetic anhydride, acetate
# leaves, ethanol adds to the acylpyridinium ion, DMAP leaves and triethylamine takes the proton:
# ethyl acetate.
DMAP_ACETYLATION = '''\
species anhydride = "[CH3:1][C:2](=[O:3])[O:4][C:5](=[O:6])[CH3:7]"
species dmap = "CN(C)c1cc[n:8]cc1"
species alcohol = "[CH3:9][CH2:10][OH:11]"
species base = "CC[N:12](CC)CC"
step "acylpyridinium" reversible
    :N8 -> C2
    C2=O3 -> O3
end
step "collapse" reversible
    :O3 -> C2=O3
    C2-O4 -> O4
end
step "alcohol adds"
    :O11 -> C2
    C2=O3 -> O3
end
step "pyridine leaves"
    :O3 -> C2=O3
    C2-N8 -> N8
end
step "deprotonation"
    :N12 -> H(O11)
    O11-H -> O11
end
product "CCOC(C)=O"
'''

# Fischer indole synthesis from acetone phenylhydrazone in acid: the ene-hydrazine, its
# [3,3]-sigmatropic shift, rearomatisation, the aniline nitrogen closing the five-membered ring
# onto the iminium carbon, and ammonia lost: 2-methylindole.
FISCHER_INDOLE = '''\
species hydrazone = "[CH3:10][C:9]([CH3:11])=[N:8][NH:7][c:1]1[cH:2][cH:3][cH:4][cH:5][cH:6]1"
species acid = "[OH3+:20]"
step "protonation at the imine nitrogen" reversible
    :N8 -> H(O20)
    O20-H -> O20
end
step "tautomerisation to the ene-hydrazine" reversible
    :O20 -> H(C10)
    C10-H -> C9=C10
    C9=N8 -> N8
end
step "[3,3]-sigmatropic shift"
    C9=C10 -> C10-C2
    C1=C2 -> C1=N7
    N7-N8 -> N8=C9
end
step "protonation at N7" reversible
    :N7 -> H(O20)
    O20-H -> O20
end
step "rearomatisation" reversible
    :O20 -> H(C2)
    C2-H -> C1=C2
    C1=N7 -> N7
end
step "protonation at N8" reversible
    :N8 -> H(O20)
    O20-H -> O20
end
step "the aniline closes the five-membered ring"
    :N7 -> C9
    C9=N8 -> N8
end
step "proton transfer from N7 to N8" reversible
    :N8 -> H(N7)
    N7-H -> N7
end
step "loss of ammonia"
    :N7 -> C9=N7
    C9-N8 -> N8
end
step "deprotonation gives the indole"
    :N8 -> H(C10)
    C10-H -> C9=C10
    C9=N7 -> N7
end
product "Cc1cc2ccccc2[nH]1.[NH4+]"
'''

# Payne rearrangement of 2,3-epoxybutan-1-olate (Payne, J. Org. Chem. 1962, from memory): the
# alkoxide opens the epoxide at its near carbon from the back (3-exo-tet), the old epoxide oxygen
# left as the alkoxide: 1-(oxiran-2-yl)ethan-1-olate, an equilibrium in base.
PAYNE = '''\
species alkoxide = "[O-:1][CH2:2][CH:3]1[O:5][CH:4]1[CH3:6]"
step "epoxide migration" reversible
    :O1 -> C3
    C3-O5 -> O5
end
product "[O-]C(C)C1CO1"
'''

# Cyclopropane by Michael-initiated ring closure: dimethyl bromomalonate's anion adds to methyl
# vinyl ketone and the ketone enolate displaces bromide at the malonate carbon (3-exo-tet;
# common practice, textbook outcome from memory): dimethyl 2-acetylcyclopropane-1,1-dicarboxylate.
MIRC = '''\
species enolate = "[CH3:1][O:2][C:3](=[O:4])[C-:5]([Br:6])[C:7](=[O:8])[O:9][CH3:10]"
species enone = "[CH2:11]=[CH:12][C:13](=[O:14])[CH3:15]"
step "Michael addition"
    :C5 -> C5-C11
    C11=C12 -> C12=C13
    C13=O14 -> O14
end
step "ring closure (3-exo-tet)"
    :O14 -> C13=O14
    C12=C13 -> C12-C5
    C5-Br6 -> Br6
end
product "COC(=O)C1(C(=O)OC)CC1C(C)=O.[Br-]"
'''

# Grob fragmentation of 3-bromo-2,2-dimethylpropan-1-olate (Grob, Angew. Chem. 1969, from memory):
# one concerted step, the alkoxide's pair making C=O as the C2-C3 bond becomes the alkene and
# bromide leaves: formaldehyde, 2-methylpropene and bromide.
GROB = '''\
species alkoxide = "[O-:1][CH2:2][C:3]([CH3:6])([CH3:7])[CH2:4][Br:5]"
step "fragmentation"
    :O1 -> C2=O1
    C2-C3 -> C3=C4
    C4-Br5 -> Br5
end
product "C=O.C=C(C)C.[Br-]"
'''

# Dakin oxidation of 4-hydroxybenzaldehyde by alkaline hydrogen peroxide (Clayden, Greeves and
# Warren, Organic Chemistry, 2nd ed., from memory): the hydroperoxide adds, the aryl group moves to
# oxygen as hydroxide leaves, and hydroxide cleaves the aryl formate: hydroquinone and formate.
DAKIN = '''\
species aldehyde = "[OH:10]c1cc[c:11]([CH:1]=[O:2])cc1"
species peroxide = "[OH:3][O-:4]"
step "hydroperoxide adds"
    :O4 -> C1
    C1=O2 -> O2
end
step "aryl migration"
    :O2 -> C1=O2
    C1-C11 -> C11-O4
    O4-O3 -> O3
end
step "hydroxide adds to the formate"
    :O3 -> C1
    C1=O2 -> O2
end
step "phenoxide leaves"
    :O2 -> C1=O2
    C1-O4 -> O4
end
step "proton transfer"
    :O4 -> H(O3)
    O3-H -> O3
end
product "Oc1ccc(O)cc1.O=C[O-]"
'''

# Silyl enol ether of cyclohexanone from Me3SiCl and Et3N (House, J. Org. Chem. 1969, from memory):
# the carbonyl oxygen takes silicon as chloride leaves, and the amine removes the alpha proton of
# the silyloxocarbenium ion: 1-(trimethylsilyloxy)cyclohexene.
SILYL_ENOL_ETHER = '''\
species ketone = "[O:7]=[C:1]1[CH2:2][CH2:3][CH2:4][CH2:5][CH2:6]1"
species tmscl = "C[Si:8](C)(C)[Cl:9]"
species base = "CC[N:10](CC)CC"
step "O-silylation"
    :O7 -> Si8
    Si8-Cl9 -> Cl9
end
step "deprotonation"
    :N10 -> H(C2)
    C2-H -> C1=C2
    C1=O7 -> O7
end
product "C[Si](C)(C)OC1=CCCCC1"
'''

# Acid hydrolysis of ethyl vinyl ether (common practice; outcome from memory): protonation at the
# terminal carbon gives the oxocarbenium ion, water adds, and the hemiacetal loses ethanol:
# acetaldehyde and ethanol.
ENOL_ETHER_HYDROLYSIS = '''\
species ether = "[CH2:1]=[CH:2][O:3][CH2:4][CH3:5]"
species acid = "[OH3+:6]"
species water = "[OH2:7]"
step "C-protonation"
    C1=C2 -> C1-H(O6)
    O6-H -> O6
end
step "water adds"
    :O7 -> C2
end
step "proton transfer"
    :O6 -> H(O7)
    O7-H -> O7
end
step "O-protonation"
    :O3 -> H(O6)
    O6-H -> O6
end
step "loss of ethanol"
    :O7 -> C2=O7
    C2-O3 -> O3
end
step "deprotonation"
    :O6 -> H(O7)
    O7-H -> O7
end
product "CC=O.CCO.[OH3+]"
'''

# Lactam from methyl 5-aminopentanoate (common practice; outcome from memory): the amine closes a
# six-membered ring onto the ester carbonyl (6-exo-trig), a proton moves from N to O-, and
# methoxide leaves and takes the O-H proton: piperidin-2-one and methanol.
LACTAM = '''\
species ester = "[NH2:1][CH2:2][CH2:3][CH2:4][CH2:5][C:6](=[O:7])[O:8][CH3:9]"
step "ring closure" reversible
    :N1 -> C6
    C6=O7 -> O7
end
step "proton transfer" reversible
    :O7 -> H(N1)
    N1-H -> N1
end
step "loss of methoxide"
    :O7 -> C6=O7
    C6-O8 -> O8
end
step "proton transfer"
    :O8 -> H(O7)
    O7-H -> O7
end
product "O=C1CCCCN1.CO"
'''

# Weinreb ketone synthesis (Nahm and Weinreb, Tetrahedron Lett. 1981, from memory): propylmagnesium
# bromide adds to N-methoxy-N-methylacetamide; magnesium holds both oxygens of the adduct in a
# five-membered chelate, so the adduct does not collapse until acid work-up: pentan-2-one.
WEINREB = '''\
species amide = "[CH3:1][C:2](=[O:3])[N:4]([CH3:5])[O:6][CH3:7]"
species grignard = "CC[CH2:8][Mg:9][Br:10]"
step "addition" over "PrMgBr" under "THF, 0 °C"
    C8-Mg9 -> C8-C2
    C2=O3 -> O3
end
step "chelate"
    :O3 -> Mg9
    :O6 -> Mg9
    expect "CCCC1(C)O[Mg-](Br)[O+](C)N1C"
end
step "workup" uses acid = "[OH3+:11]"
    O3-Mg9 -> O3
    O6-Mg9 -> O6
    :O3 -> H(O11)
    O11-H -> O11
end
step "hemiaminal collapses" uses acid2 = "[OH3+:12]"
    :N4 -> H(O12)
    O12-H -> O12
end
step "loss of the amine"
    :O3 -> C2=O3
    C2-N4 -> N4
end
step "deprotonation"
    :O12 -> H(O3)
    O3-H -> O3
end
product "CCCC(C)=O"
'''

# Sulfonation of benzene with SO3 (Clayden, Greeves and Warren, Organic Chemistry, 2nd ed., ch. 21,
# from memory): the arene attacks sulfur as an S=O pair moves onto oxygen, hydrogensulfate takes
# the arenium ion's proton, and the sulfonate takes it back from sulfuric acid: benzenesulfonic acid.
SULFONATION = '''\
species benzene = "[cH:1]1[cH:2][cH:3][cH:4][cH:5][cH:6]1"
species so3 = "[O:8]=[S:7](=[O:9])=[O:10]"
species base = "[O-:11][S:12](=O)(=O)[OH:13]"
step "attack on sulfur"
    C1=C2 -> C1-S7
    S7=O8 -> O8
end
step "rearomatisation"
    :O11 -> H(C1)
    C1-H -> C1=C2
end
step "proton transfer"
    :O8 -> H(O11)
    O11-H -> O11
end
product "O=S(=O)(O)c1ccccc1.O=S(=O)([O-])O"
'''

# Acetyl chloride with two equivalents of methylmagnesium bromide (Clayden, Greeves and Warren,
# Organic Chemistry, 2nd ed., ch. 10, from memory): the ketone made when chloride leaves is more
# reactive than the acid chloride and takes the second methyl; work-up gives 2-methylpropan-2-ol.
ACYL_CHLORIDE_GRIGNARD = '''\
species chloride = "[CH3:1][C:2](=[O:3])[Cl:4]"
species grignard = "[CH3:5][Mg:6][Br:7]"
step "first addition"
    C5-Mg6 -> C5-C2
    C2=O3 -> O3
end
step "chloride leaves"
    :O3 -> C2=O3
    C2-Cl4 -> Cl4
end
step "second addition" uses grignard2 = "[CH3:8][Mg:9][Br:10]"
    C8-Mg9 -> C8-C2
    C2=O3 -> O3
end
step "work-up" uses acid = "[OH3+:11]"
    :O3 -> H(O11)
    O11-H -> O11
end
product "CC(C)(C)O"
'''

# Kinetic enolate of 2-methylcyclohexanone (LDA, -78 C) and its methylation (House; Clayden,
# Greeves and Warren, Organic Chemistry, 2nd ed., ch. 26, from memory): the hindered base takes a
# proton from the less substituted CH2, and methyl iodide alkylates there: 2,6-dimethylcyclohexanone.
KINETIC_ENOLATE_METHYLATION = '''\
species ketone = "[O:7]=[C:1]1[CH:2]([CH3:8])[CH2:3][CH2:4][CH2:5][CH2:6]1"
species lda = "CC(C)[N-:9]C(C)C"
species mei = "[CH3:10][I:11]"
step "kinetic deprotonation" over "LDA" under "THF, -78 °C"
    :N9 -> H(C6)
    C6-H -> C1=C6
    C1=O7 -> O7
end
step "methylation"
    :O7 -> C1=O7
    C1=C6 -> C6-C10
    C10-I11 -> I11
end
product "CC1CCCC(C)C1=O"
'''

# But-2-yne from 2,3-dibromobutane and sodium amide (common practice; outcome from memory): two E2
# eliminations, the second from the vinyl bromide, each amide ion taking the proton anti to a bromide.
DOUBLE_DEHYDROBROMINATION = '''\
species dibromide = "[CH3:1][CH:2]([Br:5])[CH:3]([Br:6])[CH3:4]"
species base = "[NH2-:7]"
step "first E2"
    :N7 -> H(C2)
    C2-H -> C2=C3
    C3-Br6 -> Br6
end
step "second E2" uses base2 = "[NH2-:8]"
    :N8 -> H(C3)
    C3-H -> C2#C3
    C2-Br5 -> Br5
end
product "CC#CC"
'''

# Bromination of anisole with Br2 and FeBr3 (Clayden, Greeves and Warren, Organic Chemistry, 2nd
# ed., ch. 21, from memory): bromine held by the Lewis acid is attacked at the para carbon, the
# methoxy lone pair pushing through the ring (an oxocarbenium form of the sigma complex), and a
# bromide of FeBr4- takes the proton back: 4-bromoanisole, HBr and FeBr3.
ANISOLE_BROMINATION = '''\
species anisole = "[CH3:8][O:7][c:1]1[cH:2][cH:3][cH:4][cH:5][cH:6]1"
species bromine = "[Br:9][Br:10]"
species fe = "[Fe:11]([Br:12])([Br:13])[Br:14]"
step "Lewis acid complex"
    :Br10 -> Fe11
end
step "attack at C4"
    :O7 -> C1=O7
    C1=C2 -> C2=C3
    C3=C4 -> C4-Br9
    Br9-Br10 -> Br10
end
step "rearomatisation"
    :Br10 -> H(C4)
    C4-H -> C3=C4
    C2=C3 -> C1=C2
    C1=O7 -> O7
    Fe11-Br10 -> Br10
end
product "COc1ccc(Br)cc1"
'''

# Hydrolysis of an iminium ion (common practice; outcome from memory): water adds to the C=N+
# carbon, a proton moves from oxygen to nitrogen by way of water and hydronium, and methylamine
# leaves as the C=O forms: acetone and methylamine.
IMINIUM_HYDROLYSIS = '''\
species iminium = "[CH3:1][C:2]([CH3:3])=[NH+:4][CH3:5]"
species water = "[OH2:6]"
species water2 = "[OH2:7]"
step "water adds"
    :O6 -> C2
    C2=N4 -> N4
end
step "proton transfer" 
    :O7 -> H(O6)
    O6-H -> O6
end
step "N-protonation" uses acid = "[OH3+:8]"
    :N4 -> H(O8)
    O8-H -> O8
end
step "loss of methylamine"
    :O6 -> C2=O6
    C2-N4 -> N4
end
step "deprotonation"
    :O8 -> H(O6)
    O6-H -> O6
end
product "CC(C)=O"
'''

# Fmoc removal by piperidine (Carpino; Wuts, Greene's Protective Groups in Organic Synthesis, from
# memory): piperidine takes the fluorene C9 proton, the carbanion expels the carbamate (E1cB), and a
# second piperidine adds to dibenzofulvene and takes its proton back: the carbamate anion, the
# piperidinium ion and the fulvene-piperidine adduct.
FMOC_REMOVAL = '''\
species carbamate = "O=[C:1]([O:2][CH2:3][CH:4]1c2ccccc2-c2ccccc21)[NH:5][CH3:6]"
species piperidine = "C1CC[NH:7]CC1"
species piperidine2 = "C1CC[NH:8]CC1"
step "deprotonation at C9 of fluorene"
    :N7 -> H(C4)
    C4-H -> C4
end
step "elimination (E1cB)"
    :C4 -> C3=C4
    C3-O2 -> O2
end
step "dibenzofulvene trapped"
    :N8 -> C3
    C3=C4 -> C4
end
step "proton transfer"
    :C4 -> H(N8)
    N8-H -> N8
end
product "O=C([O-])NC.C1CC[NH2+]CC1.C1CCN(CC1)CC1c2ccccc2-c2ccccc21"
'''

# Boc protection of ethylamine with Boc2O (Wuts, Greene's Protective Groups in Organic Synthesis,
# from memory): the amine adds to one carbonyl, tert-butyl carbonate leaves and loses CO2, and the
# tert-butoxide takes the ammonium's proton: the carbamate, CO2 and tert-butanol.
BOC_PROTECTION = '''\
species amine = "CC[NH2:1]"
species boc2o = "CC(C)(C)[O:2][C:3](=[O:4])[O:5][C:6](=[O:7])[O:8]C(C)(C)C"
step "addition"
    :N1 -> C3
    C3=O4 -> O4
end
step "collapse"
    :O4 -> C3=O4
    C3-O5 -> O5
end
step "decarboxylation"
    :O5 -> C6=O5
    C6-O8 -> O8
end
step "proton transfer"
    :O8 -> H(N1)
    N1-H -> N1
end
product "CCNC(=O)OC(C)(C)C.O=C=O.CC(C)(C)O"
'''

# Thermal electrocyclic ring opening of 3,4-dimethylcyclobutene (Woodward and Hoffmann, The
# Conservation of Orbital Symmetry, 1970, from memory): the ring's sigma bond and its pi bond become
# the two pi bonds of hexa-2,4-diene in one concerted step.
CYCLOBUTENE_OPENING = '''\
species ring = "C[CH:1]1[CH:2]=[CH:3][CH:4]1C"
step "ring opening"
    C1-C4 -> C1=C2
    C2=C3 -> C3=C4
end
product "CC=CC=CC"
'''

# Vilsmeier reagent from DMF and POCl3 (March's Advanced Organic Chemistry, from memory): the amide
# oxygen takes phosphorus as chloride leaves, chloride adds to the iminium carbon, and the nitrogen
# pushes out dichlorophosphate: the chloroiminium ion.
VILSMEIER_REAGENT = '''\
species dmf = "C[N:1](C)[CH:2]=[O:3]"
species pocl3 = "[Cl:4][P:5](=[O:6])([Cl:7])[Cl:8]"
step "amide oxygen takes phosphorus"
    :O3 -> P5
    P5-Cl4 -> Cl4
end
step "chloride adds to the iminium carbon"
    :Cl4 -> C2
    C2=O3 -> O3
end
step "dichlorophosphate leaves"
    :N1 -> C2=N1
    C2-O3 -> O3
end
product "C[N+](C)=CCl.[O-]P(=O)(Cl)Cl"
'''

# Thermal 1,3-dipolar cycloaddition of methyl azide and propyne (Huisgen, Angew. Chem. 1963, from
# memory), one of the two regioisomers it gives: 1,4-dimethyl-1,2,3-triazole, in one concerted step.
AZIDE_ALKYNE_CYCLOADDITION = '''\
species azide = "[CH3:1][N:2]=[N+:3]=[N-:4]"
species alkyne = "C[C:5]#[CH:6]"
step "1,3-dipolar cycloaddition"
    :N4 -> C5
    C5#C6 -> C6-N2
    N2=N3 -> N3
end
product "Cn1cc(C)nn1"
'''

# Kolbe-Schmitt carboxylation (March's Advanced Organic Chemistry, from memory): phenoxide's ortho
# carbon adds to CO2, and a second phenoxide takes the ring proton back: the salicylate dianion
# and phenol.
KOLBE_SCHMITT = '''\
species phenoxide = "[O-:1][c:2]1[cH:3]cccc1"
species co2 = "[O:5]=[C:6]=[O:7]"
species phenoxide_2 = "[O-:8]c1ccccc1"
step "ortho carbon adds to CO2"
    :O1 -> C2=O1
    C2=C3 -> C3-C6
    C6=O5 -> O5
end
step "rearomatisation"
    :O8 -> H(C3)
    C3-H -> C3=C2
    C2=O1 -> O1
end
product "[O-]C(=O)c1ccccc1[O-].Oc1ccccc1"
'''

# Acid-catalysed dithioacetal from acetaldehyde and ethanethiol (Clayden, Organic Chemistry, 2nd
# ed., from memory: the path of acetal formation, sulfur for oxygen): addition, loss of water to
# a thionium ion, and a second thiol's addition.
DITHIOACETAL = '''\
species aldehyde = "C[CH:1]=[O:2]"
species thiol = "CC[SH:3]"
species acid = "[OH3+:4]"
species thiol_2 = "CC[SH:5]"
step "carbonyl protonation"
    :O2 -> H(O4)
    O4-H -> O4
end
step "thiol adds"
    :S3 -> C1
    C1=O2 -> O2
end
step "proton off sulfur"
    :O4 -> H(S3)
    S3-H -> S3
end
step "hydroxyl protonated"
    :O2 -> H(O4)
    O4-H -> O4
end
step "water leaves, thionium ion"
    :S3 -> C1=S3
    C1-O2 -> O2
end
step "second thiol adds"
    :S5 -> C1
    C1=S3 -> S3
end
step "proton off"
    :O2 -> H(S5)
    S5-H -> S5
end
product "CCSC(C)SCC.[OH3+].O"
'''

# Tributyltin hydride reduction of bromocyclohexane (Neumann, Synthesis 1987, from memory): the two
# chain-carrying steps, each with single-electron arrows: the stannyl radical abstracts bromine,
# and the cyclohexyl radical takes the tin hydride's hydrogen, handing on a new stannyl radical.
STANNANE_REDUCTION = '''\
species tin = "CCCC[Sn:1](CCCC)(CCCC)[H:2]"
species halide = "[Br:3][CH:4]1CCCCC1"
species stannyl = "CCCC[Sn:5](CCCC)CCCC"
step "stannyl radical abstracts bromine"
    .Sn5 ~> Sn5-Br3
    C4-Br3 ~> Sn5-Br3
    C4-Br3 ~> C4
end
step "cyclohexyl radical takes hydrogen"
    .C4 ~> C4-H2
    Sn1-H2 ~> C4-H2
    Sn1-H2 ~> Sn1
end
product "C1CCCCC1.CCCC[Sn](Br)(CCCC)CCCC.CCCC[Sn](CCCC)CCCC"
'''

# Thermal 6-electron electrocyclisation of hexa-1,3,5-triene to cyclohexa-1,3-diene (Woodward and
# Hoffmann, The Conservation of Orbital Symmetry, 1970, from memory): three pi bonds round the
# cyclic array become one sigma and two pi bonds.
TRIENE_ELECTROCYCLISATION = '''\
species triene = "[CH2:1]=[CH:2][CH:3]=[CH:4][CH:5]=[CH2:6]"
step "ring closure"
    C1=C2 -> C1-C6
    C3=C4 -> C2=C3
    C5=C6 -> C4=C5
end
product "C1=CCCC=C1"
'''

# Retro-Diels-Alder fragmentation of cyclohexene (Clayden, Organic Chemistry, 2nd ed., from
# memory): the reverse of the cycloaddition, to buta-1,3-diene and ethene.
RETRO_DIELS_ALDER = '''\
species ring = "[CH2:1]1[CH:2]=[CH:3][CH2:4][CH2:5][CH2:6]1"
step "retro-Diels-Alder"
    C2=C3 -> C3=C4
    C4-C5 -> C5=C6
    C6-C1 -> C1=C2
end
product "C=CC=C.C=C"
'''

# Lossen rearrangement of an O-acetyl acetohydroxamate anion (March's Advanced Organic Chemistry,
# from memory): the methyl shifts from carbon to nitrogen as acetate leaves: methyl isocyanate.
LOSSEN = '''\
species hydroxamate = "[CH3:7][C:1](=[O:2])[N-:3][O:4][C:5](C)=[O:6]"
step "rearrangement"
    :N3 -> C1=N3
    C1-C7 -> C7-N3
    N3-O4 -> O4
end
product "CN=C=O.CC(=O)[O-]"
'''

# Eschweiler-Clarke methylation of dimethylamine (Clayden, Organic Chemistry, 2nd ed., from
# memory): the iminium ion from formaldehyde takes a hydride from formate, which leaves as CO2.
ESCHWEILER_CLARKE = '''\
species amine = "C[NH:1]C"
species formaldehyde = "[CH2:2]=[O:3]"
species acid = "[OH3+:8]"
species formate = "[H:4][C:5](=[O:6])[O-:7]"
step "amine adds to formaldehyde"
    :N1 -> C2
    C2=O3 -> O3
end
step "proton transfer"
    :O3 -> H(N1)
    N1-H -> N1
end
step "hydroxyl protonated"
    :O3 -> H(O8)
    O8-H -> O8
end
step "water leaves"
    :N1 -> C2=N1
    C2-O3 -> O3
end
step "hydride from formate"
    :O7 -> C5=O7
    C5-H4 -> C2-H4
    C2=N1 -> N1
end
product "CN(C)C.O=C=O.O.O"
'''

# Chromic acid oxidation of propan-2-ol (Westheimer's mechanism; Clayden, Organic Chemistry, 2nd
# ed., from memory): the chromate ester, then an E2-like loss of the C-H proton as chromium(IV)
# leaves with the O-Cr pair: acetone.
CHROMIC_ACID_OXIDATION = '''\
species alcohol = "C[CH:1](C)[OH:2]"
species chromic = "[O:3]=[Cr:4](=[O:5])([OH:6])[OH:7]"
species water = "[OH2:8]"
species acid = "[OH3+:9]"
step "alcohol adds to chromium"
    :O2 -> Cr4
    Cr4=O3 -> O3
end
step "deprotonation"
    :O8 -> H(O2)
    O2-H -> O2
end
step "hydroxyl protonated"
    :O6 -> H(O9)
    O9-H -> O9
end
step "water leaves"
    :O3 -> Cr4=O3
    Cr4-O6 -> O6
end
step "elimination"
    :O9 -> H(C1)
    C1-H -> C1=O2
    O2-Cr4 -> Cr4
end
product "CC(C)=O.O.[OH3+].[OH3+].O=[Cr-](=O)O"
'''

# 1,4-Addition of HBr to buta-1,3-diene (Clayden, Organic Chemistry, 2nd ed., from memory): the
# allylic cation, written in its two resonance forms, takes bromide at C4: 1-bromobut-2-ene, the
# thermodynamic product.
DIENE_HBR_ADDITION = '''\
species diene = "[CH2:1]=[CH:2][CH:3]=[CH2:4]"
species hbr = "[H:5][Br:6]"
step "protonation at C1"
    C1=C2 -> C1-H5
    H5-Br6 -> Br6
end
step "allylic cation" resonance
    C3=C4 -> C2=C3
end
step "bromide at C4"
    :Br6 -> C4
end
product "CC=CCBr"
'''

# Lithium aluminium hydride reduction of acetone (Clayden, Organic Chemistry, 2nd ed., from
# memory): a hydride of the aluminate adds to the carbonyl carbon; water protonates the alkoxide.
ALUMINATE_REDUCTION = '''\
species ketone = "C[C:1](C)=[O:2]"
species aluminate = "[H:3][Al-:4]([H])([H])[H]"
species water = "[OH2:5]"
step "hydride transfer"
    Al4-H3 -> C1-H3
    C1=O2 -> O2
end
step "work-up"
    :O2 -> H(O5)
    O5-H -> O5
end
product "CC(C)O.[OH-].[AlH3]"
'''

# Oxymercuration of propene (Brown; Clayden, Organic Chemistry, 2nd ed., from memory), drawn
# through the open cation: the alkene takes mercury as acetate leaves, water adds at the more
# substituted carbon (Markovnikov), and a second water takes its proton.
OXYMERCURATION = '''\
species alkene = "C[CH:1]=[CH2:2]"
species mercury = "CC(=O)[O:3][Hg:4][O:7]C(C)=O"
species water = "[OH2:5]"
species water_2 = "[OH2:6]"
step "alkene takes mercury"
    C1=C2 -> C2-Hg4
    Hg4-O3 -> O3
end
step "water adds"
    :O5 -> C1
end
step "deprotonation"
    :O6 -> H(O5)
    O5-H -> O5
end
product "CC(O)C[Hg]OC(C)=O.CC(=O)[O-].[OH3+]"
'''

# Phosphonium salt and ylide (Wittig; Clayden, Organic Chemistry, 2nd ed., from memory):
# triphenylphosphine displaces bromide from methyl bromide (SN2), and butyllithium's carbanion
# takes a methyl proton: methylenetriphenylphosphorane.
PHOSPHONIUM_YLIDE = '''\
species phosphine = "c1ccc(cc1)[P:1](c1ccccc1)c1ccccc1"
species mebr = "[CH3:2][Br:3]"
species base = "CCC[CH2-:4]"
step "SN2 at methyl"
    :P1 -> C2
    C2-Br3 -> Br3
end
step "deprotonation"
    :C4 -> H(C2)
    C2-H -> C2
end
product "[CH2-][P+](c1ccccc1)(c1ccccc1)c1ccccc1.[Br-].CCCC"
'''

# Meinwald rearrangement of 2,2-dimethyloxirane with BF3 (March's Advanced Organic Chemistry, from
# memory): the Lewis acid opens the epoxide to the tertiary cation, a hydride shifts as the oxygen
# makes its C=O, and BF3 leaves: 2-methylpropanal.
MEINWALD = '''\
species epoxide = "C[C:1]1(C)[CH2:2][O:3]1"
species bf3 = "F[B:4](F)F"
step "Lewis acid binds"
    :O3 -> B4
end
step "ring opens to the tertiary cation"
    C1-O3 -> O3
end
step "hydride shift"
    C2-H -> C1-H(C2)
    :O3 -> C2=O3
end
step "Lewis acid leaves"
    O3-B4 -> O3
end
product "CC(C)C=O.FB(F)F"
'''

# Acid-catalysed acetylation of salicylic acid by acetic anhydride (aspirin; Clayden, Organic
# Chemistry, 2nd ed., from memory): protonated anhydride, addition of the phenol, proton shuttle,
# loss of acetic acid's oxygen as acetate, and deprotonation.
SALICYLIC_ACETYLATION = '''\
species phenol = "OC(=O)c1ccccc1[OH:1]"
species anhydride = "C[C:2](=[O:3])[O:4][C:5](C)=[O:6]"
species acid = "[OH3+:7]"
species water = "[OH2:8]"
step "carbonyl protonation"
    :O3 -> H(O7)
    O7-H -> O7
end
step "phenol adds"
    :O1 -> C2
    C2=O3 -> O3
end
step "proton shuttle"
    :O8 -> H(O1)
    O1-H -> O1
end
step "acetic acid leaves"
    :O3 -> C2=O3
    C2-O4 -> O4
end
step "deprotonation"
    :O7 -> H(O3)
    O3-H -> O3
end
product "CC(=O)Oc1ccccc1C(=O)O.CC(=O)[O-].[OH3+].[OH3+]"
'''

# Grignard reagent adding to a nitrile (Clayden, Organic Chemistry, 2nd ed., from memory): the
# C-Mg bond adds across the C#N in one four-centre step, giving the magnesium salt of the imine.
NITRILE_GRIGNARD = '''\
species nitrile = "C[C:1]#[N:2]"
species grignard = "CC[CH2:3][Mg:4][Br:5]"
step "addition"
    C3-Mg4 -> C1-C3
    C1#N2 -> N2-Mg4
end
product "CCCC(C)=N[Mg]Br"
'''

# SN2' substitution of 3-chlorobut-1-ene by cyanide (March's Advanced Organic Chemistry, from
# memory): the nucleophile bonds to the alkene end as the double bond shifts and chloride leaves.
SN2_PRIME = '''\
species allyl = "[CH2:1]=[CH:2][CH:3](C)[Cl:4]"
species cyanide = "N#[C-:5]"
step "SN2' substitution"
    :C5 -> C1
    C1=C2 -> C2=C3
    C3-Cl4 -> Cl4
end
product "N#CCC=CC.[Cl-]"
'''

# Intramolecular Diels-Alder of deca-1,3,9-triene (Clayden, Organic Chemistry, 2nd ed., from
# memory): the tethered diene and alkene close the cyclohexene and, through the tether, a second
# six-membered ring: a bicyclo[4.4.0]decene.
INTRAMOLECULAR_DIELS_ALDER = '''\
species triene = "[CH2:1]=[CH:2][CH:3]=[CH:4][CH2:5][CH2:6][CH2:7][CH2:8][CH:9]=[CH2:10]"
step "intramolecular Diels-Alder"
    C1=C2 -> C1-C10
    C3=C4 -> C2=C3
    C9=C10 -> C4-C9
end
product "C1=CC2CCCCC2CC1"
'''

# Cation-alkene cyclisation cascade (the pattern of a Johnson polyene cyclisation; Clayden, Organic
# Chemistry, 2nd ed., from memory): a tertiary cation takes the nearer alkene, closing a
# six-membered ring, and the new tertiary cation takes the second, closing another fused to it:
# a decalin with the last cation outside it.
CATION_ALKENE_CASCADE = '''\
species chain = "C[C:11](C)=[CH:10][CH2:9][CH2:8][CH2:7][CH:6]=[C:5](C)[CH2:4][CH2:3][CH2:2][C+:1](C)C"
step "first ring closes"
    C5=C6 -> C6-C1
end
step "second ring closes"
    C10=C11 -> C10-C5
end
'''

# Written while hunting for defects with new mechanisms, each checked clean against its source.
# Hell-Volhard-Zelinsky: the acyl bromide (from PBr3) enolises in HBr, the enol takes Br2 at the
# alpha carbon (March's Advanced Organic Chemistry, 2-bromination of acids, from memory).
HELL_VOLHARD_ZELINSKY = '''\
title "Hell-Volhard-Zelinsky alpha-bromination of propanoyl bromide"
species acyl = "[CH3:1][CH2:2][C:3](=[O:4])[Br:5]"
species hbr = "[Br:6][H:7]"
step "protonation of the carbonyl" reversible over "HBr"
    :O4 -> H7
    Br6-H7 -> Br6
end
step "enol formation" reversible
    :Br6 -> H(C2)
    C2-H -> C2=C3
    C3=O4 -> O4
    expect "CC=C(O)Br"
end
step "enol attacks bromine"
    uses bromine = "[Br:8][Br:9]"
    :O4 -> C3=O4
    C2=C3 -> C2-Br8
    Br8-Br9 -> Br9
end
step "deprotonation"
    :Br9 -> H(O4)
    O4-H -> O4
end
product "CC(Br)C(=O)Br"
'''

# Tishchenko reaction (alkoxide-catalysed): ethoxide adds to one acetaldehyde, the hemiacetal
# alkoxide hands its hydride to a second acetaldehyde (Smith and March, March's Advanced Organic
# Chemistry, 6th ed., from memory): ethyl acetate, ethoxide regenerated.
TISHCHENKO = '''\
title "Tishchenko reaction of acetaldehyde"
species aldehyde = "[CH3:1][CH:2]=[O:3]"
species alkoxide = "[CH3:4][CH2:5][O-:6]"
species aldehyde2 = "[CH3:7][CH:8]=[O:9]"
step "alkoxide adds" reversible
    :O6 -> C2
    C2=O3 -> O3
end
step "hydride transfer"
    :O3 -> C2=O3
    C2-H -> C8-H(C2)
    C8=O9 -> O9
end
product "CCOC(C)=O"
'''

# Fischer glycosidation of tetrahydropyran-2-ol (a 2-deoxy-sugar model) in methanol with acid:
# the anomeric OH is protonated, water leaves pushed by the ring oxygen (a cyclic oxocarbenium
# ion), methanol adds, and loses its proton (Clayden, Organic Chemistry, ch. 42, from memory).
GLYCOSIDE_FORMATION = '''\
title "Glycoside formation through an oxocarbenium ion"
species hemiacetal = "[OH:7][CH:2]1[O:1][CH2:6][CH2:5][CH2:4][CH2:3]1"
species acid = "[CH3:21][OH2+:10]"
species methanol = "[CH3:20][OH:8]"
step "the anomeric OH is protonated" reversible
    :O7 -> H(O10)
    O10-H -> O10
end
step "water leaves, the ring oxygen pushing" reversible
    :O1 -> C2=O1
    C2-O7 -> O7
    releases O7
    expect "C1CC[O+]=CC1"
end
step "methanol adds to the oxocarbenium ion" reversible
    :O8 -> C2
    C2=O1 -> O1
end
step "methanol takes the proton" reversible
    :O10 -> H(O8)
    O8-H -> O8
end
product "COC1CCCCO1"
'''

# Radical thiol-ene addition (anti-Markovnikov): the thiyl radical adds to the terminal carbon of
# propene, and the secondary radical takes the S-H hydrogen of a second thiol, carrying the chain
# (Hoyle and Bowman, Angew. Chem. Int. Ed. 2010, 49, 1540, from memory).
THIOL_ENE = '''\
title "Thiol-ene radical chain"
species thiyl = "[CH3:1][S:2]"
species propene = "[CH3:5][CH:4]=[CH2:3]"
species thiol = "[CH3:7][S:6][H:8]"
step "thiyl radical adds" under "hv, DMPA"
    .S2 ~> S2-C3
    C3=C4 ~> S2-C3
    C3=C4 ~> C4
end
step "chain transfer"
    .C4 ~> C4-H8
    S6-H8 ~> C4-H8
    S6-H8 ~> S6
end
product "CCCSC"
'''

# Sommelet-Hauser rearrangement of benzyltrimethylammonium with sodium amide: the N-methyl ylide
# makes a [2,3]-sigmatropic shift onto the ring's ortho carbon, and the exocyclic triene
# rearomatises by a proton shift (March's Advanced Organic Chemistry, from memory):
# N,N-dimethyl-2-methylbenzylamine.
SOMMELET_HAUSER = '''\
title "Sommelet-Hauser rearrangement"
species ammonium = "C[N+:1](C)([CH3:2])[CH2:3][c:4]1[cH:5]cccc1"
species base = "[NH2-:10]"
step "ylide formation" reversible over "NaNH2" under "NH3(l)"
    :N10 -> H(C2)
    C2-H -> C2
end
step "[2,3] shift"
    :C2 -> C2-C5
    C4=C5 -> C3=C4
    C3-N1 -> N1
    expect "C=C1C=CC=CC1CN(C)C"
end
step "rearomatisation: deprotonation"
    :N10 -> H(C5)
    C5-H -> C4=C5
    C3=C4 -> C3
end
step "rearomatisation: protonation"
    :C3 -> H(N10)
    N10-H -> N10
end
product "Cc1ccccc1CN(C)C"
'''

# Reductive work-up of an ozonide with dimethyl sulfide: sulfur attacks a peroxide oxygen, the
# ozonide unzips to two molecules of acetaldehyde and DMSO (Clayden, Organic Chemistry, ch. 35;
# Pappas et al., Tetrahedron Lett. 1966, 4273, from memory).
OZONIDE_REDUCTION = '''\
title "Ozonide reduction with dimethyl sulfide"
species ozonide = "C[CH:3]1[O:2][O:1][CH:5](C)[O:4]1"
species sulfide = "C[S:6]C"
step "sulfur attacks the peroxide" under "Me2S, -78 °C to rt"
    :S6 -> O1
    O1-O2 -> O2
end
step "first aldehyde leaves"
    :O2 -> C3=O2
    C3-O4 -> O4
end
step "second aldehyde and DMSO"
    :O4 -> C5=O4
    C5-O1 -> O1
end
product "CC=O.CC=O.C[S+](C)[O-]"
'''

# Azide opens (R)-2-methyloxirane at the less hindered carbon (SN2), the alkoxide is protonated by
# ammonium chloride: (R)-1-azidopropan-2-ol; the configured carbon keeps its bonds (Clayden,
# Organic Chemistry, ch. 17, regioselectivity of epoxide opening under basic conditions, from memory).
AZIDE_EPOXIDE_OPENING = '''\
title "Azide opening of an epoxide"
species epoxide = "C[C@@H:2]1[CH2:1][O:3]1"
species azide = "[N-:4]=[N+:5]=[N-:6]"
species ammonium = "[NH4+:7]"
step "azide attacks the CH2" under "NaN3, NH4Cl, MeOH/H2O, reflux"
    :N4 -> C1
    C1-O3 -> O3
end
step "protonation"
    :O3 -> H(N7)
    N7-H -> N7
end
product "C[C@@H](O)CN=[N+]=[N-]"
'''

# Neber rearrangement, first stage: ethoxide takes an alpha proton of acetophenone O-mesyloxime,
# the carbanion displaces mesylate at nitrogen to close the 2H-azirine (Kurti and Czako, Strategic
# Applications of Named Reactions in Organic Synthesis, 2005, from memory).
NEBER = '''\
title "Neber rearrangement: the 2H-azirine"
species oxime = "c1ccc(cc1)[C:2](=[N:3][O:4]S(C)(=O)=O)[CH3:1]"
species base = "CC[O-:10]"
step "deprotonation" under "EtONa, EtOH"
    :O10 -> H(C1)
    C1-H -> C1
end
step "ring closure at nitrogen"
    :C1 -> C1-N3
    N3-O4 -> O4
    releases O4
end
product "C1C(c2ccccc2)=N1"
'''

# Bouveault-Blanc reduction of ethyl acetate by sodium in ethanol, the first four steps: an
# electron into the C=O (ketyl radical anion), protonation on oxygen, a second electron onto the
# carbon radical, protonation on carbon: the hemiacetal (March's Advanced Organic Chemistry,
# from memory).
BOUVEAULT_BLANC = '''\
title "Bouveault-Blanc reduction: to the hemiacetal"
species ester = "[CH3:1][C:2](=[O:3])[O:4]CC"
species sodium = "[Na:5]"
species ethanol = "CC[O:6][H:7]"
step "first electron transfer" under "Na, EtOH, reflux"
    .Na5 ~> :O3
    C2=O3 ~> O3
    C2=O3 ~> C2
end
step "protonation on oxygen"
    :O3 -> H7
    O6-H7 -> O6
end
step "second electron transfer"
    uses sodium_2 = "[Na:8]"
    .Na8 ~> :C2
end
step "protonation on carbon"
    uses ethanol_2 = "CC[O:9][H:11]"
    :C2 -> H11
    O9-H11 -> O9
end
product "CC(O)OCC"
'''

# Cationic 2-aza-Cope rearrangement: an iminium ion with an allyl chain shifts through a
# six-membered chair-like array ([3,3]), the new iminium on the other side (Overman, Acc. Chem.
# Res. 1980, 13, 218, from memory).
AZA_COPE_2 = '''\
title "Cationic 2-aza-Cope rearrangement"
species iminium = "C[CH:1]=[N+:2](C)[CH2:3][CH2:4][CH:5]=[CH2:6]"
step "[3,3] shift" reversible under "MeCN, 60 °C"
    C1=N2 -> C1-C6
    C3-C4 -> N2=C3
    C5=C6 -> C4=C5
end
product "C=[N+](C)C(C)CC=C"
'''

# Sulfonamide from tosyl chloride and benzylamine with triethylamine: the amine displaces chloride
# at sulfur, the base takes the N-H proton (Clayden, Organic Chemistry, ch. 27, from memory).
SULFONAMIDE_MECHANISM = '''\
title "Tosylation of benzylamine"
species tscl = "Cc1ccc(cc1)[S:1](=O)(=O)[Cl:2]"
species amine = "c1ccc(cc1)C[NH2:3]"
species base = "CC[N:4](CC)CC"
step "substitution at sulfur" under "CH2Cl2, 0 °C"
    :N3 -> S1
    S1-Cl2 -> Cl2
end
step "deprotonation"
    :N4 -> H(N3)
    N3-H -> N3
end
product "Cc1ccc(cc1)S(=O)(=O)NCc1ccccc1"
'''

# Shapiro reaction of cyclohexanone tosylhydrazone: butyllithium takes the N-H proton, then an
# alpha C-H proton syn to the N-Ts group; the dianion loses toluenesulfinate, then N2, and the
# vinyllithium is protonated by water: cyclohexene (Shapiro, Org. React. 1976, 23, 405, from memory).
SHAPIRO = '''\
title "Shapiro reaction: cyclohexene from cyclohexanone"
species hydrazone = "Cc1ccc(cc1)[S:5](=O)(=O)[NH:4][N:3]=[C:2]1[CH2:1]CCCC1"
species buli = "CCC[CH2-:10]"
species buli2 = "CCC[CH2-:11]"
step "N-H deprotonation" under "BuLi (2 equiv), THF, -78 °C"
    :C10 -> H(N4)
    N4-H -> N4
end
step "alpha deprotonation"
    :C11 -> H(C1)
    C1-H -> C1=C2
    C2=N3 -> N3
end
step "sulfinate leaves"
    :N3 -> N3=N4
    N4-S5 -> S5
    releases S5
end
step "loss of nitrogen"
    N3-C2 -> C2
    :N4 -> N3#N4
    releases N3
end
step "protonation"
    uses water = "[OH2:12]"
    :C2 -> H(O12)
    O12-H -> O12
end
product "C1=CCCCC1"
'''

# Urea from phenyl isocyanate and diethylamine: the amine adds to the isocyanate carbon, the
# zwitterion's N-H proton moves to nitrogen through a second amine (Clayden, Organic Chemistry,
# ch. 10, from memory): 1,1-diethyl-3-phenylurea.
UREA = '''\
title "Urea from an isocyanate and an amine"
species isocyanate = "c1ccc(cc1)[N:1]=[C:2]=[O:3]"
species amine = "CC[NH:4]CC"
species amine2 = "CC[NH:5]CC"
step "amine adds" under "CH2Cl2, rt"
    :N4 -> C2
    C2=N1 -> N1
end
step "second amine takes the proton"
    :N5 -> H(N4)
    N4-H -> N4
end
step "protonation at nitrogen"
    :N1 -> H(N5)
    N5-H -> N5
end
product "CCN(CC)C(=O)Nc1ccccc1"
'''

# Schmidt reaction of acetone with hydrazoic acid in strong acid (Clayden, Organic Chemistry,
# 2nd ed., ch. 36, from memory): addition of HN3 to the protonated ketone, loss of water,
# migration of methyl to nitrogen as N2 leaves, water adds to the nitrilium ion: N-methylacetamide.
SCHMIDT_MECHANISM = '''\
title "Schmidt reaction of acetone"
species ketone = "[CH3:1][C:2](=[O:3])[CH3:4]"
species acid = "[OH3+:10]"
species hn3 = "[H:20][N-:5][N+:6]#[N:7]"
step "protonation" reversible over "H2SO4"
    :O3 -> H(O10)
    O10-H -> O10
end
step "hydrazoic acid adds" reversible
    :N5 -> C2
    C2=O3 -> O3
end
step "proton transfer to oxygen" reversible
    :O3 -> H20
    N5-H20 -> N5
end
step "loss of water" reversible
    :N5 -> C2=N5
    C2-O3 -> O3
    releases O3
    expect "CC(C)=N[N+]#N"
end
step "migration, N2 leaves"
    C2-C1 -> C1-N5
    N5-N6 -> N6
    :N5 -> C2#N5
    releases N6
    expect "CC#[N+]C"
end
step "water adds"
    :O10 -> C2
    C2#N5 -> N5
end
step "deprotonation" reversible
    uses water = "[OH2:11]"
    :O11 -> H(O10)
    O10-H -> O10
end
step "tautomerisation: protonation at nitrogen"
    :N5 -> H(O11)
    O11-H -> O11
end
step "tautomerisation: deprotonation at oxygen"
    :O11 -> H(O10)
    O10-H -> C2=O10
    C2=N5 -> N5
end
product "CNC(C)=O"
'''

# Barton-McCombie deoxygenation of cyclohexyl S-methyl xanthate: the tributylstannyl radical adds
# to the thiocarbonyl sulfur, the carbon radical fragments (C-O beta-scission) to the cyclohexyl
# radical and a stannyl dithiocarbonate, and the cyclohexyl radical takes hydrogen from Bu3SnH
# (Barton and McCombie, J. Chem. Soc., Perkin Trans. 1 1975, 1574, from memory).
BARTON_MCCOMBIE = '''\
title "Barton-McCombie deoxygenation"
species xanthate = "C[S:1][C:2](=[S:3])[O:4][CH:5]1CCCCC1"
species stannyl = "CCCC[Sn:6](CCCC)CCCC"
species stannane = "CCCC[Sn:7](CCCC)(CCCC)[H:8]"
step "stannyl radical adds to sulfur" under "AIBN, toluene, reflux"
    .Sn6 ~> Sn6-S3
    C2=S3 ~> Sn6-S3
    C2=S3 ~> C2
end
step "beta-scission"
    .C2 ~> C2=O4
    O4-C5 ~> C2=O4
    O4-C5 ~> C5
end
step "hydrogen transfer"
    .C5 ~> C5-H8
    Sn7-H8 ~> C5-H8
    Sn7-H8 ~> Sn7
end
product "C1CCCCC1"
'''

# Corey-Fuchs reaction, first stage: triphenylphosphine takes Br+ from CBr4, the tribromomethanide
# attacks the bromophosphonium ion, a second PPh3 takes Br+ from the CBr3 group (the dibromomethylene
# ylide), which performs a Wittig reaction on benzaldehyde (Corey and Fuchs, Tetrahedron Lett. 1972,
# 3769; Kurti and Czako, Strategic Applications of Named Reactions, from memory).
COREY_FUCHS = '''\
title "Corey-Fuchs: the 1,1-dibromoalkene"
species ppha = "c1ccc(cc1)[P:1](c1ccccc1)c1ccccc1"
species cbr4 = "[Br:3][C:2]([Br:4])([Br:5])[Br:6]"
species pphb = "c1ccc(cc1)[P:7](c1ccccc1)c1ccccc1"
species aldehyde = "c1ccc(cc1)[CH:8]=[O:9]"
step "bromine transfer to phosphorus"
    :P1 -> Br3
    C2-Br3 -> C2
end
step "tribromomethanide attacks phosphorus"
    :C2 -> P1
    P1-Br3 -> Br3
end
step "second phosphine takes bromine"
    :P7 -> Br4
    C2-Br4 -> C2
    expect "Br[C-](Br)[P+](c1ccccc1)(c1ccccc1)c1ccccc1"
end
step "oxaphosphetane"
    :C2 -> C2-C8
    C8=O9 -> O9-P1
end
step "cycloreversion"
    C2-P1 -> C2=C8
    C8-O9 -> O9=P1
end
product "BrC(Br)=Cc1ccccc1"
'''

# Imidazole-catalysed acetylation of methanol by acetic anhydride (nucleophilic catalysis): imidazole
# adds to a carbonyl, acetate leaves (N-acetylimidazolium), acetate takes the N-H proton, methanol
# adds to N-acetylimidazole and imidazole leaves (Jencks, Catalysis in Chemistry and Enzymology,
# 1969, from memory).
IMIDAZOLE_ACYL_TRANSFER = '''\
title "Imidazole as an acyl-transfer catalyst"
species anhydride = "[CH3:1][C:2](=[O:3])[O:4][C:5](=[O:6])[CH3:7]"
species imidazole = "c1c[nH:9][cH:12][n:8]1"
species methanol = "C[OH:11]"
step "imidazole adds" reversible
    :N8 -> C2
    C2=O3 -> O3
end
step "acetate leaves" reversible
    :O3 -> C2=O3
    C2-O4 -> O4
end
step "acetate takes the N-H proton" reversible
    :O4 -> H(N9)
    N9-H -> C12=N9
    C12=N8 -> N8
    expect "CC(=O)n1ccnc1"
end
step "methanol adds"
    :O11 -> C2
    C2=O3 -> O3
end
step "imidazolide leaves"
    :O3 -> C2=O3
    C2-N8 -> N8
end
step "proton transfer"
    :N8 -> H(O11)
    O11-H -> O11
end
product "COC(C)=O"
'''

# Passerini three-component reaction (ionic textbook account, from memory):
# acetic acid, acetaldehyde and tert-butyl isocyanide give an alpha-acyloxy amide.
PASSERINI = '''\
title "Passerini reaction"
caption "The protonated aldehyde is caught by the isocyanide carbon; acetate adds to the nitrilium ion and the acyl group moves from the imidate oxygen to the alcohol (Mumm-type transfer)."
species acid = "C[C:1](=[O:2])[OH:3]"
species aldehyde = "C[CH:4]=[O:5]"
species isocyanide = "CC(C)(C)[N+:6]#[C-:7]"
step "aldehyde protonation" reversible
    :O5 -> H(O3)
    O3-H -> O3
end
step "isocyanide addition"
    :C7 -> C4
    C4=O5 -> O5
end
step "acetate adds to the nitrilium ion"
    :O3 -> C7
    C7#N6 -> N6
    expect "CC(O)C(=NC(C)(C)C)OC(C)=O"
end
step "acyl transfer: addition"
    :O5 -> C1
    C1=O2 -> O2
end
step "acyl transfer: collapse"
    :O2 -> C1=O2
    C1-O3 -> O3
end
step "proton transfer to nitrogen"
    :N6 -> H(O5)
    O5-H -> O5
    :O3 -> C7=O3
    C7=N6 -> N6
end
product "CC(OC(C)=O)C(=O)NC(C)(C)C"
'''

# Rubottom oxidation (textbook account, from memory): the silyl enol ether of cyclohexanone is
# epoxidised by mCPBA; the silyloxy epoxide opens to an oxocarbenium ion and the silyl group moves
# to the alkoxide, giving 2-(trimethylsilyloxy)cyclohexanone.
RUBOTTOM = '''\
title "Rubottom oxidation"
species enol_ether = "C[Si:1](C)(C)[O:2][C:3]1=[CH:4]CCCC1"
species peracid = "Clc1cccc(c1)[C:5](=[O:6])[O:7][O:8][H:9]"
step "epoxidation" over "mCPBA"
    C3=C4 -> C4-O8
    O8-O7 -> C5=O7
    C5=O6 -> O6
    :O6 -> H9
    O8-H9 -> C3-O8
end
step "epoxide opening"
    :O2 -> C3=O2
    C3-O8 -> O8
    releases O6
end
step "silyl transfer"
    :O8 -> Si1
    Si1-O2 -> O2
end
product "C[Si](C)(C)OC1CCCCC1=O"
'''

# Hunsdiecker reaction (textbook account, from memory): silver cyclohexanecarboxylate and
# bromine give the acyl hypobromite; homolysis, loss of CO2 and bromine-atom transfer from a
# second hypobromite (the chain) give bromocyclohexane.
HUNSDIECKER = '''\
title "Hunsdiecker reaction"
species carboxylate = "[O-:3][C:2](=[O:4])[CH:1]1CCCCC1"
species silver = "[Ag+:5]"
species bromine = "[Br:6][Br:7]"
step "acyl hypobromite"
    :O3 -> Br6
    Br6-Br7 -> Br7
end
step "silver bromide precipitates"
    :Br7 -> Ag5
    releases Ag5
end
step "O-Br homolysis" under "CCl4, heat"
    O3-Br6 ~> O3
    O3-Br6 ~> Br6
end
step "loss of carbon dioxide"
    .O3 ~> C2=O3
    C1-C2 ~> C2=O3
    C1-C2 ~> C1
    releases C2
end
step "bromine atom transfer"
    uses hypobromite = "[Br:10][O:11][C:12](=O)C1CCCCC1"
    .C1 ~> C1-Br10
    Br10-O11 ~> C1-Br10
    Br10-O11 ~> O11
end
product "BrC1CCCCC1"
'''

# Corey-Kim oxidation (textbook account, from memory): dimethyl sulfide and NCS give the
# chlorosulfonium ion; propan-2-ol displaces chloride at sulfur and triethylamine makes the
# sulfonium ylide, which removes the carbinol hydrogen intramolecularly: acetone and DMS.
COREY_KIM = '''\
title "Corey-Kim oxidation"
species dms = "C[S:1][CH3:2]"
species ncs = "O=C1CCC(=O)[N:4]1[Cl:3]"
species alcohol = "C[CH:5](C)[OH:6]"
species base = "CC[N:7](CC)CC"
step "chlorosulfonium ion" under "toluene, 0 °C"
    :S1 -> Cl3
    Cl3-N4 -> N4
end
step "alcohol at sulfur"
    :O6 -> S1
    S1-Cl3 -> Cl3
end
step "deprotonation at oxygen"
    :N4 -> H(O6)
    O6-H -> O6
    expect "C[S+](C)OC(C)C"
end
step "ylide formation"
    :N7 -> H(C2)
    C2-H -> C2
end
step "intramolecular elimination"
    :C2 -> H(C5)
    C5-H -> C5=O6
    O6-S1 -> S1
end
product "CC(C)=O.CSC"
'''

# Polonovski reaction, first stage (textbook account, from memory): trimethylamine N-oxide is
# acylated by acetic anhydride and acetate removes an N-methyl proton as N-O breaks (E2-like),
# giving the N,N-dimethyliminium ion.
POLONOVSKI = '''\
title "Polonovski reaction: iminium ion"
species oxide = "C[N+:1](C)([O-:2])[CH3:3]"
species anhydride = "C[C:4](=[O:5])[O:6][C:7](=[O:8])C"
step "O-acylation"
    :O2 -> C4
    C4=O5 -> O5
end
step "acetate leaves"
    :O5 -> C4=O5
    C4-O6 -> O6
    expect "CC(=O)O[N+](C)(C)C"
end
step "elimination to the iminium ion"
    :O6 -> H(C3)
    C3-H -> C3=N1
    N1-O2 -> O2
end
product "C=[N+](C)C.CC(=O)O.CC(=O)[O-]"
'''

# [2,3]-Meisenheimer rearrangement (textbook account, from memory): an allylic amine N-oxide
# gives the O-allyl hydroxylamine through a five-membered cyclic array.
MEISENHEIMER = '''\
title "[2,3]-Meisenheimer rearrangement"
species oxide = "C[N+:1](C)([O-:2])[CH2:3][CH:4]=[CH2:5]"
step "[2,3]-sigmatropic shift" under "heat"
    :O2 -> O2-C5
    C4=C5 -> C3=C4
    C3-N1 -> N1
end
product "CN(C)OCC=C"
'''

# Eschenmoser-Tanabe fragmentation (textbook account, from memory): the tosylhydrazone of
# 2,3-epoxycyclohexanone, deprotonated at N, opens the epoxide to an alkoxide; the alkoxide
# then fragments (Grob-type) to hex-5-ynal, nitrogen and p-toluenesulfinate.
ESCHENMOSER_FRAGMENTATION = '''\
title "Eschenmoser-Tanabe fragmentation"
species hydrazone = "[C:1]1(=[N:8][NH:9][S:10](=O)(=O)c2ccc(C)cc2)[CH:2]3[O:7][CH:3]3[CH2:4][CH2:5][CH2:6]1"
species base = "C[O-:11]"
step "N-H deprotonation"
    :O11 -> H(N9)
    N9-H -> N9
end
step "epoxide opening"
    :N9 -> N8=N9
    C1=N8 -> C1=C2
    C2-O7 -> O7
    expect "[O-]C1CCCC(N=NS(=O)(=O)c2ccc(C)cc2)=C1"
end
step "fragmentation"
    :O7 -> C3=O7
    C2-C3 -> C1#C2
    C1-N8 -> N8#N9
    N9-S10 -> S10
end
product "O=CCCCC#C"
'''

# Bamford-Stevens reaction, aprotic (textbook account, from memory): cyclohexanone tosylhydrazone
# and sodium methoxide give the diazo compound; it loses nitrogen to a carbene and a 1,2-hydride
# shift gives cyclohexene.
BAMFORD_STEVENS = '''\
title "Bamford-Stevens reaction"
species hydrazone = "[C:1]1(=[N:2][NH:3][S:4](=O)(=O)c2ccc(C)cc2)[CH2:5]CCC[CH2:6]1"
species base = "C[O-:7]"
step "N-H deprotonation" over "NaOMe" under "diglyme"
    :O7 -> H(N3)
    N3-H -> N3
end
step "sulfinate leaves"
    :N2 -> N2=N3
    N3-S4 -> S4
    expect "[N-]=[N+]=C1CCCCC1"
end
step "loss of nitrogen" under "heat"
    C1=N2 -> C1
    C1-N2 -> N2
    :N3 -> N2#N3
    releases N2
end
step "1,2-hydride shift"
    C5-H -> C1-H(C5)
    :C1 -> C1=C5
end
product "C1=CCCCC1"
'''

# Staudinger beta-lactam synthesis (textbook account, from memory): the imine nitrogen adds to the
# ketene's central carbon; the zwitterionic enolate closes conrotatorily onto the iminium carbon.
STAUDINGER_LACTAM = '''\
title "Staudinger beta-lactam synthesis"
species ketene = "[CH2:1]=[C:2]=[O:3]"
species imine = "c1ccc(cc1)[CH:4]=[N:5]C"
step "nitrogen adds to the ketene"
    :N5 -> C2
    C2=O3 -> O3
end
step "conrotatory ring closure"
    :O3 -> C2=O3
    C1=C2 -> C1-C4
    C4=N5 -> N5
end
product "CN1C(=O)CC1c1ccccc1"
'''

# Meyer-Schuster rearrangement (textbook account, from memory): 4-phenylbut-3-yn-2-ol in aqueous
# acid loses water to a propargyl/allenyl cation; water adds at the alkyne end, and the allenol
# tautomerises to (E/Z)-1-phenylbut-2-en-1-one.
MEYER_SCHUSTER = '''\
title "Meyer-Schuster rearrangement"
species alcohol = "[CH3:8][CH:1]([OH:2])[C:3]#[C:4]c1ccccc1"
species acid = "[OH3+:5]"
step "protonation" reversible
    :O2 -> H(O5)
    O5-H -> O5
end
step "loss of water"
    C1-O2 -> O2
    releases O2
end
step "allenyl cation" resonance
    C3#C4 -> C1=C3
end
step "water adds"
    :O5 -> C4
end
step "deprotonation"
    uses water = "[OH2:6]"
    :O6 -> H(O5)
    O5-H -> O5
    expect "CC=C=C(O)c1ccccc1"
end
step "allenol tautomerisation"
    uses h3o = "[OH3+:7]"
    :O5 -> C4=O5
    C3=C4 -> C3-H(O7)
    O7-H -> O7
end
step "deprotonation of the oxocarbenium"
    :O7 -> H(O5)
    O5-H -> O5
end
product "CC=CC(=O)c1ccccc1"
'''

# Acyloin condensation (textbook account, from memory): sodium gives two ester ketyl radical
# anions, which couple; loss of methoxide gives butane-2,3-dione, two more electrons give the
# enediolate, and acid work-up and tautomerisation give acetoin (3-hydroxybutan-2-one).
ACYLOIN = '''\
title "Acyloin condensation"
species ester_a = "[CH3:20][C:1](=[O:2])[O:3]C"
species ester_b = "[CH3:21][C:4](=[O:5])[O:6]C"
species na_a = "[Na:7]"
species na_b = "[Na:8]"
step "electron transfer to the first ester" under "Na, toluene, reflux"
    .Na7 ~> :O2
    C1=O2 ~> O2
    C1=O2 ~> C1
end
step "electron transfer to the second ester"
    .Na8 ~> :O5
    C4=O5 ~> O5
    C4=O5 ~> C4
end
step "radical coupling"
    .C1 ~> C1-C4
    .C4 ~> C1-C4
end
step "loss of two methoxides"
    :O2 -> C1=O2
    C1-O3 -> O3
    :O5 -> C4=O5
    C4-O6 -> O6
    expect "CC(=O)C(C)=O"
end
step "electron transfer to the dione"
    uses na_c = "[Na:9]"
    .Na9 ~> :O2
    C1=O2 ~> O2
    C1=O2 ~> C1
end
step "second electron transfer: the enediolate"
    uses na_d = "[Na:10]"
    .Na10 ~> :O5
    C4=O5 ~> O5
    C4=O5 ~> C1=C4
    .C1 ~> C1=C4
    expect "C/C([O-])=C(/C)[O-]"
end
step "work-up: O-protonation" under "H3O+"
    uses h3o_a = "[OH3+:11]"
    uses h3o_b = "[OH3+:12]"
    :O2 -> H(O11)
    O11-H -> O11
    :O5 -> H(O12)
    O12-H -> O12
end
step "enol protonation at carbon"
    uses h3o_c = "[OH3+:13]"
    :O2 -> C1=O2
    C1=C4 -> C4-H(O13)
    O13-H -> O13
end
step "deprotonation of the oxocarbenium"
    :O13 -> H(O2)
    O2-H -> O2
end
product "CC(=O)C(C)O"
'''

# Ferrier rearrangement (textbook account, from memory) on a model glycal,
# 3-acetoxy-3,4-dihydro-2H-pyran: BF3 binds the acetate carbonyl, the ring oxygen pushes the
# acetate out through the allylic system (allylic oxocarbenium ion), and methanol adds at C1:
# the 2,3-unsaturated glycoside, 2-methoxy-3,6-dihydro-2H-pyran (from memory).
FERRIER = '''\
title "Ferrier rearrangement"
species glycal = "[O:6]1[CH:1]=[CH:2][CH:3]([O:7][C:8](C)=[O:9])[CH2:4][CH2:5]1"
species lewis_acid = "F[B:11](F)F"
species methanol = "C[OH:10]"
step "BF3 binds the acetate"
    :O9 -> B11
end
step "allylic ionisation"
    :O6 -> C1=O6
    C1=C2 -> C2=C3
    C3-O7 -> O7
    expect "C1=CC=[O+]CC1"
end
step "methanol adds at C1"
    :O10 -> C1
    C1=O6 -> O6
end
step "deprotonation"
    :O7 -> H(O10)
    O10-H -> O10
end
product "COC1OCCC=C1"
'''

# Removal of a TBS ether with fluoride (TBAF; textbook account, from memory): fluoride adds to
# silicon (pentacoordinate silicate), the alkoxide leaves and is protonated on work-up.
TBS_REMOVAL = '''\
title "TBS removal with fluoride"
species ether = "CC(C)(C)[Si:1](C)(C)[O:2][CH2:3]CCCC"
species fluoride = "[F-:4]"
step "fluoride adds to silicon" over "TBAF" under "THF"
    :F4 -> Si1
end
step "alkoxide leaves"
    Si1-O2 -> O2
end
step "work-up"
    uses water = "[OH2:5]"
    :O2 -> H(O5)
    O5-H -> O5
end
product "CCCCCO.CC(C)(C)[Si](C)(C)F"
'''

# Aza-Wittig reaction (textbook account, from memory): the iminophosphorane from phenyl azide and
# PPh3 adds to propanal ([2+2], an oxazaphosphetidine), which collapses to the imine and Ph3P=O.
AZA_WITTIG = '''\
title "Aza-Wittig reaction"
species iminophosphorane = "c1ccc(cc1)[N:1]=[P:2](c1ccccc1)(c1ccccc1)c1ccccc1"
species aldehyde = "CC[CH:3]=[O:4]"
step "[2+2] addition"
    N1=P2 -> N1-C3
    C3=O4 -> O4-P2
end
step "cycloreversion"
    P2-N1 -> C3=N1
    C3-O4 -> O4=P2
end
product "CCC=Nc1ccccc1.O=P(c1ccccc1)(c1ccccc1)c1ccccc1"
'''

# Retro-Claisen cleavage (textbook account, from memory): hydroxide adds to a carbonyl of
# 3,3-dimethylpentane-2,4-dione, which has no acidic C-H to lose; the tetrahedral intermediate
# expels the ketone enolate, which takes the acid proton: acetate and 3-methylbutan-2-one.
RETRO_CLAISEN = '''\
title "Retro-Claisen cleavage"
species dione = "[CH3:1][C:2](=[O:6])[C:3](C)(C)[C:4](=[O:5])[CH3:7]"
species base = "[OH-:9]"
step "hydroxide adds"
    :O9 -> C2
    C2=O6 -> O6
end
step "C-C cleavage"
    :O6 -> C2=O6
    C2-C3 -> C3=C4
    C4=O5 -> O5
end
step "proton transfer"
    :O5 -> C4=O5
    C3=C4 -> C3-H(O9)
    O9-H -> O9
end
product "CC(=O)[O-].CC(C)C(C)=O"
'''

# Hantzsch thiazole synthesis (textbook account, from memory): thioacetamide and chloroacetone
# give 2,4-dimethylthiazole by S-alkylation, ring closure of nitrogen onto the ketone and
# acid-catalysed dehydration, water passing the protons.
HANTZSCH_THIAZOLE = '''\
title "Hantzsch thiazole synthesis"
species thioamide = "C[C:1](=[S:2])[NH2:3]"
species haloketone = "[Cl:4][CH2:5][C:6](=[O:7])[CH3:8]"
step "S-alkylation"
    :S2 -> C5
    C5-Cl4 -> Cl4
end
step "amidinium-like resonance" resonance
    :N3 -> C1=N3
    C1=S2 -> S2
end
step "N-H deprotonation"
    uses water = "[OH2:9]"
    :O9 -> H(N3)
    N3-H -> N3
end
step "ring closure"
    :N3 -> C6
    C6=O7 -> O7
end
step "proton transfer"
    :O7 -> H(N3)
    N3-H -> N3
    expect "CC1=NC(C)(O)CS1"
end
step "O-protonation"
    :O7 -> H(O9)
    O9-H -> O9
end
step "loss of water"
    C6-O7 -> O7
    releases O7
end
step "aromatisation"
    :O9 -> H(C5)
    C5-H -> C5=C6
end
product "Cc1csc(C)n1"
'''

# Ramberg-Backlund reaction (textbook account, from memory): ethyl chloromethyl sulfone is
# deprotonated alpha to sulfur, the carbanion closes the episulfone (3-exo-tet), and cheletropic
# loss of SO2 gives propene.
RAMBERG_BACKLUND = '''\
title "Ramberg-Backlund reaction"
species sulfone = "C[CH2:1][S:2](=O)(=O)[CH2:3][Cl:4]"
species base = "[OH-:5]"
step "deprotonation"
    :O5 -> H(C1)
    C1-H -> C1
end
step "episulfone closure"
    :C1 -> C3
    C3-Cl4 -> Cl4
end
step "cheletropic loss of SO2" under "heat"
    C1-S2 -> C1=C3
    C3-S2 -> S2
end
product "CC=C"
'''

# Dess-Martin oxidation (textbook account, from memory): propan-2-ol exchanges with an acetate on
# the periodinane and the released acetate takes the O-H proton; an acetate ligand then removes
# the carbinol hydrogen through a cyclic array as the I-O bonds break: acetone, acetic acid and
# the acetoxy-iodinane (iodine(III)).
DESS_MARTIN = '''\
title "Dess-Martin oxidation"
species dmp = "CC(=O)[O:1][I:2]1([O:3][C:13](C)=[O:12])([O:4]C(C)=O)OC(=O)c2ccccc12"
species alcohol = "C[CH:5](C)[OH:6]"
step "ligand exchange" under "CH2Cl2, 25 °C"
    :O6 -> I2
    I2-O1 -> O1
end
step "deprotonation"
    :O1 -> H(O6)
    O6-H -> O6
end
step "oxidation"
    :O12 -> H(C5)
    C5-H -> C5=O6
    O6-I2 -> I2
    I2-O3 -> C13=O3
    C13=O12 -> O12
end
product "CC(C)=O.CC(=O)OI1OC(=O)c2ccccc21"
'''


# Syn dihydroxylation of (Z)-but-2-ene by OsO4 (textbook account, from memory): a concerted
# [3+2] cycloaddition puts both oxygens on one face, giving the cyclic osmate ester of the meso
# diol (cis methyls).
OSMIUM_DIHYDROXYLATION = '''\
title "Syn dihydroxylation of (Z)-but-2-ene by OsO4"
species alkene = "C/[CH:1]=[CH:2]\\\\C"
species osmium = "[O:3]=[Os:4](=[O:5])(=O)=O"
step "[3+2] cycloaddition"
    C1=C2 -> C1-O3
    Os4=O3 -> Os4
    :O5 -> C2
    Os4=O5 -> O5
end
product "C[C@@H]1O[Os](=O)(=O)O[C@@H]1C"
'''


# Heterocycle syntheses written while hunting for slips in their checks.

# Paal-Knorr pyrrole: hexane-2,5-dione and methylamine in weak acid (Amarnath's hemiaminal route;
# textbook account, common practice, from memory): 1,2,5-trimethylpyrrole.
PAAL_KNORR_PYRROLE = '''\
species dione = "[CH3:7][C:1](=[O:2])[CH2:3][CH2:4][C:5](=[O:6])[CH3:8]"
species amine = "[CH3:20][NH2:9]"
species acid  = "[OH3+:10]"
step "protonation of C1=O" reversible
    :O2 -> H(O10)
    O10-H -> O10
end
step "amine adds" reversible
    :N9 -> C1
    C1=O2 -> O2
end
step "N-deprotonation: the hemiaminal" reversible
    :O10 -> H(N9)
    N9-H -> N9
end
step "protonation of C5=O" reversible
    :O6 -> H(O10)
    O10-H -> O10
end
step "5-exo-trig ring closure" reversible
    :N9 -> C5
    C5=O6 -> O6
end
step "N-deprotonation" reversible
    :O10 -> H(N9)
    N9-H -> N9
end
step "protonation of the C1 hydroxyl" reversible
    :O2 -> H(O10)
    O10-H -> O10
end
step "loss of water: iminium"
    :N9 -> C1=N9
    C1-O2 -> O2
    releases O2
end
step "enamine" reversible
    uses water = "[OH2:11]"
    :O11 -> H(C3)
    C3-H -> C1=C3
    C1=N9 -> N9
end
step "protonation of the C5 hydroxyl" reversible
    :O6 -> H(O11)
    O11-H -> O11
end
step "loss of water: iminium"
    :N9 -> C5=N9
    C5-O6 -> O6
    releases O6
end
step "aromatisation"
    :O11 -> H(C4)
    C4-H -> C4=C5
    C5=N9 -> N9
end
product "Cc1ccc(C)n1C"
'''


# Knorr pyrrole synthesis: aminoacetone and ethyl acetoacetate in acetic acid (textbook account,
# common practice, from memory): enamine from the ketoester, its carbon closes onto the
# aminoketone's carbonyl (5-exo-trig), dehydration and tautomerisation give
# ethyl 2,4-dimethyl-1H-pyrrole-3-carboxylate.
KNORR_PYRROLE = '''\
species aminoketone = "[NH2:1][CH2:2][C:3](=[O:4])[CH3:5]"
species ketoester   = "[CH3:10][C:11](=[O:12])[CH2:13][C:14](=[O:15])[O:16][CH2:17][CH3:18]"
species acid        = "[CH3:31][C:32](=[O:33])[OH:30]"
step "protonation of the ketoester C=O" reversible
    :O12 -> H(O30)
    O30-H -> O30
end
step "amine adds" reversible
    :N1 -> C11
    C11=O12 -> O12
end
step "N-deprotonation: the hemiaminal" reversible
    :O30 -> H(N1)
    N1-H -> N1
end
step "protonation of the hydroxyl" reversible
    :O12 -> H(O30)
    O30-H -> O30
end
step "loss of water: iminium"
    :N1 -> C11=N1
    C11-O12 -> O12
    releases O12
end
step "enamine" reversible
    :O30 -> H(C13)
    C13-H -> C11=C13
    C11=N1 -> N1
end
step "protonation of the aminoketone C=O" reversible
    :O4 -> H(O30)
    O30-H -> O30
end
step "enamine carbon closes the ring (5-exo-trig)"
    :N1 -> C11=N1
    C11=C13 -> C13-C3
    C3=O4 -> O4
end
step "enamine again" reversible
    :O30 -> H(C13)
    C13-H -> C11=C13
    C11=N1 -> N1
end
step "protonation of the tertiary hydroxyl" reversible
    :O4 -> H(O30)
    O30-H -> O30
end
step "loss of water (vinylogous)"
    :N1 -> C11=N1
    C11=C13 -> C13=C3
    C3-O4 -> O4
    releases O4
end
step "aromatisation"
    :O30 -> H(C2)
    C2-H -> C2=C3
    C3=C13 -> C11=C13
    C11=N1 -> N1
end
product "CCOC(=O)c1c(C)[nH]cc1C"
'''


# Hantzsch dihydropyridine synthesis, the ring-forming half (textbook account, common practice,
# from memory): methyl 3-aminocrotonate (the enamine of the ketoester and ammonia) adds to the
# Knoevenagel adduct of acetaldehyde and methyl acetoacetate (Michael), tautomerisations, the
# nitrogen closes onto the ketone (6-exo-trig) and water is lost: dimethyl
# 2,4,6-trimethyl-1,4-dihydropyridine-3,5-dicarboxylate. Acetic acid / acetate (ammonium acetate
# conditions) passes the protons.
HANTZSCH_DIHYDROPYRIDINE = '''\
species enamine  = "[NH2:1][C:2]([CH3:3])=[CH:4][C:5](=[O:6])[O:7][CH3:8]"
species enone    = "[CH3:20][CH:10]=[C:11]([C:12](=[O:13])[CH3:14])[C:15](=[O:16])[O:17][CH3:18]"
species acid     = "[CH3:31][C:32](=[O:33])[OH:30]"
step "Michael addition of the enamine carbon"
    :N1 -> C2=N1
    C2=C4 -> C4-C10
    C10=C11 -> C11=C12
    C12=O13 -> O13
end
step "enolate protonated" reversible
    :O13 -> H(O30)
    O30-H -> O30
end
step "iminium to enamine" reversible
    :O30 -> H(C4)
    C4-H -> C2=C4
    C2=N1 -> N1
end
step "enol to ketone: protonation at carbon" reversible
    uses acid2 = "[CH3:41][C:42](=[O:43])[OH:40]"
    :O13 -> C12=O13
    C11=C12 -> C11-H(O40)
    O40-H -> O40
end
step "oxocarbenium deprotonated" reversible
    :O40 -> H(O13)
    O13-H -> O13
end
step "protonation of the ketone" reversible
    :O13 -> H(O30)
    O30-H -> O30
end
step "6-exo-trig ring closure" reversible
    :N1 -> C12
    C12=O13 -> O13
end
step "N-deprotonation" reversible
    :O30 -> H(N1)
    N1-H -> N1
end
step "protonation of the hydroxyl" reversible
    :O13 -> H(O30)
    O30-H -> O30
end
step "loss of water: iminium"
    :N1 -> C12=N1
    C12-O13 -> O13
    releases O13
end
step "iminium to enamine: the 1,4-dihydropyridine"
    :O30 -> H(C11)
    C11-H -> C11=C12
    C12=N1 -> N1
end
product "COC(=O)C1=C(C)NC(C)=C(C(=O)OC)C1C"
'''


# Biginelli reaction: urea, acetaldehyde and methyl acetoacetate in acid, by the N-acyliminium
# route (Kappe 1997; textbook account, common practice, from memory): methyl
# 4,6-dimethyl-2-oxo-1,2,3,4-tetrahydropyrimidine-5-carboxylate.
BIGINELLI = '''\
species urea      = "[NH2:1][C:2](=[O:3])[NH2:4]"
species aldehyde  = "[CH3:6][CH:5]=[O:7]"
species ketoester = "[CH3:10][C:11](=[O:12])[CH2:13][C:14](=[O:15])[O:16][CH3:17]"
species acid      = "[OH3+:30]"
step "protonation of the aldehyde" reversible
    :O7 -> H(O30)
    O30-H -> O30
end
step "urea adds" reversible
    :N1 -> C5
    C5=O7 -> O7
end
step "N-deprotonation" reversible
    :O30 -> H(N1)
    N1-H -> N1
end
step "protonation of the hydroxyl" reversible
    :O7 -> H(O30)
    O30-H -> O30
end
step "loss of water: the N-acyliminium ion"
    :N1 -> C5=N1
    C5-O7 -> O7
    releases O7
end
step "protonation of the ketoester C=O" reversible
    uses acid2 = "[OH3+:31]"
    :O12 -> H(O31)
    O31-H -> O31
end
step "enol" reversible
    :O30 -> H(C13)
    C13-H -> C11=C13
    C11=O12 -> O12
end
step "the enol adds to the N-acyliminium ion"
    :O12 -> C11=O12
    C11=C13 -> C13-C5
    C5=N1 -> N1
end
step "O-deprotonation" reversible
    :O31 -> H(O12)
    O12-H -> O12
end
step "protonation of the ketone" reversible
    :O12 -> H(O30)
    O30-H -> O30
end
step "6-exo-trig ring closure" reversible
    :N4 -> C11
    C11=O12 -> O12
end
step "N-deprotonation" reversible
    :O30 -> H(N4)
    N4-H -> N4
end
step "protonation of the hydroxyl" reversible
    :O12 -> H(O31)
    O31-H -> O31
end
step "loss of water: iminium"
    :N4 -> C11=N4
    C11-O12 -> O12
    releases O12
end
step "iminium to the enamide"
    :O31 -> H(C13)
    C13-H -> C11=C13
    C11=N4 -> N4
end
product "COC(=O)C1=C(C)NC(=O)NC1C"
'''


# Doebner-Miller quinoline synthesis, first steps: aniline and crotonaldehyde in aqueous acid
# (conjugate addition, ring closure by the ortho carbon onto the protonated aldehyde, loss of water;
# textbook account, common practice, from memory) give 2-methyl-1,2-dihydroquinoline, which the
# oxidant then turns into 2-methylquinoline (not drawn).
DOEBNER_MILLER = '''\
species aniline = "[NH2:1][C:2]1=[CH:3][CH:4]=[CH:5][CH:6]=[CH:7]1"
species enal    = "[CH3:13][CH:12]=[CH:11][CH:10]=[O:14]"
species acid    = "[OH3+:30]"
step "protonation of the aldehyde" reversible
    :O14 -> H(O30)
    O30-H -> O30
end
step "conjugate addition of the aniline"
    :N1 -> C12
    C11=C12 -> C10=C11
    C10=O14 -> O14
end
step "N-deprotonation" reversible
    :O30 -> H(N1)
    N1-H -> N1
end
step "enol to protonated aldehyde" reversible
    :O14 -> C10=O14
    C10=C11 -> C11-H(O30)
    O30-H -> O30
end
step "ortho carbon closes the ring"
    :N1 -> C2=N1
    C2=C3 -> C3-C10
    C10=O14 -> O14
end
step "rearomatisation" reversible
    :O30 -> H(C3)
    C3-H -> C2=C3
    C2=N1 -> N1
end
step "protonation of the benzylic hydroxyl" reversible
    :O14 -> H(O30)
    O30-H -> O30
end
step "loss of water: benzylic cation"
    C10-O14 -> O14
    releases O14
end
step "loss of a proton"
    uses water = "[OH2:31]"
    :O31 -> H(C11)
    C11-H -> C10=C11
end
product "CC1C=Cc2ccccc2N1"
'''


# Bischler-Napieralski reaction: N-(2-phenylethyl)acetamide and POCl3 by the nitrilium route
# (Fodor and Nagubandi 1980; textbook account, common practice, from memory): the amide oxygen
# takes phosphorus, the imidoyl dichlorophosphate loses its phosphate as a nitrilium ion, which the
# ring attacks (6-endo-dig); rearomatisation gives 1-methyl-3,4-dihydroisoquinoline.
BISCHLER_NAPIERALSKI = '''\
species amide = "[CH3:10][C:11](=[O:12])[NH:13][CH2:14][CH2:15][C:1]1=[CH:2][CH:3]=[CH:4][CH:5]=[CH:6]1"
species pocl3 = "[O:20]=[P:21]([Cl:22])([Cl:23])[Cl:24]"
step "the amide oxygen takes phosphorus"
    :O12 -> P21
    P21-Cl22 -> Cl22
end
step "N-deprotonation: the imidoyl dichlorophosphate" reversible
    :Cl22 -> H(N13)
    N13-H -> N13=C11
    C11=O12 -> O12
end
step "loss of dichlorophosphate: the nitrilium ion"
    :N13 -> C11#N13
    C11-O12 -> O12
end
step "the ring attacks the nitrilium carbon (6-endo-dig)"
    C1=C2 -> C2-C11
    C11#N13 -> N13
end
step "rearomatisation"
    uses chloride = "[Cl-:25]"
    :Cl25 -> H(C2)
    C2-H -> C1=C2
end
product "CC1=NCCc2ccccc21"
'''


# Robinson-Gabriel oxazole synthesis: N-(2-oxopropyl)acetamide in concentrated sulfuric acid
# (textbook account, common practice, from memory): the amide oxygen closes onto the protonated
# ketone (5-exo-trig), and loss of water and a proton gives 2,5-dimethyloxazole.
ROBINSON_GABRIEL = '''\
species ketoamide = "[CH3:8][C:1](=[O:2])[NH:3][CH2:4][C:5](=[O:6])[CH3:7]"
species acid      = "[OH3+:30]"
step "protonation of the ketone" reversible
    :O6 -> H(O30)
    O30-H -> O30
end
step "the amide oxygen closes the ring (5-exo-trig)" reversible
    :O2 -> C5
    C5=O6 -> O6
end
step "N-deprotonation: the oxazoline" reversible
    :O30 -> H(N3)
    N3-H -> C1=N3
    C1=O2 -> O2
end
step "protonation of the hydroxyl" reversible
    :O6 -> H(O30)
    O30-H -> O30
end
step "loss of water: oxocarbenium ion"
    :O2 -> C5=O2
    C5-O6 -> O6
    releases O6
end
step "aromatisation"
    uses water = "[OH2:31]"
    :O31 -> H(C4)
    C4-H -> C4=C5
    C5=O2 -> O2
end
product "Cc1cnc(C)o1"
'''


# Gewald thiophene synthesis, first steps: acetone and ethyl cyanoacetate with morpholine
# (Knoevenagel condensation, then the vinylogous anion takes sulfur from S8; textbook account,
# common practice, from memory): a polysulfide anion of ethyl 2-cyano-3-methylbut-2-enoate.
GEWALD_FIRST_STEPS = '''\
species ester  = "[N:1]#[C:2][CH2:3][C:4](=[O:5])[O:6][CH2:7][CH3:8]"
species ketone = "[CH3:11][C:10](=[O:12])[CH3:13]"
species base   = "C1CO[CH2:41][CH2:42][NH:20]1"
species sulfur = "[S:21]1[S:22][S:23][S:24][S:25][S:26][S:27][S:28]1"
step "enolate of the cyanoacetate" reversible over "morpholine"
    :N20 -> H(C3)
    C3-H -> C3=C4
    C4=O5 -> O5
end
step "aldol addition" reversible
    :O5 -> C4=O5
    C3=C4 -> C3-C10
    C10=O12 -> O12
end
step "alkoxide protonated" reversible
    :O12 -> H(N20)
    N20-H -> N20
end
step "enolate again" reversible
    :N20 -> H(C3)
    C3-H -> C3=C4
    C4=O5 -> O5
end
step "loss of hydroxide (E1cB)"
    :O5 -> C4=O5
    C3=C4 -> C3=C10
    C10-O12 -> O12
end
step "the gamma proton: a dienolate" reversible
    uses base2 = "C1COCC[NH:50]1"
    :N50 -> H(C11)
    C11-H -> C10=C11
    C3=C10 -> C3=C4
    C4=O5 -> O5
end
step "the dienolate opens S8"
    :O5 -> C4=O5
    C3=C4 -> C3=C10
    C10=C11 -> C11-S21
    S21-S28 -> S28
end
product "CCOC(=O)C(C#N)=C(C)CSSSSSSS[S-]"
'''


# Gewald thiophene synthesis, ring closure: the thiolate left when the polysulfide chain has given
# up its sulfur adds to the nitrile (5-exo-dig), and tautomerisation gives ethyl
# 2-amino-4-methylthiophene-3-carboxylate (textbook account, common practice, from memory).
GEWALD_RING_CLOSURE = '''\
species thiolate = "[S-:21][CH2:11]/[C:10]([CH3:13])=[C:3](\\[C:2]#[N:1])[C:4](=[O:5])[O:6][CH2:7][CH3:8]"
species acid     = "C1COCC[NH2+:20]1"
step "the thiolate adds to the nitrile (5-exo-dig)"
    :S21 -> C2
    C2#N1 -> N1
end
step "N-protonation" reversible
    :N1 -> H(N20)
    N20-H -> N20
end
step "the ring C-H: an ester enolate" reversible
    :N20 -> H(C11)
    C11-H -> C10=C11
    C3=C10 -> C3=C4
    C4=O5 -> O5
end
step "tautomerisation: the 2-aminothiophene" reversible
    :O5 -> C4=O5
    C3=C4 -> C2=C3
    C2=N1 -> N1-H(N20)
    N20-H -> N20
end
product "CCOC(=O)c1c(C)csc1N"
'''


# Friedlander quinoline synthesis: 2-aminobenzaldehyde and acetone with hydroxide, aldol first
# (textbook account, common practice, from memory): crossed aldol condensation to the enone, the
# amine closes onto the ketone (6-exo-trig) and loss of water gives 2-methylquinoline.
FRIEDLANDER = '''\
species aldehyde = "[NH2:1][C:2]1=[C:3]([CH:4]=[O:5])[CH:6]=[CH:7][CH:8]=[CH:9]1"
species ketone   = "[CH3:11][C:10](=[O:12])[CH3:13]"
species base     = "[OH-:20]"
step "enolate" reversible over "NaOH" under "EtOH, reflux"
    :O20 -> H(C11)
    C11-H -> C10=C11
    C10=O12 -> O12
end
step "aldol addition" reversible
    :O12 -> C10=O12
    C10=C11 -> C11-C4
    C4=O5 -> O5
end
step "alkoxide protonated" reversible
    :O5 -> H(O20)
    O20-H -> O20
end
step "enolate of the aldol" reversible
    :O20 -> H(C11)
    C11-H -> C10=C11
    C10=O12 -> O12
end
step "loss of hydroxide (E1cB)"
    :O12 -> C10=O12
    C10=C11 -> C4=C11
    C4-O5 -> O5
    releases O5
end
step "the amine closes onto the ketone (6-exo-trig)" reversible
    :N1 -> C10
    C10=O12 -> O12
end
step "alkoxide protonated" reversible
    :O12 -> H(O20)
    O20-H -> O20
end
step "N-deprotonation: the carbinolamine" reversible
    :O20 -> H(N1)
    N1-H -> N1
end
step "the nitrogen pushes out hydroxide"
    :N1 -> C10=N1
    C10-O12 -> O12
    releases O12
end
step "N-deprotonation: the quinoline"
    :O20 -> H(N1)
    N1-H -> N1
end
product "Cc1ccc2ccccc2n1"
'''


# (their TEXTBOOK names, for tests that count over the corpus as it stood before them)
HETEROCYCLE_SYNTHESES = ("paal-knorr pyrrole", "knorr pyrrole", "hantzsch dihydropyridine", "biginelli",
                         "doebner-miller", "bischler-napieralski", "robinson-gabriel", "gewald first steps",
                         "gewald ring closure", "friedlander")

TEXTBOOK = {
    "wittig": (WITTIG, "C=C(C)C.O=P(c1ccccc1)(c1ccccc1)c1ccccc1", True),
    "bromination": (BROMINATION, "Br[C@@H]1CCCC[C@H]1Br", True),
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
    "e1 tert-butanol": (E1_TERT_BUTANOL, "C=C(C)C.[OH3+]", True),
    "friedel-crafts acylation": (FRIEDEL_CRAFTS_ACYLATION, "CC(=O)c1ccccc1.Cl", True),
    "acid enolisation": (ACID_ENOLISATION, "C=C(C)O.[OH3+]", True),
    "aminolysis": (AMINOLYSIS, "CC(N)=O.C[O-].[NH4+]", True),
    "claisen rearrangement": (CLAISEN_REARRANGEMENT, "C=CCCC=O", True),
    "acid hydration": (ACID_HYDRATION, "CC(C)(C)O.[OH3+]", True),
    "hydride addition": (HYDRIDE_ADDITION, "CCC[O-].[AlH3]", True),
    "acid aldol": (ACID_ALDOL, "CC(=O)CC(C)(C)O.[OH3+]", True),
    "sn2 inversion": (SN2_INVERSION, "CC[C@H](C)O.[Br-]", True),
    "epoxide opening": (EPOXIDE_OPENING, "CO[C@@H](C)CO.[OH3+]", True),   # (S): inversion at C1
    "cannizzaro": (CANNIZZARO, "O=C([O-])c1ccccc1.OCc1ccccc1", True),
    "reductive amination": (REDUCTIVE_AMINATION, "CNC(C)C", True),
    "knoevenagel": (KNOEVENAGEL, "N#CC(C#N)=Cc1ccccc1.[OH-]", True),
    "benzoin": (BENZOIN, "O=C(c1ccccc1)C(O)c1ccccc1.[C-]#N", True),
    "nitrile hydrolysis": (NITRILE_HYDROLYSIS, "CC(N)=O.[OH-]", True),
    "radical hbr addition": (RADICAL_HBR_ADDITION, "CCCBr", True),
    "beckmann": (BECKMANN, "CC(=O)Nc1ccccc1", True),
    "haloform cleavage": (HALOFORM_CLEAVAGE, "CC(=O)[O-].BrC(Br)Br", True),
    "retro-aldol": (RETRO_ALDOL, "CC(C)=O.CC(C)=O", True),
    "dieckmann": (DIECKMANN, "CCOC(=O)C1CCCC1=O", True),
    "wolff-kishner": (WOLFF_KISHNER, "CCC", True),
    "hofmann elimination": (HOFMANN_ELIMINATION, "C=CCC.CN(C)C.O", True),
    "phenol tautomerisation": (PHENOL_TAUTOMERISATION, "Oc1ccccc1.[OH-]", True),
    "epoxide closure": (EPOXIDE_CLOSURE, "C1CC[C@H]2O[C@H]2C1", True),   # (1R,2S): meso, inversion at C2
    "corey-chaykovsky": (COREY_CHAYKOVSKY, "C1CCC2(CC1)CO2.CSC", True),
    "radical cyclisation": (RADICAL_CYCLISATION, "CC1CCCC1", True),
    "mesylate sn2": (MESYLATE_SN2, "CCI.CS(=O)(=O)[O-]", True),
    "halohydrin": (HALOHYDRIN, "O[C@@H]1CCCC[C@H]1Br", True),
    "thia-michael": (THIA_MICHAEL, "CSCCC(C)=O", True),
    "baeyer-villiger retention": (BAEYER_VILLIGER_RETENTION, "CC(=O)O[C@@H](C)c1ccccc1", True),   # (S) kept
    "diazotisation": (DIAZOTISATION, "N#[N+]c1ccccc1", True),
    "hofmann rearrangement": (HOFMANN_REARRANGEMENT, "CN.O=C=O", True),
    "mesylation": (MESYLATION, "CCOS(C)(=O)=O", True),
    "birch reduction": (BIRCH, "C1=CCC=CC1.CC[O-].[Na+]", True),
    "epoxidation": (EPOXIDATION, "C[C@@H]1O[C@@H]1C.CC(=O)O", True),
    "ene reaction": (ENE_REACTION, "C=CCCO", True),
    "mannich": (MANNICH, "CN(C)CCC(C)=O", True),
    "stork enamine alkylation": (STORK_ENAMINE, "CC1CCCCC1=O", True),
    "keto ester michael": (KETO_ESTER_MICHAEL, "CCOC(=O)C(CCC(C)=O)C(C)=O", True),
    "horner-wadsworth-emmons": (HORNER_WADSWORTH_EMMONS, "CCOC(=O)C=Cc1ccccc1.CCOP(=O)([O-])OCC", True),
    "favorskii": (FAVORSKII, "COC(=O)C1CCCC1", True),
    "benzilic acid rearrangement": (BENZILIC_ACID, "OC(C(=O)[O-])(c1ccccc1)c1ccccc1", True),
    "curtius": (CURTIUS, "CNC(=O)OC", True),
    "swern oxidation": (SWERN, "CC(C)=O.CSC", False),   # the oxalyl fragment moves 0.53 out of shape; a C stands 0.44 from a Cl
    "darzens": (DARZENS, "CCOC(=O)C1OC1(C)C", True),
    "reformatsky": (REFORMATSKY, "CCOC(=O)CC(C)(C)O", True),
    "meerwein-ponndorf-verley": (MEERWEIN_PONNDORF_VERLEY, "CC(C)=O.CC(C)O[Al](OC(C)C)OC1CCCCC1", True),
    "anionic oxy-cope": (ANIONIC_OXY_COPE, "C=CCCCC=O", True),
    "tiffeneau-demjanov": (TIFFENEAU_DEMJANOV, "O=C1CCCCCC1", True),
    "pinner": (PINNER, "CCOC(C)=[NH2+].[Cl-]", True),
    "imine formation": (IMINE_FORMATION, "CN=Cc1ccccc1", True),
    "transesterification": (TRANSESTERIFICATION, "CCOC(C)=O.C[O-]", True),
    "schotten-baumann": (SCHOTTEN_BAUMANN, "CNC(C)=O.[Cl-].O", True),
    "enamine formation": (ENAMINE_FORMATION, "C1=C(N2CCCC2)CCCC1", True),
    "acid aldol dehydration": (ACID_ALDOL_DEHYDRATION, "CC(=O)C=C(C)C", True),
    "iodolactonisation": (IODOLACTONISATION, "O=C1CCC(CI)O1.[I-]", True),
    "aldehyde hydrate": (ALDEHYDE_HYDRATE, "CC(O)O.[OH-]", True),
    "cyanohydrin": (CYANOHYDRIN, "CC(C)(O)C#N.[C-]#N", True),
    "sulfonamide alkylation": (SULFONAMIDE_ALKYLATION, "Cc1ccc(cc1)S(=O)(=O)N(C)C.[I-]", True),
    "[2,3]-wittig": (WITTIG_2_3, "C=CCC([O-])c1ccccc1", True),
    "criegee ozonide": (CRIEGEE_OZONIDE, "C1OCOO1", True),
    "wolff rearrangement": (WOLFF, "CCC(=O)O", False),   # C4's dots 45 degrees from C2=C4 (the minus sign has the free side)
    "benzyne": (BENZYNE, "Nc1ccccc1", True),
    "dichlorocarbene": (DICHLOROCARBENE, "ClC1(Cl)[C@@H]2CCCC[C@@H]21", True),   # cis-fused (meso): the carbene adds to one face
    "mitsunobu": (MITSUNOBU, "CC[C@H](C)OC(=O)c1ccccc1.[O-][P+](c1ccccc1)(c1ccccc1)c1ccccc1", False),   # bonds cross and the ester moves 2.86 out of shape as the parts join
    "arbuzov": (ARBUZOV, "CCOP(C)(=O)OCC.CCI", True),
    "staudinger": (STAUDINGER, "CN=P(c1ccccc1)(c1ccccc1)c1ccccc1.N#N", True),
    "allylic bromination": (ALLYLIC_BROMINATION, "BrC1C=CCCC1.Br", True),
    "conjugate hbr addition": (CONJUGATE_HBR_ADDITION, "CC=CCBr", True),
    "nazarov": (NAZAROV, "O=C1C=CCC1", True),
    "pictet-spengler": (PICTET_SPENGLER, "C1Cc2ccccc2CN1", True),
    "baylis-hillman": (BAYLIS_HILLMAN, "C=C(C(O)c1ccccc1)C(=O)OC", False),   # DABCO's middle bridge inside its hexagon; the alkoxide's proton-transfer arrow has 1.26 of 1.4
    "cope elimination": (COPE_ELIMINATION, "C=CCC.CN(C)O", True),
    "pummerer": (PUMMERER, "CSCOC(C)=O.CC(=O)O", True),
    "ester reduction": (ESTER_REDUCTION, "OCc1ccccc1", True),
    "peterson": (PETERSON, "C=C(C)C.C[Si](C)(C)[O-]", True),
    "pyrrole bromination": (PYRROLE_BROMINATION, "Brc1ccc[nH]1.Br", True),
    "appel": (APPEL, "CCCCBr.[O-][P+](c1ccccc1)(c1ccccc1)c1ccccc1.BrC(Br)Br", True),
    "aibn": (AIBN, "C[C](C)C#N.C[C](C)C#N.N#N", True),
    "amine acetylation": (ACETYLATION, "CCNC(C)=O.CC(=O)[O-].c1cc[nH+]cc1", True),
    "thionyl chloride": (THIONYL_CHLORIDE, "CC(=O)Cl.O=S=O", True),
    "azo coupling": (AZO_COUPLING, "[O-]c1ccc(N=Nc2ccccc2)cc1.[OH3+]", True),
    "intramolecular acylation": (INTRAMOLECULAR_ACYLATION, "O=C1CCCc2ccccc21.[OH3+]", True),
    "robinson annulation": (ROBINSON_METHYLCYCLOHEXANONE, "CC12CCCCC1=CC(=O)CC2", True),
    "acid ester hydrolysis": (ACID_ESTER_HYDROLYSIS, "CC(=O)O.CCO", True),
    "henry": (HENRY, "OC(C[N+](=O)[O-])c1ccccc1", True),
    "cyclic hemiacetal": (CYCLIC_HEMIACETAL, "OC1CCCCO1", True),
    "aziridine closure": (AZIRIDINE_CLOSURE, "C1CN1", True),
    # (E) in the textbook; the bookkeeping sets no geometry for an alkene made by E1cB from unconfigured centres
    "claisen-schmidt": (CLAISEN_SCHMIDT, "CC(=O)C=Cc1ccccc1", True),
    "organolithium addition": (ORGANOLITHIUM_ADDITION, "CCCCC(C)(C)O[Li]", True),
    "diazomethane esterification": (DIAZOMETHANE_ESTERIFICATION, "CC(=O)OC", True),
    "acid epoxide opening": (ACID_EPOXIDE_OPENING, "COC(C)(C)CO", True),
    "markovnikov hbr addition": (MARKOVNIKOV_HBR, "CC(C)Br", True),
    "cyclopentadiene diels-alder": (CYCLOPENTADIENE_DIELS_ALDER, "O=CC1CC2C=CC1C2", True),
    "beta-keto acid decarboxylation": (BETA_KETO_ACID_DECARBOXYLATION, "CC(O)=C.O=C=O", True),
    "ester pyrolysis": (ESTER_PYROLYSIS, "C=C.CC(=O)O", True),
    "ritter": (RITTER, "CC(=O)NC(C)(C)C.[OH3+]", True),
    "wagner-meerwein methyl shift": (METHYL_SHIFT, "CC(C)=C(C)C.[OH3+]", True),
    "prins": (PRINS, "CC(C)(O)CCO.[OH3+]", True),
    "intramolecular williamson": (INTRAMOLECULAR_WILLIAMSON, "C1CCOC1.[Cl-]", True),
    "malonic ester alkylation": (MALONIC_ESTER_ALKYLATION, "CCOC(=O)C(C)C(=O)OCC.CCO.[I-]", True),
    "paal-knorr furan": (PAAL_KNORR, "Cc1ccc(C)o1.[OH3+].O", True),
    "strecker": (STRECKER, "CC(N)C#N", True),
    "lactonisation": (LACTONISATION, "O=C1CCCCO1.[OH3+]", True),
    "acetylide alkylation": (ACETYLIDE_ALKYLATION, "CC#CCC.N.[Br-]", True),
    "alkyne hydration": (ALKYNE_HYDRATION, "CC(C)=O", True),
    "nitrile oxide cycloaddition": (NITRILE_OXIDE_CYCLOADDITION, "C1CC(c2ccccc2)=NO1", True),
    "oxime formation": (OXIME_FORMATION, "CC(C)=NO", True),
    # (Z) again in the textbook (suprafacial); the bookkeeping sets no geometry for the new C2=C3
    "[1,5]-hydrogen shift": (HYDROGEN_SHIFT_1_5, "C=CC=CC", True),
    "chugaev": (CHUGAEV, "C=C.CSC(=O)S", True),
    "borane oxidation": (BORANE_OXIDATION, "CCCO[BH2].[OH-]", True),
    "thorpe-ziegler": (THORPE_ZIEGLER, "N#CC1=C(N)CCCC1.CC[O-]", True),
    "radical 5-exo-dig": (RADICAL_EXO_DIG, "[CH]=C1CCCC1", True),
    "boron aldol": (BORON_ALDOL, "CCC(=O)C(C)C(C)OB(C)C", True),
    "carbodiimide coupling": (CARBODIIMIDE_COUPLING, "CNC(C)=O.CNC(=O)NC", True),
    "boc removal": (BOC_REMOVAL, "CN.O=C=O.C=C(C)C", True),
    "thp removal": (THP_REMOVAL, "OC1CCCCO1.CO", True),
    "enamine intramolecular aldol": (ENAMINE_ALDOL, "CC12CCC(=O)CC1(O)CCC2=O.C1CCNC1", True),
    "fischer indole": (FISCHER_INDOLE, "Cc1cc2ccccc2[nH]1.[NH4+]", False),
    "dmap acetylation": (DMAP_ACETYLATION, "CCOC(C)=O.CN(C)c1ccncc1.CC(=O)[O-].CC[NH+](CC)CC", True),
    "mukaiyama aldol": (MUKAIYAMA, "CC(=O)CC(O[Si](C)(C)C)c1ccccc1.Cl[Ti](Cl)(Cl)Cl", True),
    "gabriel": (GABRIEL, "O=C1c2ccccc2C(=O)N1Cc1ccccc1.[Br-]", True),
    "aza-michael": (AZA_MICHAEL, "N#CCCN1CCCCC1.O", True),
    "friedel-crafts alkylation": (FRIEDEL_CRAFTS_ALKYLATION, "CC(C)(C)c1ccccc1.Cl.Cl[Al](Cl)Cl", False),   # the arenium's H 0.26 from a tert-butyl methyl
    "payne rearrangement": (PAYNE, "CC([O-])C1CO1", True),
    "michael-initiated ring closure": (MIRC, "COC(=O)C1(C(=O)OC)CC1C(C)=O.[Br-]", True),
    "grob fragmentation": (GROB, "C=O.C=C(C)C.[Br-]", True),
    "dakin": (DAKIN, "Oc1ccc(O)cc1.O=C[O-]", True),
    "silyl enol ether": (SILYL_ENOL_ETHER, "C[Si](C)(C)OC1=CCCCC1.[Cl-].CC[NH+](CC)CC", True),
    "enol ether hydrolysis": (ENOL_ETHER_HYDROLYSIS, "CC=O.CCO.[OH3+]", True),
    "lactam": (LACTAM, "O=C1CCCCN1.CO", True),
    # the chelating MgBr+ waits where its two oxygens' arrows cross the propyl chain, and the adduct is
    # redrawn (O3 moves 1.9 bond lengths) as the chelate ring closes
    "weinreb ketone": (WEINREB, "CCCC(C)=O.CNOC.O.Br[Mg+].[OH3+]", False),
    "sulfonation": (SULFONATION, "O=S(=O)(O)c1ccccc1.O=S(=O)([O-])O", True),
    "acyl chloride double grignard": (ACYL_CHLORIDE_GRIGNARD, "CC(C)(C)O.O.[Cl-].Br[Mg+].Br[Mg+]", True),
    "kinetic enolate methylation": (KINETIC_ENOLATE_METHYLATION, "CC1CCCC(C)C1=O.CC(C)NC(C)C.[I-]", True),
    "double dehydrobromination": (DOUBLE_DEHYDROBROMINATION, "CC#CC.N.N.[Br-].[Br-]", True),
    "anisole bromination": (ANISOLE_BROMINATION, "COc1ccc(Br)cc1.Br.Br[Fe](Br)Br", True),
    "iminium hydrolysis": (IMINIUM_HYDROLYSIS, "CC(C)=O.CN.[OH3+].[OH3+]", True),
    "fmoc removal": (FMOC_REMOVAL, "C1CC[NH2+]CC1.CNC(=O)[O-].c1ccc2c(c1)-c1ccccc1C2CN1CCCCC1", True),
    # tert-butoxide, where it left the carbonate, takes the N-H proton across the nitrogen's label
    "boc protection": (BOC_PROTECTION, "CCNC(=O)OC(C)(C)C.O=C=O.CC(C)(C)O", False),
    "cyclobutene ring opening": (CYCLOBUTENE_OPENING, "CC=CC=CC", True),
    "vilsmeier reagent": (VILSMEIER_REAGENT, "C[N+](C)=CCl.[O-]P(=O)(Cl)Cl", True),
    "azide-alkyne cycloaddition": (AZIDE_ALKYNE_CYCLOADDITION, "Cn1cc(C)nn1", True),
    "kolbe-schmitt": (KOLBE_SCHMITT, "[O-]C(=O)c1ccccc1[O-].Oc1ccccc1", True),
    "dithioacetal": (DITHIOACETAL, "CCSC(C)SCC.[OH3+].O", True),
    # the three tributyltin species crowd round the cyclohexyl carbon: their butyl chains overlap
    "stannane reduction": (STANNANE_REDUCTION, "C1CCCCC1.CCCC[Sn](Br)(CCCC)CCCC.CCCC[Sn](CCCC)CCCC", False),
    "triene electrocyclisation": (TRIENE_ELECTROCYCLISATION, "C1=CCCC=C1", True),
    "retro-diels-alder": (RETRO_DIELS_ALDER, "C=CC=C.C=C", True),
    "lossen": (LOSSEN, "CN=C=O.CC(=O)[O-]", True),
    "eschweiler-clarke": (ESCHWEILER_CLARKE, "CN(C)C.O=C=O.O.O", True),
    "chromic acid oxidation": (CHROMIC_ACID_OXIDATION, "CC(C)=O.O.[OH3+].[OH3+].O=[Cr-](=O)O", True),
    "diene hbr addition": (DIENE_HBR_ADDITION, "CC=CCBr", True),
    "aluminate reduction": (ALUMINATE_REDUCTION, "CC(C)O.[OH-].[AlH3]", True),
    "oxymercuration": (OXYMERCURATION, "CC(O)C[Hg]OC(C)=O.CC(=O)[O-].[OH3+]", True),
    "phosphonium ylide": (PHOSPHONIUM_YLIDE, "[CH2-][P+](c1ccccc1)(c1ccccc1)c1ccccc1.[Br-].CCCC", True),
    "meinwald": (MEINWALD, "CC(C)C=O.FB(F)F", True),
    "salicylic acetylation": (SALICYLIC_ACETYLATION, "CC(=O)Oc1ccccc1C(=O)O.CC(=O)[O-].[OH3+].[OH3+]", True),
    "nitrile grignard": (NITRILE_GRIGNARD, "CCCC(C)=N[Mg]Br", True),
    "sn2 prime": (SN2_PRIME, "N#CCC=CC.[Cl-]", True),
    "intramolecular diels-alder": (INTRAMOLECULAR_DIELS_ALDER, "C1=CC2CCCCC2CC1", True),
    "cation-alkene cascade": (CATION_ALKENE_CASCADE, "C[C+](C)C1CCCC2C(C)(C)CCCC12C", True),
    "hell-volhard-zelinsky": (HELL_VOLHARD_ZELINSKY, "CC(Br)C(=O)Br", True),
    "tishchenko": (TISHCHENKO, "CCOC(C)=O", True),
    "glycoside formation": (GLYCOSIDE_FORMATION, "COC1CCCCO1", True),
    "thiol-ene": (THIOL_ENE, "CCCSC", True),
    "sommelet-hauser": (SOMMELET_HAUSER, "Cc1ccccc1CN(C)C", True),
    # the first C=O re-forms from O2's lone pair on the side of the bond it leaves, not the free side
    "ozonide reduction": (OZONIDE_REDUCTION, "CC=O.CC=O.C[S+](C)[O-]", False),
    "azide epoxide opening": (AZIDE_EPOXIDE_OPENING, "C[C@@H](O)CN=[N+]=[N-]", True),
    "neber": (NEBER, "C1C(c2ccccc2)=N1", True),
    "bouveault-blanc": (BOUVEAULT_BLANC, "CC(O)OCC", True),
    "2-aza-cope": (AZA_COPE_2, "C=[N+](C)C(C)CC=C", True),
    "sulfonamide": (SULFONAMIDE_MECHANISM, "Cc1ccc(cc1)S(=O)(=O)NCc1ccccc1", True),
    "shapiro": (SHAPIRO, "C1=CCCCC1", True),
    "urea": (UREA, "CCN(CC)C(=O)Nc1ccccc1", True),
    # the methyl's shift arrow runs along the C=N bond, not round the outside
    "schmidt": (SCHMIDT_MECHANISM, "CNC(C)=O", False),
    # the tin hydride's Sn-H fishhooks are short, as in the tributyltin reduction
    "barton-mccombie": (BARTON_MCCOMBIE, "C1CCCCC1", False),
    "corey-fuchs": (COREY_FUCHS, "BrC(Br)=Cc1ccccc1", True),
    "imidazole acyl transfer": (IMIDAZOLE_ACYL_TRANSFER, "COC(C)=O", True),
    # the proton taken by N6 is drawn on O5's far side, its arrow arching over the C4 methyl
    "passerini": (PASSERINI, "CC(OC(C)=O)C(=O)NC(C)(C)C", False),
    # the silyl shift redraws the ring (a carbon moves 1.56 bond lengths), the peracid's own proton
    # transfer is cramped, and the oxocarbenium oxygen's dots sit beside its bond
    "rubottom oxidation": (RUBOTTOM, "C[Si](C)(C)O[C@@H]1CCCCC1=O", False),
    # the carboxylate moves 0.45 bond lengths between the first two panels though untouched
    "hunsdiecker": (HUNSDIECKER, "BrC1CCCCC1", False),
    "corey-kim": (COREY_KIM, "CC(C)=O.CSC", True),
    "polonovski": (POLONOVSKI, "C=[N+](C)C.CC(=O)O.CC(=O)[O-]", True),
    "meisenheimer rearrangement": (MEISENHEIMER, "CN(C)OCC=C", True),
    # the sulfonamide N's dots sit on its S-N bond as its pair goes into N=N
    "eschenmoser fragmentation": (ESCHENMOSER_FRAGMENTATION, "O=CCCCC#C", False),
    "bamford-stevens": (BAMFORD_STEVENS, "C1=CCCCC1", True),
    "staudinger lactam": (STAUDINGER_LACTAM, "CN1C(=O)CC1c1ccccc1", True),
    "meyer-schuster": (MEYER_SCHUSTER, "CC=CC(=O)c1ccccc1", True),
    "acyloin condensation": (ACYLOIN, "CC(=O)C(C)O", True),
    "ferrier": (FERRIER, "COC1OCCC=C1", True),
    "tbs removal": (TBS_REMOVAL, "CCCCCO.CC(C)(C)[Si](C)(C)F", True),
    "aza-wittig": (AZA_WITTIG, "CCC=Nc1ccccc1.O=P(c1ccccc1)(c1ccccc1)c1ccccc1", True),
    # the enolate's arrow to the acid's proton runs over the O9 label
    "retro-claisen": (RETRO_CLAISEN, "CC(=O)[O-].CC(C)C(C)=O", False),
    # the ring N-H is written toward the sulfur
    "hantzsch thiazole": (HANTZSCH_THIAZOLE, "Cc1csc(C)n1", False),
    "ramberg-backlund": (RAMBERG_BACKLUND, "CC=C", True),
    # the periodinane's acetate ligands and its ring C=O overlap (bonds cross, atoms 0.50 apart)
    "dess-martin": (DESS_MARTIN, "CC(C)=O.CC(=O)OI1OC(=O)c2ccccc21", False),
    "osmium dihydroxylation": (OSMIUM_DIHYDROXYLATION, "C[C@@H]1O[Os](=O)(=O)O[C@@H]1C", True),
    # the ring N-H taken in panel 6 stands under N9 beside its methyl, its label run into O6's (a
    # crowding note), and its half-loop lies on the N-methyl bond
    "paal-knorr pyrrole": (PAAL_KNORR_PYRROLE, "Cc1ccc(C)n1C", False),
    # the aminoketone keeps its shape as it joins (test_a_molecule_keeps_its_shape_as_it_joins),
    # but in panel 2 the hydrogen just put on the ketoester's O12 points at the waiting amine: its
    # label runs into N1's (a crowding note); panel 10's oxonium sign stands off its oxygen
    "knorr pyrrole": (KNORR_PYRROLE, "CCOC(=O)c1c(C)[nH]cc1C", False),
    "hantzsch dihydropyridine": (HANTZSCH_DIHYDROPYRIDINE, "COC(=O)C1=C(C)NC(C)=C(C(=O)OC)C1C", True),
    "biginelli": (BIGINELLI, "COC(=O)C1=C(C)NC(=O)NC1C", True),
    # the ortho carbon and C10 are drawn 1.0 bond lengths apart before they bond (the ring about to
    # close is drawn closed), and the hydrogen the arenium loses in panel 6 runs into O14's label
    "doebner-miller": (DOEBNER_MILLER, "CC1C=Cc2ccccc2N1", False),
    "bischler-napieralski": (BISCHLER_NAPIERALSKI, "CC1=NCCc2ccccc21", True),
    "robinson-gabriel": (ROBINSON_GABRIEL, "Cc1cnc(C)o1", True),
    # S8 is drawn in panel 1 and then not until it reacts, panel 3's N-H half-loop is 0.56 bond
    # lengths long (a note) and panel 5's C3=C4 arrow crosses C2-C3 (a note)
    "gewald first steps": (GEWALD_FIRST_STEPS, "CCOC(=O)C(C#N)=C(C)CSSSSSSS[S-]", True),
    "gewald ring closure": (GEWALD_RING_CLOSURE, "CCOC(=O)c1c(C)csc1N", True),
    # as the ring closes (panel 6 to 7) the molecule takes a new depiction, fitted over every atom
    # the step leaves alone: the benzene ring turns (C2 moves 0.21 bond lengths) as C4, C11 (drawn
    # round a gap before) and the methyl on C10 move to the new ring's places
    "friedlander": (FRIEDLANDER, "Cc1ccc2ccccc2n1", False),
}
