"""Ideal-solution pH of mixtures solved independently with scipy.optimize.brentq on the charge
balance, using the library's own constants (from `saltwise-cli library --json`) and pKw from
`saltwise-cli water`. Tolerance 0.001 pH: both solve the same equations, so they must agree."""
from scipy.optimize import brentq

from common import check, cli_json, finish

lib = cli_json("library")
systems = {s["id"]: s for s in lib["systems"]}
ions = {i["id"]: i for i in lib["ions"]}
ingredients = {i["id"]: i for i in lib["ingredients"]}
kw = 10 ** -cli_json("water", "--temp", "25")["pkw"]

CASES = [
    [("acetic_acid", 0.1)],
    [("citric_acid", 0.05), ("sodium_hydroxide", 0.08)],
    [("phosphoric_acid_85", 0.02), ("sodium_hydroxide", 0.03), ("sodium_chloride", 0.05)],
    [("boric_acid", 0.1), ("sodium_carbonate", 0.02)],
    [("ammonium_chloride", 0.05), ("sodium_hydroxide", 0.02)],
    [("succinic_acid", 0.01), ("potassium_hydroxide", 0.015), ("tris", 0.02)],
]


def totals(case):
    sys_tot, spectator = {}, 0.0
    for ing_id, mol in case:
        for r in ingredients[ing_id]["releases"]:
            if "system" in r:
                sys_tot[r["system"]] = sys_tot.get(r["system"], 0.0) + r["count"] * mol
            elif r["ion"] not in ("hydron", "hydroxide"):
                spectator += ions[r["ion"]]["charge"] * r["count"] * mol
    return sys_tot, spectator


def charge(ph, sys_tot, spectator, water_kg):
    h = 10 ** -ph
    total = spectator / water_kg + h - kw / h
    for sid, n in sys_tot.items():
        s = systems[sid]
        t = [1.0]
        for pka in s["pka"]:
            t.append(t[-1] * 10 ** -pka / h)
        z0 = s["charge_of_fully_protonated"]
        total += n / water_kg * sum((z0 - j) * x for j, x in enumerate(t)) / sum(t)
    return total


for case in CASES:
    items = ["water=1000g"] + [f"{i}={m}mol" for i, m in case]
    got = cli_json("ph", *items, "--activity", "ideal")
    sys_tot, spectator = totals(case)
    ref = brentq(charge, -2, 16, args=(sys_tot, spectator, got["water_kg"]), xtol=1e-12)
    check(" + ".join(items[1:]), got["ph"], ref, 0.001)
finish()
