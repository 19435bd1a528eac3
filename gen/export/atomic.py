"""Atomic file writes: a temporary file in the target folder, checked, then one rename.

``write_atomic(path, data, verify)`` writes the bytes to a temporary file next to ``path``,
calls ``verify(temp_path)`` on the bytes as they lie on disk (it raises to refuse them), and
only then renames the file over ``path``: an earlier good file is never replaced by a bad one,
and a refused or failed write leaves nothing behind; a failed write raises
:class:`ExportError` naming the file and the reason in plain words (no space left, read-only
file system, permission denied …).
"""

from __future__ import annotations

import errno
import os
import tempfile

from gen.errors import ExportError

_UMASK = os.umask(0)
os.umask(_UMASK)

#: plain words for the reasons a write usually fails
_REASONS = {
    errno.ENOSPC: "no space left on the device",
    errno.EDQUOT: "disk quota exceeded",
    errno.EROFS: "the file system is read-only",
    errno.EACCES: "permission denied",
    errno.EPERM: "permission denied",
    errno.ENOTDIR: "a part of the path is a file, not a folder",
    errno.EISDIR: "a folder has that name",
    errno.EFBIG: "the file is larger than the file system allows",
}


def reason(exc: OSError) -> str:
    """Plain words for why an OS write failed."""
    return _REASONS.get(exc.errno, exc.strerror or str(exc))


def folder_problem(folder: str) -> str:
    """Why files may fail to be written in ``folder`` ("" when nothing is visibly wrong).

    For writers that report only success or failure (the CAD kernel's STEP writer): a full
    device or a folder without write permission is named instead of a bare "failed".
    """
    try:
        st = os.statvfs(folder)
        if st.f_bavail == 0 or st.f_favail == 0:
            return "no space left on the device"
        if st.f_flag & getattr(os, "ST_RDONLY", 1):
            return "the file system is read-only"
    except OSError:
        pass
    if not os.access(folder, os.W_OK):
        return "the folder is not writable"
    return ""


def write_atomic(path: str, data: bytes, verify=None) -> None:
    folder = os.path.dirname(os.path.abspath(path))
    try:
        os.makedirs(folder, exist_ok=True)
        fd, tmp = tempfile.mkstemp(prefix=".partial-", dir=folder)
    except OSError as exc:
        raise ExportError(f"cannot write {path}: {reason(exc)}") from None
    try:
        with os.fdopen(fd, "wb") as fh:
            fh.write(data)   # closing flushes: a full disk raises here or at the close
        os.chmod(tmp, 0o666 & ~_UMASK)
        if verify is not None:
            verify(tmp)
        os.replace(tmp, path)
    except OSError as exc:
        _drop(tmp)
        raise ExportError(f"cannot write {path}: {reason(exc)}") from None
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
    try:
        os.makedirs(folder, exist_ok=True)
        fd, tmp = tempfile.mkstemp(prefix=".partial-", suffix=suffix, dir=folder)
    except OSError as exc:
        raise ExportError(f"cannot write in {folder}: {reason(exc)}") from None
    os.close(fd)
    return tmp
