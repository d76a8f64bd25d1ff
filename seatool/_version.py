"""The package version (one place; ``seatool --version`` and ``seatool.__version__``)."""

__version__ = "0.1.0"
