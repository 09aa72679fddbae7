"""Chemical judgement that needs no Trace: Baldwin classes of ring closures, reactive sites and
candidate closures of one species, stereo elements, and approximate acidities. The checks in
`arrows.checks` and the `closures` command are thin users of these modules."""
