"""Molar masses of every library ingredient against the Python package `molmass`
(Formula(...).mass, IUPAC standard atomic weights). Tolerance 0.01 g/mol (spec)."""
from molmass import Formula

from common import check, cli_json, finish

library = cli_json("library")
assert len(library["ingredients"]) >= 60, "library too small"
for ing in library["ingredients"]:
    formula = ing["formula"].replace("·", ".")
    check(f"{ing['id']} ({ing['formula']})", ing["molar_mass"], Formula(formula).mass, 0.01)
finish()
