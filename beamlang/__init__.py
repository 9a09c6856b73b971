"""beamlang: beam specifications in text -> exact deflection and stress checks."""

__version__ = "0.1.0"
