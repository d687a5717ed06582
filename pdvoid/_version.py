"""The version of pdvoid (read by ``pyproject.toml`` and ``pdvoid.__version__``)."""

__version__ = "0.2.0.dev0"
