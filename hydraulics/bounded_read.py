"""Reading an input file under limits: a regular file only, of bounded size, as UTF-8 text.

Project files and pump data files are both read here, so they follow one rule:

* only a regular file is read: a device (the zero device never ends), a named pipe (it blocks
  until someone writes) or a folder is refused before any byte is read.  The file is opened
  without blocking and checked on the open descriptor, so it cannot be swapped in between;
* at most ``max_bytes`` are read; a larger file is refused, naming the limit;
* the text is UTF-8.  A byte-order mark at the start (some editors on Windows write one) is
  accepted and dropped, for project files and pump data files alike;
* a refusal never quotes the file's content.
"""

from __future__ import annotations

import os
import stat
from pathlib import Path


class BoundedReadError(ValueError):
    """A file refused before or while it is read; ``problem`` says why, without its content."""

    def __init__(self, problem: str):
        self.problem = problem
        super().__init__(problem)


def read_text_file(path: str | os.PathLike[str], max_bytes: int) -> str:
    """The text of the regular file ``path`` (at most ``max_bytes``); a leading byte-order mark dropped.

    Raises ``FileNotFoundError`` when there is no such file, :class:`BoundedReadError` for a file
    that is not a regular one, too large or not UTF-8, and ``OSError`` when it cannot be read.
    """
    flags = os.O_RDONLY | getattr(os, "O_NONBLOCK", 0) | getattr(os, "O_BINARY", 0)
    fd = os.open(Path(path), flags)
    with os.fdopen(fd, "rb") as handle:
        info = os.fstat(handle.fileno())
        if not stat.S_ISREG(info.st_mode):
            raise BoundedReadError("not a regular file (a folder, a device or a pipe); give a file")
        if info.st_size > max_bytes:
            raise BoundedReadError(f"the file has {info.st_size} bytes; at most {max_bytes} are read")
        data = handle.read(max_bytes + 1)
    if len(data) > max_bytes:
        raise BoundedReadError(f"the file has more than {max_bytes} bytes; at most {max_bytes} are read")
    try:
        return data.decode("utf-8-sig")
    except UnicodeDecodeError as exc:
        raise BoundedReadError(f"not UTF-8 text (byte {exc.start + 1} cannot be decoded)") from None
