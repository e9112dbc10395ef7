"""The design: reading design files into a validated `Design`, and rewriting them.

- model.py: the `Design` and its parts (frozen dataclasses, millimetres);
- read.py: TOML text -> Design, every key checked; one reader module per optional
  table: forming.py, purchase.py, jig.py, electrical.py (settings and reader);
- rewrite.py: a design file with some values changed, comments and layout kept.

Import from the modules themselves (`from fabplan.design.read import load_design`);
this package's own namespace stays empty so that importing one part imports no other.
"""
