"""The physics: steam and liquid properties, the coil's heat transfer, the control
valve, traps, pump-traps, purges, flash steam and the drainage rule, with the constants
of nature and of practice they use.

Everything here works in SI (pressures absolute [Pa]) on numbers or numpy arrays, and
imports nothing from the unit-file layer, the rules or the presenters.
"""
