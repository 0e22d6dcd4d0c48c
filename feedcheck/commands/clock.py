"""The calculation date: the only place feedcheck reads the clock.

Commands call :func:`calc_date` and hand the date to the checks, so checks stay pure
and a reproducible build (``SOURCE_DATE_EPOCH``) gives the same bytes.
"""

from __future__ import annotations

import datetime as _dt
import os


def calc_date() -> str:
    """Today's ISO date, or the date of ``SOURCE_DATE_EPOCH`` (seconds, UTC) when set.

    Examples
    --------
    >>> import os
    >>> saved = os.environ.get("SOURCE_DATE_EPOCH")
    >>> os.environ["SOURCE_DATE_EPOCH"] = "86400"
    >>> calc_date()
    '1970-01-02'
    >>> if saved is None: del os.environ["SOURCE_DATE_EPOCH"]
    ... else: os.environ["SOURCE_DATE_EPOCH"] = saved
    """
    epoch = os.environ.get("SOURCE_DATE_EPOCH")
    if epoch and epoch.isdigit():
        return _dt.datetime.fromtimestamp(int(epoch), _dt.UTC).date().isoformat()
    return _dt.date.today().isoformat()
