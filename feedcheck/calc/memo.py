"""Results of pure kernels kept per call, keyed on every argument that decides them.

A building repeats itself: a thousand runs share a handful of conductor sizes,
materials, raceways and temperatures, and a hundred transformers one nameplate. The
checks call the same scalar kernels with the same arguments again and again; a kernel
wrapped by :func:`memoised` computes each distinct call once.

The key is the whole call: every positional and keyword argument, each with its type
(so ``75`` and ``75.0``, ``1`` and ``True`` are different calls), and the table
records (``data=``, ``tables=``: frozen records holding arrays) by identity: the
same record object, never an equal-looking other one. The entry holds its records,
so their identities are not reused while it lives (and a hit checks them again).
Arguments must be scalars (str, int, float, complex, bool, None, numpy scalars) or
tuples of them; a call with anything else (an array, a list, a dataclass) goes to the
kernel as it is and is not kept.

Only pure kernels are wrapped: the result depends on the arguments alone, and what is
kept is immutable (numbers, strings, tuples, frozen records of scalars). An exception
is not kept: the call raises again next time.
"""

from __future__ import annotations

import functools
from collections.abc import Callable

import numpy as np

_SCALARS = (str, int, float, bool, complex, type(None))
_FAST = frozenset(_SCALARS)
_UNKEYED = object()


def _part(value):
    """One argument as a key part ``(type, value)``; ``_UNKEYED`` when it has none."""
    if isinstance(value, _SCALARS):
        return (type(value), value)
    if isinstance(value, tuple):
        parts = tuple(_part(v) for v in value)
        return _UNKEYED if any(p is _UNKEYED for p in parts) else (tuple, parts)
    if isinstance(value, np.generic) and value.dtype.kind in "biufcU":
        return (type(value), value.item())
    return _UNKEYED


def memoised(
    fn: Callable | None = None,
    *,
    records: tuple[str, ...] = ("data", "tables"),
    maxsize: int = 65536,
):
    """Wrap the pure kernel ``fn`` so each distinct call is computed once.

    ``records``: the keyword arguments taken by identity (the rule book's records).
    At most ``maxsize`` calls are kept (then the store starts again empty).

    Examples
    --------
    >>> calls = []
    >>> @memoised
    ... def twice(x, *, data):
    ...     calls.append(x)
    ...     return 2 * x
    >>> d = book.conductors
    >>> twice(2.0, data=d), twice(2.0, data=d), twice(2, data=d)
    (4.0, 4.0, 4)
    >>> calls
    [2.0, 2]
    """
    if fn is None:
        return functools.partial(memoised, records=records, maxsize=maxsize)
    store: dict = {}

    @functools.wraps(fn)
    def wrapper(*args, **kwargs):
        types = tuple(map(type, args))
        if _FAST.issuperset(types):  # plain scalars: the arguments and their types
            key: list = ["plain", args, types]
        else:
            parts = [_part(a) for a in args]
            if any(p is _UNKEYED for p in parts):
                return fn(*args, **kwargs)
            key = ["parts", tuple(parts)]
        held = []  # the records of this call, by identity
        for name in sorted(kwargs):
            v = kwargs[name]
            if name in records:
                key.append((name, id(v)))
                held.append(v)
            elif (part := _part(v)) is not _UNKEYED:
                key.append((name, part))
            else:
                return fn(*args, **kwargs)
        key = tuple(key)
        hit = store.get(key)
        # the entry holds its records, so no other object can have their ids meanwhile
        if hit is not None and all(a is b for a, b in zip(hit[0], held, strict=True)):
            return hit[1]
        out = fn(*args, **kwargs)
        if len(store) >= maxsize:
            store.clear()
        store[key] = (tuple(held), out)
        return out

    wrapper.cache_clear = store.clear  # type: ignore[attr-defined]
    wrapper.cache_size = store.__len__  # type: ignore[attr-defined]
    return wrapper
