"""stavegen: turn the solid wooden spar of a set of plans into a hollow stave-built one."""

__version__ = "0.1.0"
