"""Run the work on one file in a child process with a time and a memory ceiling.

PDF, Word and XML parsers are large C and Python code bases that an unusual or hostile file can
send into a loop, a crash or a memory explosion (a zip bomb disguised as .docx, a PDF with a
million objects). Doing the work on such a file in a forked child process keeps the batch
alive: when the child runs out of time or memory, or dies, the file gets a one-line reason and
the other files are still checked. The child does the whole check of the file, not only the
reading, so that readers may keep the file open (a PDF reader looks up character boxes only for
the claims found) and only the small result crosses back.
"""

from __future__ import annotations

import os
import pickle
import resource
import select
import signal
import time

from typing import Callable, TypeVar

from ..errors import InputError

Result = TypeVar("Result")

#: default ceilings per file
TIME_LIMIT_SECONDS = 120.0
MEMORY_LIMIT_BYTES = 2 * 1024**3


def _virtual_memory_bytes() -> int:
    try:
        with open("/proc/self/status", encoding="ascii") as status:
            for line in status:
                if line.startswith("VmSize:"):
                    return int(line.split()[1]) * 1024
    except OSError:
        pass
    return 0


class _Pipe:
    """The child's end of the pipe: what it sends is pickled, one object."""

    def __init__(self, descriptor: int) -> None:
        self._stream = os.fdopen(descriptor, "wb")

    def send(self, outcome: tuple[str, object]) -> None:
        pickle.dump(outcome, self._stream, protocol=pickle.HIGHEST_PROTOCOL)

    def close(self) -> None:
        self._stream.close()


def _child(work: Callable[[], object], memory_limit: int,
           connection) -> None:  # pragma: no cover - runs in a child process
    try:
        # The ceiling counts from what the forked process already holds (the interpreter and
        # its libraries), so that it limits what the work on this one file may add.
        ceiling = _virtual_memory_bytes() + memory_limit
        resource.setrlimit(resource.RLIMIT_AS, (ceiling, ceiling))
        connection.send(("result", work()))
    except InputError as exc:
        connection.send(("error", exc.reason))
    except MemoryError:
        connection.send(("error", f"needed more than {memory_limit / 2**20:,.0f} MB to read "
                                  "(the memory ceiling per file)"))
    except RecursionError:
        connection.send(("error", "nested too deeply to read"))
    except Exception as exc:  # a parser failing on a broken file
        connection.send(("error", f"could not be read ({type(exc).__name__}: {exc})"))
    finally:
        connection.close()


def run_guarded(path: str, work: Callable[[], Result],
                time_limit: float = TIME_LIMIT_SECONDS,
                memory_limit: int = MEMORY_LIMIT_BYTES) -> Result:
    """`work()` (the work on the file `path`) in a child process; `InputError` naming `path`
    when it fails, overruns its time or memory, or the child dies.

    The child is a plain fork, not a `multiprocessing` process, so that the guard also works
    inside the daemonic worker processes of a process pool or a Dask cluster, which may not
    start `multiprocessing` children of their own."""
    if not hasattr(os, "fork"):  # no fork (Windows): work in this process, without ceilings
        return work()
    reader, writer = os.pipe()
    pid = os.fork()
    if pid == 0:  # pragma: no cover - the child
        code = 0
        try:
            os.close(reader)
            _child(work, memory_limit, _Pipe(writer))
        except BaseException:
            code = 1
        finally:
            os._exit(code)  # never return into the parent's code (no atexit, no pytest)
    os.close(writer)
    received = bytearray()
    timed_out = False
    try:
        deadline = time.monotonic() + time_limit
        while True:
            remaining = deadline - time.monotonic()
            if remaining <= 0:
                timed_out = True
                break
            ready, _, _ = select.select([reader], [], [], remaining)
            if not ready:
                continue
            chunk = os.read(reader, 1 << 20)
            if not chunk:
                break
            received += chunk
    finally:
        os.close(reader)
        if timed_out:
            os.kill(pid, signal.SIGKILL)
        _, status = os.waitpid(pid, 0)
    if timed_out:
        raise InputError(path, f"took longer than {time_limit:g} s to read (the time ceiling "
                               "per file); skipped")
    try:
        kind, payload = pickle.loads(bytes(received))
    except Exception:
        how = (f"signal {signal.Signals(os.WTERMSIG(status)).name}" if os.WIFSIGNALED(status)
               else f"exit code {os.WEXITSTATUS(status)}")
        raise InputError(path, f"the reader stopped without an answer ({how}); the file may "
                               "be damaged") from None
    if kind == "error":
        raise InputError(path, payload)
    return payload
