"""The boom stage: elements on a boom (positions from one datum, the boom correction
added to their cut lengths, the drilling plan, hardware) and the fittings of matching
devices. records.py holds what the Plan carries; stage.py computes it."""
