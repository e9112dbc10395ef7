"""Electrical check: thin-wire method of moments on the element as bent."""
