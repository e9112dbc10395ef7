"""Renderers: read a Plan, write text, JSON, DXF, SVG and PDF. No engineering here."""
