"""Holes to drill in round or square supports (a beam's boom, a helix's mast):
records.py holds what the Plan carries; the stages that know the holes (the boom
stage, the quadrifilar helix's mast) make them, render/wrap.py draws them."""
