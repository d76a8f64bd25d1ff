"""One BLAS thread for batched small dense solves (shared by the modal solvers).

Many small factorisations and products gain nothing from threads and lose much to thread
contention on a busy machine (docs/performance.md, "Modal box solution"). Looking up the
loaded BLAS libraries costs a few milliseconds, so it is done once per process: the first
call, after numpy's and scipy's libraries are loaded by the modules that use them.
"""

from __future__ import annotations

from functools import cache
from typing import Any

from threadpoolctl import ThreadpoolController

__all__ = ["one_blas_thread"]


@cache
def _controller() -> ThreadpoolController:
    return ThreadpoolController()


def one_blas_thread() -> Any:
    """A context manager that limits every BLAS library found to one thread."""
    return _controller().limit(limits=1, user_api="blas")
