"""The per-file ceilings: a file whose reading runs too long, eats memory or crashes gets a
one-line reason, and the caller goes on."""

from __future__ import annotations

import os
import signal
import time

import pytest

from scrutiny.errors import InputError
from scrutiny.ingest.guard import run_guarded

pytestmark = pytest.mark.skipif(not hasattr(os, "fork"), reason="ceilings need fork")


def test_the_result_of_the_work_comes_back():
    assert run_guarded("paper.pdf", lambda: {"claims": 3}) == {"claims": 3}


def test_an_input_error_in_the_child_keeps_its_reason():
    def work():
        raise InputError("paper.pdf", "encrypted PDF")

    with pytest.raises(InputError) as raised:
        run_guarded("paper.pdf", work)
    assert str(raised.value) == "paper.pdf: encrypted PDF"


def test_time_ceiling():
    with pytest.raises(InputError, match=r"paper\.pdf: took longer than 0\.5 s to read"):
        run_guarded("paper.pdf", lambda: time.sleep(30), time_limit=0.5)


def test_memory_ceiling():
    def work():
        hoard = []
        for _ in range(64):
            hoard.append(bytearray(64 * 2**20))  # 4 GiB in all
        return len(hoard)

    with pytest.raises(InputError, match=r"needed more than 256 MB"):
        run_guarded("paper.docx", work, memory_limit=256 * 2**20)


def test_a_crashing_reader():
    with pytest.raises(InputError, match=r"stopped without an answer \(signal SIGKILL\)"):
        run_guarded("paper.pdf", lambda: os.kill(os.getpid(), signal.SIGKILL))


def test_an_unexpected_exception_becomes_a_reason():
    def work():
        raise ValueError("bad xref table")

    with pytest.raises(InputError, match=r"could not be read \(ValueError: bad xref table\)"):
        run_guarded("paper.pdf", work)
