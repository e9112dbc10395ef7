"""The electrical stage: thin-wire method of moments on the antenna as bent.

stage.py (the stage: each fed element swept through the matching),
records.py (what it adds to the Plan), sweep.py (reading a sweep: least SWR,
resonance, bandwidths); the solver: mesh.py (bend paths into segments),
kernel.py (the matrix fill), loss.py (skin-effect conductor loss), solver.py
(wire models, impedance, currents), farfield.py (patterns, radiated power).
The matching chain to the radio is fabplan.feed; its settings are the design's
`[electrical]` table (fabplan.design.electrical).
"""
