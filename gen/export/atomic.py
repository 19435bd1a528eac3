"""Atomic file writes: a temporary file in the target folder, checked, then one rename.

``write_atomic(path, data, verify)`` writes the bytes to a temporary file next to ``path``,
calls ``verify(temp_path)`` on the bytes as they lie on disk (it raises to refuse them), and
only then renames the file over ``path``: an earlier good file is never replaced by a bad one,
and a refused file leaves nothing behind.
"""

from __future__ import annotations

import os
import tempfile

from gen.errors import ExportError

_UMASK = os.umask(0)
os.umask(_UMASK)


def write_atomic(path: str, data: bytes, verify=None) -> None:
    folder = os.path.dirname(os.path.abspath(path))
    try:
        os.makedirs(folder, exist_ok=True)
        fd, tmp = tempfile.mkstemp(prefix=".partial-", dir=folder)
    except OSError as exc:
        raise ExportError(f"cannot write {path}: {exc.strerror or exc}") from None
    try:
        with os.fdopen(fd, "wb") as fh:
            fh.write(data)
        os.chmod(tmp, 0o666 & ~_UMASK)
        if verify is not None:
            verify(tmp)
        os.replace(tmp, path)
    except OSError as exc:
        _drop(tmp)
        raise ExportError(f"cannot write {path}: {exc.strerror or exc}") from None
    except BaseException:
        _drop(tmp)
        raise


def _drop(tmp: str) -> None:
    try:
        os.unlink(tmp)
    except OSError:
        pass


def temp_path(folder: str, suffix: str) -> str:
    """A fresh temporary path in ``folder`` (for writers that only take a file name)."""
    os.makedirs(folder, exist_ok=True)
    fd, tmp = tempfile.mkstemp(prefix=".partial-", suffix=suffix, dir=folder)
    os.close(fd)
    return tmp
