"""pKw(T) of saltwise against the IAPWS R11-07 formulation as implemented in the Python package
`thermo` (thermo.electrochem.Kweq_IAPWS), with the IAPWS-95 liquid density from `chemicals`
(iapws95_rho at 0.1 MPa; iapws95_rhol_sat at 100 °C, where 0.1 MPa is boiling). Tolerance 0.005
(spec: |ΔpKw| ≤ 0.005, 0–100 °C)."""
import math

from chemicals.iapws import iapws95_rho, iapws95_rhol_sat
from thermo.electrochem import Kweq_IAPWS

from common import check, cli_json, finish

for t_c in [0, 5, 10, 15, 20, 25, 30, 37, 40, 50, 60, 70, 80, 90, 95, 100]:
    t_k = t_c + 273.15
    rho = iapws95_rhol_sat(t_k) if t_c >= 100 else iapws95_rho(t_k, 101325.0)
    reference = -math.log10(Kweq_IAPWS(t_k, rho))
    got = cli_json("water", "--temp", str(t_c))["pkw"]
    check(f"pKw at {t_c} °C", got, reference, 0.005)
finish()
