"""Sizing the hollow spar: the least wall, or the least enlargement of the diameters, that meets the target.

The target is the one the check holds: EI ratio ≥ 1 + margin (and strength
ratio ≥ ``hollow.min_strength_ratio`` when set) at every station, here also
at the middle of every stretch. Solved on the exact section with Brent's
method; nothing is rounded.
"""

from .solve import size_spar

__all__ = ["size_spar"]
