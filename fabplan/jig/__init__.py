"""The jig stage: full-scale bending jigs as parts laid out on machine beds.

stage.py (the stage: `layout_jig`), records.py (what it adds to the Plan),
shapes.py (the items a part is drawn with), parts.py (holes, plates, former
discs, calibration squares), plate.py (a flat piece's base plate), pins.py (its
hold-down pins, placed in linear time), split.py (a plate larger than the bed:
a grid of sections, or end plates and spacing bars), mandrel.py (a helix's pitch guide and mandrel),
beds.py (packing parts on beds). The settings are the design's `[jig]` table
(fabplan.design.jig). The drawings are written by fabplan.render. shapely loads
only inside the functions that need it.
"""
