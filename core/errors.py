"""The one error type the core raises for bad input."""

from __future__ import annotations

__all__ = ["DesignError"]


class DesignError(ValueError):
    """A design (or a request about one) that cannot be used.

    Parameters
    ----------
    field : str
        Where the problem is, as a path into the design file: ``parts[1].length_m``,
        ``site.latitude_deg``, ``file`` for the file itself, ``parts`` for the whole list.
    message : str
        Why, in plain words, with the offending value and the allowed range where there is one.
    """

    def __init__(self, field: str, message: str) -> None:
        super().__init__(f"{field}: {message}")
        self.field = field
        self.reason = message
