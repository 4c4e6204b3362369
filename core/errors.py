"""The one error type the core raises for bad input."""

from __future__ import annotations

import functools
from typing import Any, Callable, TypeVar

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
    """Decorate a public core function so that nothing but :class:`DesignError` escapes it.

    An unexpected exception (a defect, or input of a kind no check foresaw) is reported as a
    ``DesignError`` on ``field`` naming the exception type, never as a traceback.
    """

    def wrap(func: F) -> F:
        @functools.wraps(func)
        def inner(*args: Any, **kwargs: Any) -> Any:
            try:
                return func(*args, **kwargs)
            except DesignError:
                raise
            except RecursionError:
                raise DesignError(field, "is nested too deeply") from None
            except MemoryError:
                raise DesignError(field, "is too large to process") from None
            except Exception as exc:  # noqa: BLE001 - the contract: only DesignError escapes
                raise DesignError(field, f"cannot be used ({type(exc).__name__}: {exc})"
                                  ) from None
        return inner  # type: ignore[return-value]

    return wrap
