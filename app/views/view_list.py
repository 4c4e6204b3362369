"""The window's views, each made the first time it is asked for.

Making all eight views took a quarter of a second of the window's start (each pyqtgraph plot
builds its menus and axes), though only one is on view in tabs. :class:`ViewList` holds the
view classes and makes a view when it is first indexed; whoever needs to know (the plot area
places it in its page, the window binds it to the document and sets its units) registers with
:meth:`ViewList.when_made`. Iterating makes every view (an export of all of them, a test).
"""

from __future__ import annotations

from collections.abc import Callable, Iterator, Sequence
from typing import Generic, TypeVar, overload

__all__ = ["ViewList"]

V = TypeVar("V")
T = TypeVar("T")


class ViewList(Sequence[V], Generic[V]):
    """A sequence of views made on first use from ``classes`` (called without arguments)."""

    def __init__(self, classes: Sequence[Callable[[], V]]) -> None:
        self.classes = tuple(classes)
        self._views: list[V | None] = [None] * len(self.classes)
        self._hooks: list[Callable[[int, V], None]] = []

    def when_made(self, hook: Callable[[int, V], None]) -> None:
        """Call ``hook(index, view)`` for every view made from now on (and for those made
        already, at once)."""
        self._hooks.append(hook)
        for index, view in enumerate(self._views):
            if view is not None:
                hook(index, view)

    def made(self, index: int) -> bool:
        """True when view ``index`` exists."""
        return self._views[index] is not None

    def made_views(self) -> list[V]:
        """The views made so far, in order."""
        return [view for view in self._views if view is not None]

    def index_of_slug(self, slug: str) -> int:
        """The index of the view whose maker (a card or a class) has ``slug``, made or not
        (ValueError when none has)."""
        for i, made_by in enumerate(self.classes):
            if getattr(made_by, "slug", None) == slug:
                return i
        raise ValueError(f"no view {slug!r}")

    def of_slug(self, slug: str, cls: type[T]) -> T:
        """The view ``slug`` (made now if needed), which is a ``cls``."""
        view = self[self.index_of_slug(slug)]
        assert isinstance(view, cls)
        return view

    def __len__(self) -> int:
        return len(self.classes)

    @overload
    def __getitem__(self, index: int) -> V: ...

    @overload
    def __getitem__(self, index: slice) -> list[V]: ...

    def __getitem__(self, index: int | slice) -> V | list[V]:
        if isinstance(index, slice):
            return [self[i] for i in range(len(self))[index]]
        view = self._views[index]  # IndexError past the end, as a list
        if view is None:
            view = self.classes[index]()
            self._views[index] = view
            position = index % len(self)
            for hook in self._hooks:
                hook(position, view)
        return view

    def __contains__(self, value: object) -> bool:
        return any(view is value for view in self._views)

    def __iter__(self) -> Iterator[V]:
        return (self[i] for i in range(len(self)))

    def index(self, value: object, start: int = 0, stop: int | None = None) -> int:
        """The index of view ``value`` among those made (ValueError when it is not one)."""
        end = len(self) if stop is None else stop
        for i in range(start, end):
            if self._views[i] is value:
                return i
        raise ValueError("not one of the window's views")
