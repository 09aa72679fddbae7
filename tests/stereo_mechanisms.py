"""Demo mechanisms of our own whose species write a configuration (@, @@, / and \\): the figures
must show it (test_draw_stereo.py) and keep their geometry (test_draw_geometry.py)."""

# Stereocentres, each with the textbook outcome it must show.
CENTRES = {
    # Cyanide at C1 of (2S,3S)-3-bromobutan-2-ol (also in test_stereo.py): two neighbouring
    # stereocentres, one inverted (SN2), the carbinol carbon untouched.
    "two centres, one inverted": 'species substrate = "C[C@H:1]([Br:3])[C@@H:4](C)O"\n'
                                 'species cyanide = "[C-:2]#N"\n'
                                 'step "displacement"\n    :C2 -> C1\n    C1-Br3 -> Br3\nend\n',
    # SN1 at a quaternary centre (four drawn substituents): the cation is planar, the capture
    # racemises, so the product panel carries no wedge.
    "sn1 racemises": 'species substrate = "CC[C@@:1](C)(CC(C)C)[Br:2]"\nspecies water = "[OH2:3]"\n'
                     'step "ionisation"\n    C1-Br2 -> Br2\nend\nstep "capture"\n    :O3 -> C1\nend\n',
    # (R)-3-methylcyclohexanone deprotonated at C6, away from its ring stereocentre, which keeps its
    # configuration: the wedge goes to the methyl, not along the ring.
    "ring centre kept": 'species ketone = "C[C@@H]1C[C:1](=[O:2])[CH2:3]CC1"\nspecies base = "[OH-:4]"\n'
                        'step "enolate"\n    :O4 -> H(C3)\n    C3-H -> C3=C1\n    C1=O2 -> O2\nend\n',
    # The same at C6 of (R)-3-tert-butylcyclohexanone: the tert-butyl carbon, bare of hydrogen,
    # still takes the wedge before a ring CH2.
    "ring centre, bulky group": 'species ketone = "CC(C)(C)[C@@H]1CC[CH2:3][C:1](=[O:2])C1"\n'
                                'species base = "[OH-:4]"\n'
                                'step "enolate"\n    :O4 -> H(C3)\n    C3-H -> C3=C1\n    C1=O2 -> O2\nend\n',
    # SN2 next to a second stereocentre whose other bonds go to atoms bare of hydrogen (an ether
    # oxygen, a tert-butyl carbon): the bond between the two centres is still not wedged.
    "neighbouring centres": 'species substrate = "CO[C@@H](C(C)(C)C)[C@H:1](C)[Br:2]"\nspecies base = "[OH-:3]"\n'
                            'step "sn2"\n    :O3 -> C1\n    C1-Br2 -> Br2\nend\n',
    # (S)-3-methylpentan-2-one loses its alpha hydrogen, which is drawn while it moves: the wedge
    # keeps off that breaking bond; the enolate has no stereocentre left (textbook: base-catalysed
    # racemisation goes through it).
    "alpha proton removed": 'species ketone = "CC[C@H:1](C)[C:2](C)=[O:3]"\nspecies base = "[OH-:4]"\n'
                            'step "enolate"\n    :O4 -> H(C1)\n    C1-H -> C1=C2\n    C2=O3 -> O3\nend\n',
}

# Bromine adds to but-2-ene through a bromonium ion opened from the back: anti addition (textbook).
# From the E alkene the product is meso-2,3-dibromobutane, (2R,3S); from the Z alkene the
# racemate of (2R,3R) and (2S,3S). The bromonium ion itself is made on one face (syn).
_ANTI_BROMINATION = ('species alkene = "C/[CH:1]=[CH:2]{}C"\nspecies bromine = "[Br:3][Br:4]"\n'
                     'step "bromonium ion"\n    C1=C2 -> C1-Br3\n    :Br3 -> C2\n    Br3-Br4 -> Br4\nend\n'
                     'step "anti opening"\n    :Br4 -> C1\n    Br3-C1 -> Br3\nend\n')


def anti_bromination(geometry: str) -> str:
    """Bromine and but-2-ene written with `geometry` ("/" E, "\\" Z), opened anti."""
    return _ANTI_BROMINATION.format(geometry)


SYN_ADDITIONS = {
    "bromine to E-but-2-ene": _ANTI_BROMINATION.format("/"),
    "bromine to Z-but-2-ene": _ANTI_BROMINATION.format("\\\\"),
}

# Double bonds with a written E or Z that no step touches.
DOUBLE_BONDS = {
    "E acid": 'species acid = "C/C=C/C(=O)[OH:1]"\nspecies base = "[OH-:2]"\n'
              'step "deprotonation"\n    :O2 -> H(O1)\n    O1-H -> O1\nend\n',
    "Z acid": 'species acid = "C/C=C\\\\C(=O)[OH:1]"\nspecies base = "[OH-:2]"\n'
              'step "deprotonation"\n    :O2 -> H(O1)\n    O1-H -> O1\nend\n',
    "Z chain": 'species alkene = "CC/C=C\\\\CC[CH2:1][Br:2]"\nspecies base = "[OH-:3]"\n'
               'step "sn2"\n    :O3 -> C1\n    C1-Br2 -> Br2\nend\n',
    "Z with a centre": 'species alkene = "C/C=C\\\\[C@@H](C)[CH2:1][Br:2]"\nspecies base = "[OH-:3]"\n'
                       'step "sn2"\n    :O3 -> C1\n    C1-Br2 -> Br2\nend\n',
}

# Concerted eliminations across two configured centres (demo data): the two diastereomers of
# 3-phenylbutan-2-yl bromide with hydroxide (E2, anti-periplanar) and of its dimethylamine oxide
# (Cope elimination, syn-periplanar). Format with the configured C2, "[C@@H:2]" or "[C@H:2]".
E2 = ('species substrate = "[CH3:5][C@@H:1](c1ccccc1){}([CH3:6])[Br:3]"\nspecies base = "[OH-:4]"\n'
      'step "E2"\n    :O4 -> H(C1)\n    C1-H -> C1=C2\n    C2-Br3 -> Br3\nend\n')
COPE = ('species oxide = "[CH3:5][C@@H:1](c1ccccc1){}([CH3:6])[N+:3](C)(C)[O-:4]"\n'
        'step "Cope elimination"\n    :O4 -> H(C1)\n    C1-H -> C1=C2\n    C2-N3 -> N3\nend\n')
ELIMINATIONS = {f"{kind} {centre}": text.format(centre)
                for kind, text in (("E2", E2), ("Cope", COPE)) for centre in ("[C@@H:2]", "[C@H:2]")}


def hexadiene_cycloaddition(second_end: str, dienophile: str) -> str:
    """A Diels-Alder of (2E,4E)- ("/") or (2E,4Z)-hexa-2,4-diene ("\\\\") with a dienophile mapped 5=6."""
    return (f'species diene = "C/[CH:1]=[CH:2]/[CH:3]=[CH:4]{second_end}C"\nspecies dienophile = "{dienophile}"\n'
            'step "cycloaddition"\n    C1=C2 -> C2=C3\n    C3=C4 -> C4-C5\n    C5=C6 -> C6-C1\nend\n')


# Diels-Alder reactions whose diene ends the replay configures (demo data).
DIENE_ENDS = {"E,E-hexadiene and ethene": hexadiene_cycloaddition("/", "[CH2:5]=[CH2:6]"),
              "E,Z-hexadiene and ethene": hexadiene_cycloaddition("\\\\", "[CH2:5]=[CH2:6]")}

# Butadiene with dimethyl fumarate (E) and maleate (Z): the dienophile's geometry is kept, trans
# and cis diesters (suprafacial on the dienophile; textbook Diels-Alder outcome, from memory).
_BUTADIENE_AND = ('species diene = "[CH2:1]=[CH:2][CH:3]=[CH2:4]"\nspecies dienophile = "COC(=O)/[CH:5]=[CH:6]{}C(=O)OC"\n'
                  'step "cycloaddition"\n    C1=C2 -> C2=C3\n    C3=C4 -> C4-C5\n    C5=C6 -> C6-C1\nend\n')
DIENOPHILES = {"butadiene and dimethyl fumarate": _BUTADIENE_AND.format("/"),
               "butadiene and dimethyl maleate": _BUTADIENE_AND.format("\\\\")}


# E2 of cis-1-bromo-2-methylcyclohexane: its C2-H is trans to the bromine, diaxial in a chair
# (Clayden; common practice: ring E2 is trans-diaxial).
RING_E2 = '''species bromide = "[CH3:9][C@H:2]1CCCC[C@H:1]1[Br:3]"
species base = "CC[O-:4]"
step "E2"
    :O4 -> H(C2)
    C2-H -> C2=C1
    C1-Br3 -> Br3
end
'''
