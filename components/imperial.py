"""
Exact imperial unit definitions, for statistical equations published in pounds and feet.

Attributes
----------
LB_TO_KG : float
    Kilograms per pound (avoirdupois), exact by definition (international yard and pound,
    1959).
FT_TO_M : float
    Metres per foot, exact by definition (international yard and pound, 1959).
"""

LB_TO_KG = 0.45359237
FT_TO_M = 0.3048
