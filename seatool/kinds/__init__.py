"""Readers that derive subsystems and couplings from materials and dimensions.

Importing this package registers its readers into :mod:`seatool.modelfile`'s registries.
"""
