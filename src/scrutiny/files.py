"""Writing what scrutiny produces (reports, annotated copies) without ever leaving a half-written
file or losing the one that was there."""

from __future__ import annotations

import os
import tempfile
from typing import Callable


def replace_atomically(target: str, write: Callable[[str], None], suffix: str = "") -> None:
    """`write(path)` into a temporary file beside `target`, then put it in `target`'s place.

    A failure (`OSError` from the file system, or whatever `write` raises) leaves `target` as
    it was and no temporary file behind. The new file keeps the permissions of the one it
    replaces; a new one gets those `open()` would give it."""
    folder = os.path.dirname(os.path.abspath(target))
    handle, temporary = tempfile.mkstemp(prefix=".scrutiny-", suffix=suffix, dir=folder)
    os.close(handle)
    try:
        write(temporary)
        if os.path.exists(target):
            os.chmod(temporary, os.stat(target).st_mode & 0o7777)
        else:
            umask = os.umask(0)
            os.umask(umask)
            os.chmod(temporary, 0o666 & ~umask)
        os.replace(temporary, target)
    except BaseException:
        if os.path.exists(temporary):
            os.unlink(temporary)
        raise
