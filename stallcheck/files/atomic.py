"""Writing files safely: to a temporary file in the same folder, then renamed over the
target in one step, so an interrupted or failed write leaves any old file whole; and
never over an existing file unless asked."""

from __future__ import annotations

import os
import tempfile
from pathlib import Path

from stallcheck.errors import InputError


def write_new(path: str | Path, text: str | bytes, option: str, force: bool = False) -> None:
    """Write ``text`` (or bytes) to ``path`` atomically.

    Parameters
    ----------
    path : str or Path
    text : str or bytes
    option : str
        The command-line option that named the file, for messages.
    force : bool
        Replace an existing file.

    Raises
    ------
    InputError
        Where the file exists (without ``force``), the folder is missing, or the write
        fails; any old file is left as it was.
    """
    path = Path(path)
    check_target(path, option, force)
    try:
        handle, temporary = tempfile.mkstemp(dir=path.parent, prefix=f".{path.name}.", suffix=".part")
    except OSError as exc:
        raise InputError(option, f"cannot write in {path.parent} ({exc.strerror or exc}).", file=str(path)) from None
    try:
        # mkstemp makes the file private (0600); a file written for others gets the
        # permissions any new file of the user's would (0666 less the umask)
        os.chmod(temporary, 0o666 & ~_umask())
        binary = isinstance(text, bytes)
        with (os.fdopen(handle, "wb") if binary else os.fdopen(handle, "w", encoding="utf-8", newline="")) as out:
            out.write(text)
            out.flush()
            os.fsync(out.fileno())
        os.replace(temporary, path)
    except BaseException as exc:
        try:
            os.unlink(temporary)
        except OSError:
            pass
        if isinstance(exc, OSError):
            raise InputError(option, f"could not be written ({exc.strerror or exc}); nothing was changed.",
                             file=str(path)) from None
        raise


def _umask() -> int:
    """The process's umask (read by setting it and setting it back)."""
    mask = os.umask(0o022)
    os.umask(mask)
    return mask


def check_target(path: str | Path, option: str, force: bool = False) -> None:
    """Refuse a target that cannot be written, before any work is done."""
    path = Path(path)
    if path.is_dir():
        raise InputError(option, "is a folder; give a file name.", file=str(path))
    if not path.parent.is_dir():
        raise InputError(option, f"the folder {path.parent} does not exist.", file=str(path))
    if path.exists() and not force:
        raise InputError(option, "exists; give --force to replace it.", file=str(path))
