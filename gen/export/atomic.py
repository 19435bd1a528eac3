"""Atomic file writes: a temporary file in the target folder, then one rename."""

from __future__ import annotations

import os
import tempfile

from gen.errors import ExportError

_UMASK = os.umask(0)
os.umask(_UMASK)


def write_atomic(path: str, data: bytes) -> None:
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
        os.replace(tmp, path)
    except OSError as exc:
        try:
            os.unlink(tmp)
        except OSError:
            pass
        raise ExportError(f"cannot write {path}: {exc.strerror or exc}") from None


def temp_path(folder: str, suffix: str) -> str:
    """A fresh temporary path in ``folder`` (for writers that only take a file name)."""
    os.makedirs(folder, exist_ok=True)
    fd, tmp = tempfile.mkstemp(prefix=".partial-", suffix=suffix, dir=folder)
    os.close(fd)
    return tmp
