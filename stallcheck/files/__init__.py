"""Everything that reads or writes what people type and keep: quantities with their
units (the only module that converts units), unit files in TOML, CSV tables of units,
gauge readings for diagnose, unit files written back with their comments, and files
written atomically.

Its output is the validated input objects of :mod:`stallcheck.inputs`, in SI.
"""
