"""emgate: a design-verification gate for electric machines."""

__version__ = "0.1.0"
