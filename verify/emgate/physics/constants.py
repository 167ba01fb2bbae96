"""Physical constants used across the kernel."""

#: Vacuum permeability [H/m], CODATA 2022 (the value scipy.constants.mu_0 carries).
MU0: float = 1.25663706127e-6
