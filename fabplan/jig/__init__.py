"""Full-scale bending jigs: the layout of plates, former discs, pins, marks and
labels (`layout`), and the settings that shape it (`settings`, the `[jig]`
table). The drawings themselves are written by `fabplan.render.dxf` and
`fabplan.render.svg`. Keep this module light: shapely loads only in `layout`.
"""
