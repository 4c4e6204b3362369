"""The one error type the core raises for bad input."""

from __future__ import annotations

import functools
from collections.abc import Callable
from typing import Any, TypeVar

F = TypeVar("F", bound=Callable[..., Any])

__all__ = ["DesignError", "guarded"]


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


def guarded(field: str) -> Callable[[F], F]:
    """Decorate a public core function so that input too deep or too large to process is
    refused as a :class:`DesignError` on ``field``.

    Only those two ways in which *input* defeats the program are translated. Any other
    exception is a defect (or a caller passing the wrong type, a ``TypeError``) and propagates
    unchanged, so that it is reported as a program failure, not as bad input.
    """

    def wrap(func: F) -> F:
        @functools.wraps(func)
        def inner(*args: Any, **kwargs: Any) -> Any:
            try:
                return func(*args, **kwargs)
            except RecursionError:
                raise DesignError(field, "is nested too deeply") from None
            except MemoryError:
                raise DesignError(field, "is too large to process") from None
        return inner  # type: ignore[return-value]

    return wrap
