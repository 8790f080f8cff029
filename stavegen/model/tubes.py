"""Materials a two-piece spar's tube spigot or outside sleeve is made of: the built-in table and the file's own."""

from __future__ import annotations

import tomllib
from dataclasses import dataclass
from functools import lru_cache
from importlib import resources


@dataclass(frozen=True)
class TubeMaterial:
    """One tube material. Stresses in N/mm² (MPa), density in kg/m³.

    ``strength`` is the stress the check holds the tube to in bending (yield for a metal: a tube that
    yields stays bent; the maker's bending strength for a composite).
    """

    key: str
    name: str
    moe: float
    strength: float
    density: float
    source: str = "defined in the spar file"


@lru_cache(maxsize=1)
def tube_table() -> dict[str, TubeMaterial]:
    """The built-in tube materials, keyed as in the data file (each with its source)."""
    text = resources.files("stavegen.model").joinpath("data/tubes.toml").read_text(encoding="utf-8")
    return {key: TubeMaterial(key=key, name=row["name"], moe=float(row["moe_mpa"]), strength=float(row["yield_mpa"]),
                              density=float(row["density_kg_m3"]), source=row["source"])
            for key, row in tomllib.loads(text).items()}
