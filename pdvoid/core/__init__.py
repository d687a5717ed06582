"""The lowest layer: ``InputError`` and its validators, constants and unit parsing, references and citation
tracking, the optional-dependency door and version information. Imports nothing else of pdvoid."""

from pdvoid.core.validity import ValidityWarning

__all__ = ["ValidityWarning"]
