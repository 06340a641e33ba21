"""halftrip's calculation core.

Pure functions over SI floats and numpy arrays; results are frozen dataclasses.
Nothing in this package does I/O or imports a user-interface library. The only
module that touches pint is :mod:`calc.parse`, the edge where typed text becomes
SI floats, and it loads pint lazily.
"""
