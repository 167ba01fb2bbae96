"""Physical constants used across the kernel."""

#: Vacuum permeability [H/m], CODATA 2022 (the value scipy.constants.mu_0 carries).
MU0: float = 1.25663706127e-6
#: 0 degC in kelvin.
ZERO_CELSIUS: float = 273.15
#: The reference temperature of resistivity tables, 20 degC [K].
T20: float = 293.15
