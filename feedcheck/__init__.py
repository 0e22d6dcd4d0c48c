"""feedcheck: size and check low-voltage distribution-transformer feeds.

Results are an aid to design and review. Verify every figure against the
locally adopted electrical code; a licensed electrician or engineer must
review the work before it is built.
"""

__version__ = "0.1.0"

CAUTION = (
    "feedcheck results are an aid, not an approval: verify them against the locally "
    "adopted electrical code, and have a licensed electrician or engineer review the work."
)
