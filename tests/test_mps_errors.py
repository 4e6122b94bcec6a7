"""Malformed MPS files: each must raise ModelFormatError naming the line and token."""

from __future__ import annotations

import gzip

import pytest

from undergrowth.model import ModelFormatError
from undergrowth.model.mps import read_mps

HEAD = "NAME T\nROWS\n N obj\n L c1\n"  # lines 1-4
COLS = "COLUMNS\n x obj 1 c1 1\n y obj 2 c1 1\n"  # lines 5-7
RHS = "RHS\n RHS c1 4\n"  # lines 8-9
BASE = HEAD + COLS + RHS

# (id, file text, expected line, expected token)
CASES = [
    ("columns field count", HEAD + "COLUMNS\n x obj 1 c1\nENDATA\n", 6, "c1"),
    ("not a number", HEAD + "COLUMNS\n x obj 1x\nENDATA\n", 6, "1x"),
    ("nan is not a number", HEAD + "COLUMNS\n x obj nan\nENDATA\n", 6, "nan"),
    ("python-only number", HEAD + "COLUMNS\n x obj 1_000\nENDATA\n", 6, "1_000"),
    ("unknown row in COLUMNS", HEAD + "COLUMNS\n x obj 1 c9 1\nENDATA\n", 6, "c9"),
    ("unquoted marker", HEAD + "COLUMNS\n M MARKER INTORG\nENDATA\n", 6, "MARKER"),
    ("unknown row in RHS", BASE + " RHS c2 1\nENDATA\n", 10, "c2"),
    ("unknown row in RANGES", BASE + "RANGES\n RNG zz 1\nENDATA\n", 11, "zz"),
    ("unknown column in BOUNDS", BASE + "BOUNDS\n UP BND z 3\nENDATA\n", 11, "z"),
    ("unknown column in QUADOBJ", BASE + "QUADOBJ\n x w 1\nENDATA\n", 11, "w"),
    ("unknown bound type", BASE + "BOUNDS\n ZZ BND x 3\nENDATA\n", 11, "ZZ"),
    ("semi-continuous bound", BASE + "BOUNDS\n SC BND x 3\nENDATA\n", 11, "SC"),
    ("semi-integer bound", BASE + "BOUNDS\n SI BND x 3\nENDATA\n", 11, "SI"),
    ("bound without value", BASE + "BOUNDS\n UP x\nENDATA\n", 11, "x"),
    ("missing ROWS", "NAME T\nCOLUMNS\n x obj 1\nENDATA\n", 2, "COLUMNS"),
    ("missing COLUMNS", "NAME T\nROWS\n N obj\nENDATA\n", 4, "ENDATA"),
    ("RHS before COLUMNS", HEAD + RHS + "ENDATA\n", 5, "RHS"),
    ("data before any section", " x obj 1\n" + BASE + "ENDATA\n", 1, "x"),
    ("unknown section", BASE + "FOO\nENDATA\n", 10, "FOO"),
    ("refused QSECTION", BASE + "QSECTION obj\n x x 1\nENDATA\n", 10, "QSECTION"),
    ("section twice", BASE + "ROWS\nENDATA\n", 10, "ROWS"),
    ("marker never closed",
     HEAD + "COLUMNS\n M 'MARKER' 'INTORG'\n x obj 1 c1 1\n" + RHS + "ENDATA\n", 6, "'INTORG'"),
    ("INTEND without INTORG", HEAD + "COLUMNS\n M 'MARKER' 'INTEND'\nENDATA\n", 6, "'INTEND'"),
    ("unknown marker", HEAD + "COLUMNS\n M 'MARKER' 'SOSORG'\nENDATA\n", 6, "'SOSORG'"),
    ("same row twice in a column", HEAD + "COLUMNS\n x obj 1 c1 1\n x c1 2\nENDATA\n", 7, "c1"),
    ("duplicate row name", "NAME T\nROWS\n N obj\n L c1\n G c1\nCOLUMNS\nENDATA\n", 5, "c1"),
    ("column block twice", HEAD + "COLUMNS\n x obj 1\n y c1 1\n x c1 2\nENDATA\n", 8, "x"),
    ("RHS twice for a row", BASE + " RHS c1 7\nENDATA\n", 10, "c1"),
    ("objective RHS twice", BASE + " RHS obj 1\n RHS obj 2\nENDATA\n", 11, "obj"),
    ("RANGES on an N row", BASE + "RANGES\n RNG obj 3\nENDATA\n", 11, "obj"),
    ("RANGES twice for a row", BASE + "RANGES\n RNG c1 3\n RNG c1 4\nENDATA\n", 12, "c1"),
    ("upper bound set twice", BASE + "BOUNDS\n UP BND x 3\n FX BND x 2\nENDATA\n", 12, "x"),
    ("unknown row type", "NAME T\nROWS\n N obj\n X c1\nCOLUMNS\nENDATA\n", 4, "X"),
    ("rows field count", "NAME T\nROWS\n N obj extra\nENDATA\n", 3, "extra"),
    ("bad OBJSENSE value", "NAME T\nOBJSENSE\n    BIGGEST\n" + BASE[7:] + "ENDATA\n", 3,
     "BIGGEST"),
    ("OBJSENSE without value", "NAME T\nOBJSENSE\nROWS\n N obj\nCOLUMNS\nENDATA\n", 2,
     "OBJSENSE"),
    ("OBJSENSE one-line extra field", "OBJSENSE MAX NOW\n" + BASE + "ENDATA\n", 1, "NOW"),
    ("QUADOBJ pair twice", BASE + "QUADOBJ\n x y 1\n y x 1\nENDATA\n", 12, "x"),
    ("QMATRIX without mirror", BASE + "QMATRIX\n x y 1\n y y 2\nENDATA\n", 11, "y"),
    ("QMATRIX not symmetric", BASE + "QMATRIX\n x y 1\n y x 2\nENDATA\n", 12, "y"),
    ("both quadratic sections", BASE + "QUADOBJ\n x x 1\nQMATRIX\nENDATA\n", 12, "QMATRIX"),
    ("infinite coefficient", HEAD + "COLUMNS\n x c1 inf\nENDATA\n", 6, "inf"),
    ("infinite objective coefficient", HEAD + "COLUMNS\n x obj 1e30\nENDATA\n", 6, "1e30"),
    ("UP below default lower bound", BASE + "BOUNDS\n UP BND y -2\nENDATA\n", 11, "y"),
    ("header with extra field", BASE + "RANGES now\nENDATA\n", 10, "now"),
]


@pytest.mark.parametrize(("text", "line", "token"), [c[1:] for c in CASES],
                         ids=[c[0] for c in CASES])
def test_malformed_file(text, line, token, tmp_path):
    path = tmp_path / "bad.mps"
    path.write_text(text)
    with pytest.raises(ModelFormatError) as info:
        read_mps(path)
    err = info.value
    assert (err.line, err.token) == (line, token)
    assert err.path == str(path)
    message = str(err)
    assert str(path) in message and f"line {line}" in message and repr(token) in message


def test_non_utf8_bytes(tmp_path):
    path = tmp_path / "latin1.mps"
    path.write_bytes((HEAD + COLS).encode() + b" z obj 1 c\xe91 1\n" + RHS.encode())
    with pytest.raises(ModelFormatError, match="UTF-8") as info:
        read_mps(path)
    assert (info.value.line, info.value.token) == (8, "0xe9")
    assert "line 8" in str(info.value) and "'0xe9'" in str(info.value)


def test_missing_endata_names_the_last_line(tmp_path):
    path = tmp_path / "noend.mps"
    path.write_text(BASE + "\n* trailing comment\n")
    # reference: highspy's own MPS reader also refuses a file without ENDATA
    with pytest.raises(ModelFormatError, match="without ENDATA") as info:
        read_mps(path)
    assert info.value.line == 9 and "line 9" in str(info.value)


@pytest.mark.parametrize("data", [b"", b"   \n\n", b"* only a comment\n\n"])
def test_empty_file(data, tmp_path):
    path = tmp_path / "empty.mps"
    path.write_bytes(data)
    with pytest.raises(ModelFormatError, match="empty file") as info:
        read_mps(path)
    assert info.value.line is None and str(path) in str(info.value)


@pytest.mark.parametrize("cut", [2, 10, -9, -1])
def test_truncated_gzip(cut, tmp_path):
    packed = gzip.compress((BASE + "ENDATA\n").encode())
    path = tmp_path / "cut.mps.gz"
    path.write_bytes(packed[:cut])
    with pytest.raises(ModelFormatError, match="gzip") as info:
        read_mps(path)
    assert info.value.line is None


def test_corrupt_gzip_body(tmp_path):
    packed = bytearray(gzip.compress((BASE + "ENDATA\n").encode()))
    packed[12] ^= 0xFF
    path = tmp_path / "corrupt.gz"
    path.write_bytes(bytes(packed))
    with pytest.raises(ModelFormatError, match="gzip"):
        read_mps(path)


@pytest.mark.parametrize("bounds", [" LI BND x 0.2\n UI BND x 0.8\n", " FX BND x inf\n"])
def test_invalid_model_is_wrapped(bounds, tmp_path):
    path = tmp_path / "invalid.mps"
    path.write_text(BASE + "BOUNDS\n" + bounds + "ENDATA\n")
    with pytest.raises(ModelFormatError, match="not valid") as info:
        read_mps(path)
    assert str(path) in str(info.value)


def test_missing_file_is_an_os_error(tmp_path):
    with pytest.raises(FileNotFoundError):
        read_mps(tmp_path / "nowhere.mps")
