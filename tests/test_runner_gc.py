"""The runner's cycle-collector thresholds: raised while a job is read and checked, put
back when the last open block closes, in any thread (behaviour of our own code, no
published value)."""

import gc
import threading

from feedcheck.runner import fewer_collections


def test_thresholds_raised_inside_and_restored_after_nested_blocks():
    before = gc.get_threshold()
    with fewer_collections():
        inside = gc.get_threshold()
        assert inside[0] >= max(before[0], 50_000) and inside[2] >= before[2]
        with fewer_collections():
            assert gc.get_threshold() == inside
        assert gc.get_threshold() == inside  # the outer block is still open
    assert gc.get_threshold() == before


def test_overlapping_blocks_of_two_threads_restore_the_thresholds():
    before = gc.get_threshold()
    a_in, b_in, a_out = threading.Event(), threading.Event(), threading.Event()
    seen = []

    def first():
        with fewer_collections():
            a_in.set()
            b_in.wait(5)
        a_out.set()  # closes while the other thread's block is open

    def second():
        a_in.wait(5)
        with fewer_collections():
            b_in.set()
            a_out.wait(5)
            seen.append(gc.get_threshold()[0])  # still raised for this one

    threads = [threading.Thread(target=first), threading.Thread(target=second)]
    for t in threads:
        t.start()
    for t in threads:
        t.join(10)
    assert seen and seen[0] >= 50_000
    assert gc.get_threshold() == before
