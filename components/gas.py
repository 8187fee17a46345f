"""
Gas constants of air shared by the propulsion components.

Air is treated as a calorically perfect gas (constant specific heats), which is common practice
for conceptual propulsor models at fan temperatures.

Attributes
----------
GAMMA : float
    Ratio of specific heats of air, cp/cv (common practice).
R_AIR : float
    Specific gas constant of dry air in J/(kg K), as used by the ISO 2533:1975 standard
    atmosphere.
CP_AIR : float
    Specific heat at constant pressure in J/(kg K), cp = GAMMA R_AIR / (GAMMA - 1).
"""

GAMMA = 1.4
R_AIR = 287.05287
CP_AIR = GAMMA * R_AIR / (GAMMA - 1.0)
