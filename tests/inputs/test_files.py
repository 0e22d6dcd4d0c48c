"""The one guard on input files, and path safety, on their own."""

import os
from pathlib import Path

import pytest

from feedcheck.inputs.files import FileKind, FileRefused, check_size, decode_utf8, read_bytes
from feedcheck.inputs.paths import relative_file_inside

KIND = FileKind("test file", "(.txt)", 10, "a test file of at most 10 bytes")


def test_regular_file_within_the_limit_is_read(tmp_path):
    p = tmp_path / "a.txt"
    p.write_bytes(b"0123456789")
    assert read_bytes(p, KIND) == b"0123456789"


@pytest.mark.parametrize(("size", "ok"), [(10, True), (11, False), (40, False)])
def test_file_grown_after_its_size_was_taken_is_read_whole_and_bounded(
    tmp_path, monkeypatch, size, ok
):
    """A file that grows between the size check and the read (here: its size reported
    as 3 bytes) is read on to its end, and still refused past the limit (the guard's own
    rule; common practice, no source)."""
    p = tmp_path / "a.txt"
    p.write_bytes(b"y" * size)
    real_stat = Path.stat

    def small_stat(self, *a, **k):
        st = real_stat(self, *a, **k)
        return os.stat_result((st.st_mode, *st[1:6], 3, *st[7:]))

    monkeypatch.setattr(Path, "stat", small_stat)
    if ok:
        assert read_bytes(p, KIND) == b"y" * size
    else:
        with pytest.raises(FileRefused, match="11 bytes"):
            read_bytes(p, KIND)


def test_larger_file_refused_with_its_size(tmp_path):
    p = tmp_path / "a.txt"
    p.write_bytes(b"x" * 11)
    with pytest.raises(FileRefused) as ei:
        read_bytes(p, KIND)
    assert (ei.value.value, ei.value.expected) == ("11 bytes", "a test file of at most 10 bytes")


def test_folder_missing_file_and_wrong_ending(tmp_path):
    with pytest.raises(FileRefused, match=r"a test file \(\.txt\), not a folder"):
        read_bytes(tmp_path, KIND)
    with pytest.raises(FileRefused, match="a readable test file"):
        read_bytes(tmp_path / "none.txt", KIND)
    csv = FileKind("sheet", "(.csv)", 10, "small", (".csv",), "a .csv sheet")
    (tmp_path / "a.txt").write_text("x")
    with pytest.raises(FileRefused, match=r"a \.csv sheet"):
        read_bytes(tmp_path / "a.txt", csv)


@pytest.mark.skipif(not hasattr(os, "mkfifo"), reason="named pipes are POSIX only")
def test_named_pipe_refused_without_waiting_for_a_writer(tmp_path):
    p = tmp_path / "pipe.txt"
    os.mkfifo(p)
    with pytest.raises(FileRefused, match="a regular file, not a device or pipe"):
        read_bytes(p, KIND)


def test_decode_names_the_first_bad_byte_and_its_line():
    with pytest.raises(FileRefused) as ei:
        decode_utf8("ok\nnon caf\xe9".encode("latin-1"), "UTF-8 text")
    assert (ei.value.value, ei.value.line) == ("byte 0xe9", 2)
    assert decode_utf8(b"\xef\xbb\xbfa", "") == "a"
    assert decode_utf8(b"\xef\xbb\xbfa", "", drop_bom=False) == "\ufeffa"


def test_check_size():
    check_size(10, 10, "")
    with pytest.raises(FileRefused, match="'11 bytes'"):
        check_size(11, 10, "")


@pytest.mark.parametrize(
    ("text", "fragment"),
    [
        ("/etc/x.csv", "no absolute paths"),
        ("../x.csv", "no '..'"),
        ("sub\\x.csv", "written with '/'"),
        ("C:x.csv", "written with '/'"),
        ("x.txt", "a .csv or .xlsx schedule file"),
        ("missing.csv", "not found"),
    ],
)
def test_paths_refused_as_written(tmp_path, text, fragment):
    with pytest.raises(FileRefused, match=fragment.replace(".", r"\.").replace("(", r"\(")):
        relative_file_inside(text, tmp_path)


def test_path_through_a_link_must_stay_inside(tmp_path):
    (tmp_path / "out").mkdir()
    (tmp_path / "out" / "x.csv").write_text("x")
    job = tmp_path / "job"
    job.mkdir()
    os.symlink(tmp_path / "out" / "x.csv", job / "x.csv")
    with pytest.raises(FileRefused, match="leads outside it through a link"):
        relative_file_inside("x.csv", job)
    (job / "in.csv").write_text("x")
    os.symlink(job / "in.csv", job / "y.csv")
    assert str(relative_file_inside("y.csv", job)) == "y.csv"


def test_folder_relinked_between_reads_is_resolved_again(tmp_path):
    """The resolved job folder is kept between panels only while the folder's link is
    the same: a link re-pointed between two reads is resolved again, so a schedule that
    leads outside the new target is refused (common practice, no source: the guard's
    own rule, a path that resolves outside the job's folder is refused)."""
    a, b = tmp_path / "a", tmp_path / "b"
    a.mkdir()
    b.mkdir()
    (a / "s.csv").write_text("circuit\n1\n", encoding="utf-8")
    (b / "s.csv").symlink_to(a / "s.csv")  # inside a, outside b
    link = tmp_path / "job"
    link.symlink_to(a)
    assert relative_file_inside("s.csv", link) == Path("s.csv")
    link.unlink()
    link.symlink_to(b)
    with pytest.raises(FileRefused, match="outside"):
        relative_file_inside("s.csv", link)
