"""The kinds of the model file: each declares its parameters next to one derive function.

:mod:`seatool.kinds.registry` lists them all; :mod:`seatool.kinds.params` holds the
declaration types and :mod:`seatool.kinds.validate` the generic checks.
"""
