"""Writing files safely: to a temporary file in the same folder, then put in place in
one step, so an interrupted or failed write leaves any old file whole.

* Never over an input of the same command: the files themselves are compared (the same
  device and inode), so another spelling of the path, a symbolic link or a hard link to
  an input is refused too, with or without ``--force``.
* Without ``force`` the file is created exclusively: the finished temporary file is
  hard-linked to the name, which fails where a file already stands there, so of two
  writers at once one wins and the other is refused; nothing is replaced.
* With ``force`` an existing file is replaced atomically (a rename).
"""

from __future__ import annotations

import os
import tempfile
from collections.abc import Iterable
from pathlib import Path

from stallcheck.errors import InputError


def write_new(path: str | Path, text: str | bytes, option: str, force: bool = False,
              inputs: Iterable[str | Path] = ()) -> None:
    """Write ``text`` (or bytes) to ``path`` atomically.

    Parameters
    ----------
    path : str or Path
    text : str or bytes
    option : str
        The command-line option that named the file, for messages.
    force : bool
        Replace an existing file.
    inputs : iterable of path
        The files the command read: never written over, whatever the path says.

    Raises
    ------
    InputError
        Where the file is an input, exists (without ``force``, checked again at the
        moment of creation), the folder is missing, or the write fails; any old file is
        left as it was.
    """
    path = Path(path)
    check_target(path, option, force, inputs)
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
        if force:
            check_target(path, option, force, inputs)   # an input put there since the first check
            os.replace(temporary, path)
        else:
            _create(temporary, path, option)
    except BaseException as exc:
        try:
            os.unlink(temporary)
        except OSError:
            pass
        if isinstance(exc, OSError):
            raise InputError(option, f"could not be written ({exc.strerror or exc}); nothing was changed.",
                             file=str(path)) from None
        raise


def _create(temporary: str, path: Path, option: str) -> None:
    """Give the finished ``temporary`` file the name ``path`` only where no file has it:
    a hard link, which the system refuses where the name is taken, then the temporary
    name removed. Where the folder cannot hold hard links, the name is claimed with an
    exclusive create and the file renamed onto it."""
    taken = InputError(option, "exists (another process wrote it meanwhile); nothing was replaced.", file=str(path))
    try:
        os.link(temporary, path)
    except FileExistsError:
        raise taken from None
    except OSError:
        try:
            os.close(os.open(path, os.O_CREAT | os.O_EXCL | os.O_WRONLY, 0o600))
        except FileExistsError:
            raise taken from None
        os.replace(temporary, path)
        return
    os.unlink(temporary)


def _umask() -> int:
    """The process's umask (read by setting it and setting it back)."""
    mask = os.umask(0o022)
    os.umask(mask)
    return mask


def check_target(path: str | Path, option: str, force: bool = False, inputs: Iterable[str | Path] = ()) -> None:
    """Refuse a target that cannot be written, before any work is done: a folder, a
    missing folder, an input of the command (the same file by any path), or, without
    ``force``, an existing file."""
    path = Path(path)
    for read in inputs:
        try:
            same = os.path.samefile(path, read)
        except OSError:   # either does not exist (yet): not the same file
            same = False
        if same:
            raise InputError(option, f"is the file {read} this command reads; an output never replaces an input, "
                                     f"even with --force: give another name.", file=str(path))
    if path.is_dir():
        raise InputError(option, "is a folder; give a file name.", file=str(path))
    if not path.parent.is_dir():
        raise InputError(option, f"the folder {path.parent} does not exist.", file=str(path))
    if path.exists() and not force:
        raise InputError(option, "exists; give --force to replace it.", file=str(path))
