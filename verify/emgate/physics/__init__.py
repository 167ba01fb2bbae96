"""The physics kernel: pure functions on numbers and numpy arrays.

Nothing here reads YAML, touches pydantic models or prints. Inputs and outputs are SI
floats (metres, teslas, amperes, kelvin) unless a docstring says otherwise.
"""
