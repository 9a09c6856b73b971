"""Files the user owns, rewritten whole: bytes -> a temporary file beside the target, flushed to the disk, given
the target's mode, renamed over it. A kill or a full disk leaves the old file or the new one, never a cut one."""

from __future__ import annotations

import errno
import os
import stat
import tempfile
from pathlib import Path


def write_atomically(path: str | Path, data: bytes) -> None:
    """Replace `path` by `data` in one rename; a link is followed, so the file it names is replaced.

    Errors are raised as OSError naming `path` (never the temporary file)."""
    target = Path(os.path.realpath(path))
    try:
        if target.is_dir():
            raise IsADirectoryError(errno.EISDIR, os.strerror(errno.EISDIR), str(path))
        try:
            mode = stat.S_IMODE(target.stat().st_mode)
        except FileNotFoundError:
            mode = 0o666 & ~_umask()
        fd, temporary = tempfile.mkstemp(prefix=f".{target.name}.", suffix=".tmp", dir=target.parent)
    except OSError as exc:
        raise _naming(exc, path) from exc
    try:
        with os.fdopen(fd, "wb") as handle:
            handle.write(data)
            handle.flush()
            os.fsync(handle.fileno())
        os.chmod(temporary, mode)
        os.replace(temporary, target)
    except BaseException as exc:
        try:
            os.unlink(temporary)
        except OSError:
            pass
        if isinstance(exc, OSError):
            raise _naming(exc, path) from exc
        raise
    _sync_folder(target.parent)


def write_text_atomically(path: str | Path, text: str) -> None:
    write_atomically(path, text.encode("utf-8"))


def _naming(exc: OSError, path: str | Path) -> OSError:
    return OSError(exc.errno, exc.strerror or str(exc), str(path))


def _umask() -> int:
    mask = os.umask(0o022)
    os.umask(mask)
    return mask


def _sync_folder(folder: Path) -> None:
    """Make the rename itself durable where the platform allows opening a folder (POSIX)."""
    try:
        fd = os.open(folder, os.O_RDONLY)
    except OSError:
        return
    try:
        os.fsync(fd)
    except OSError:
        pass
    finally:
        os.close(fd)
