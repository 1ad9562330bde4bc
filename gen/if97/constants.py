"""Constants of IAPWS-IF97 (IAPWS R7-97(2012)), SI units.

The release states its equations in MPa and kJ/kg; this package keeps Pa, K and J/kg at every
module boundary and converts inside each region module.
"""

#: specific gas constant of ordinary water, J/(kg K)  (R7-97(2012), eq. 1)
R = 461.526
#: critical temperature, K  (R7-97(2012), eq. 3)
TC = 647.096
#: critical pressure, Pa  (R7-97(2012), eq. 4)
PC = 22.064e6
#: critical density, kg/m^3  (R7-97(2012), eq. 5)
RHOC = 322.0
#: triple-point temperature, K
T_TRIPLE = 273.16
#: lowest temperature of IF97's validity range, K
T_MIN = 273.15
#: temperature at the region 1/3 and 2/3 split along saturation, K
T_13 = 623.15
#: upper temperature of regions 1-3, K
T_MAX_25 = 1073.15
#: upper temperature of region 5, K
T_MAX = 2273.15
#: upper pressure of regions 1-3, Pa
P_MAX = 100e6
#: upper pressure of region 5, Pa
P_MAX_5 = 50e6
#: lowest pressure, Pa (IF97 is valid for p > 0; 611.212677 Pa is p_sat at 273.15 K)
P_MIN = 0.0
