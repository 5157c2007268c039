"""The verifier's one rejection type."""
from fractions import Fraction


def show(value) -> str:
    """A value for a message: numbers of more than 300 bits are abbreviated to their size."""
    if isinstance(value, Fraction) and max(value.numerator.bit_length(), value.denominator.bit_length()) > 300:
        return f"<rational of {max(value.numerator.bit_length(), value.denominator.bit_length())} bits>"
    if isinstance(value, int) and not isinstance(value, bool) and value.bit_length() > 300:
        return f"<{value.bit_length()}-bit integer>"
    if isinstance(value, (list, tuple)):
        return "[" + ", ".join(show(v) for v in value) + "]"
    text = repr(value) if isinstance(value, str) else str(value)
    return text if len(text) <= 200 else text[:200] + "…"


class Rejection(Exception):
    """A certificate is rejected: ``check`` names the check that failed, ``values`` the values involved."""

    def __init__(self, check: str, message: str, **values):
        self.check, self.message, self.values = check, message, values
        details = ", ".join(f"{key}={show(value)}" for key, value in values.items())
        super().__init__(f"{check}: {message}" + (f" ({details})" if details else ""))
