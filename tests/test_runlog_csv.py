"""CSV node tables: minimal columns, defaults, and errors that name line and column."""

from __future__ import annotations

import pytest

from undergrowth.analysis.table import RunTable
from undergrowth.runlog.csvtable import csv_to_events
from undergrowth.runlog.errors import RunLogError


def _csv(tmp_path, text: str, name: str = "nodes.csv"):
    path = tmp_path / name
    path.write_text(text)
    return path


MINIMAL = """\
id,parent,bound,status
10,,100,branched
11,10,104,branched
12,10,103,pruned
13,11,,infeasible
14,11,105,integral
"""


def test_minimal_columns_fill_depth_order_and_incumbents(tmp_path):
    events = csv_to_events(_csv(tmp_path, MINIMAL))
    head, nodes = events[0], [e for e in events if e["kind"] == "node"]
    assert head["model"]["sense"] == "min"  # bounds rise from parent to child
    assert [n["depth"] for n in nodes] == [0, 1, 1, 2, 2]  # from the parents (by hand)
    assert [n["order"] for n in nodes] == [0, 1, 2, 3, 4]  # row order
    assert nodes[0]["parent"] is None and nodes[0]["lp"]["objective"] == 100.0
    assert nodes[3]["bound"] is None and nodes[3]["lp"]["status"] == "infeasible"
    incumbents = [e for e in events if e["kind"] == "incumbent"]
    assert [(i["objective"], i["node"], i["source"]) for i in incumbents] == [
        (105.0, 14, "integral")
    ]
    end = events[-1]
    assert end["kind"] == "end" and end["status"] == "optimal" and end["nodes"] == 5


def test_table_opens_csv_directly_and_maps_arbitrary_ids(tmp_path):
    table = RunTable.open(_csv(tmp_path, MINIMAL), use_cache=False)
    assert table.id.tolist() == [10, 11, 12, 13, 14]
    assert table.parent.tolist() == [-1, 10, 10, 11, 11]
    assert table.parent_row.tolist() == [-1, 0, 0, 1, 1]
    assert table.row_of(13) == 3
    with pytest.raises(KeyError):
        table.row_of(99)


def test_optional_columns_any_order_and_case(tmp_path):
    text = """\
# sense: max
# name: routing pilot
Status,ID,Parent,Bound,Variable,Direction,Value,Time,Iterations,Fractional,Name,Order
branched,0,,50.5,,,,0.5,12,3,,0
open,1,0,,4,down,0,0.9,0,0,load_4,
integral,2,0,48,4,up,1,1.2,7,0,load_4,1
"""
    events = csv_to_events(_csv(tmp_path, text))
    assert events[0]["model"] == {**events[0]["model"], "name": "routing pilot", "sense": "max"}
    nodes = [e for e in events if e["kind"] == "node"]
    assert nodes[1]["branch"] == {"var": 4, "name": "load_4", "dir": "down", "value": 0.0}
    assert nodes[1]["bound"] == 50.5  # an open node inherits its parent's bound
    assert nodes[1]["order"] is None and nodes[1]["lp"] is None  # never solved
    assert nodes[2]["time"] == 1.2 and nodes[2]["lp"]["iterations"] == 7
    assert events[-1]["status"] == "incomplete" and events[-1]["complete"] is False


@pytest.mark.parametrize(
    ("text", "line", "column", "fragment"),
    [
        ("id,parent,bound\n0,,1\n", 1, "status", "required column 'status' is missing"),
        ("id,parent,bound,status\n0,,1,branched\n1,0,x2,pruned\n", 3, "bound", "'x2'"),
        ("id,parent,bound,status\n0,,1,done\n", 2, "status", "'done' is not one of"),
        ("id,parent,bound,status\n0,,1,branched\n1,5,2,pruned\n", 3, "parent",
         "parent 5 has not been recorded"),  # fmt: skip
        ("id,parent,bound,status\n0,,1,branched\n0,0,2,pruned\n", 3, "id", "already recorded"),
        ("id,parent,bound,status,variable\n0,,1,branched,\n1,0,2,pruned,3\n", 3, "direction",
         "must be 'down' or 'up'"),  # fmt: skip
        ("id,parent,bound,status\n0,,1,branched\n1,0,2\n", 3, None, "3 cells"),
        ("id,parent,bound,status\n0,,1,pruned\n1,0,2,pruned\n", 3, "parent", "not branched"),
    ],
)
def test_errors_name_line_and_column(tmp_path, text, line, column, fragment):
    path = _csv(tmp_path, text)
    with pytest.raises(RunLogError) as info:
        csv_to_events(path)
    assert (info.value.line, info.value.field) == (line, column)
    assert fragment in str(info.value) and str(path) in str(info.value)


def test_lenient_csv_skips_bad_rows(tmp_path):
    path = _csv(tmp_path, MINIMAL.replace("12,10,103,pruned", "12,10,103,??"))
    table = RunTable.open(path, lenient=True, use_cache=False)
    assert table.id.tolist() == [10, 11, 13, 14]
    assert any(w.startswith("line 4, column 'status'") for w in table.warnings)
    # node 10 now has one unrecorded child, so the import ends "incomplete"
    assert table.end["status"] == "incomplete"


def test_gzip_csv_is_read_too(tmp_path):
    import gzip

    path = tmp_path / "nodes.csv.gz"
    path.write_bytes(gzip.compress(MINIMAL.encode()))
    assert len(RunTable.open(path, use_cache=False)) == 5
