"""The JSON model format: reading, writing, error locations, and the published schema."""

import json
import math
import re
from pathlib import Path

import numpy as np
import pytest
import scipy.sparse as sp

from undergrowth.model import ModelFormatError, Problem, ProblemError
from undergrowth.model.jsonmodel import (
    CONSTRAINT_KEYS,
    QUADRATIC_KEYS,
    TOP_KEYS,
    VARIABLE_KEYS,
    format_path,
    json_model_text,
    line_of,
    parse_json_model,
    read_json_model,
    write_json_model,
)

DOCS = Path(__file__).resolve().parents[1] / "docs"


def doc_example() -> str:
    """The complete example: the first ```json block of docs/model-json.md."""
    text = (DOCS / "model-json.md").read_text(encoding="utf-8")
    match = re.search(r"```json\n(.*?)```", text, re.S)
    assert match, "docs/model-json.md has no ```json block"
    return match.group(1)


def small(**extra: object) -> dict:
    doc = {
        "format": "undergrowth-model",
        "version": 1,
        "name": "small",
        "sense": "max",
        "objective": {"x": 4, "y": -1},
        "variables": {"x": {"upper": 10, "integer": True}, "y": {}},
        "constraints": {"cap": {"terms": {"x": 7, "y": -2}, "upper": 14}},
    }
    doc.update(extra)
    return doc


def write(tmp_path: Path, doc: dict | str, name: str = "m.json") -> Path:
    path = tmp_path / name
    path.write_text(doc if isinstance(doc, str) else json.dumps(doc, indent=2),
                    encoding="utf-8")
    return path


# ------------------------------------------------------------------ reading
def test_doc_example_reads_and_its_worked_objective_matches(tmp_path):
    p = read_json_model(write(tmp_path, doc_example(), "bakery.json"))
    assert p.name == "bakery-tomorrow" and p.sense == "max"
    assert p.col_names == ("sourdough", "croissant", "second_oven", "overtime")
    assert p.row_names == ("oven_hours", "flour_kg", "butter_kg", "cafe_order", "counter")
    assert p.num_integers == 3 and p.num_binaries == 1 and p.nnz == 10
    assert p.col_upper.tolist() == [8, 10, 1, 4]
    assert p.row_lower.tolist() == [-math.inf, -math.inf, -math.inf, 2, 3]
    assert p.row_upper.tolist() == [10, 50, 9, math.inf, 14]
    # Q on (sourdough, croissant) is [[-2, -0.5], [-0.5, -3]] (by hand, as in the doc)
    assert p.Q.toarray()[:2, :2].tolist() == [[-2, -0.5], [-0.5, -3]]
    # linear 284, quadratic -63.5, offset -60 -> 160.5 (by hand, as in the doc)
    assert p.objective_value(np.array([4, 5, 1, 0.5])) == pytest.approx(160.5)


def test_quadratic_value_is_the_monomial_coefficient():
    doc = small(quadratic=[{"i": "x", "j": "y", "value": 2},
                           {"i": "y", "j": "y", "value": -3}], offset=1.5)
    p = parse_json_model(json.dumps(doc))
    assert p.Q.toarray().tolist() == [[0, 2], [2, -6]]
    # at x = 1, y = 2: 4·1 − 1·2 + 2·1·2 − 3·2² + 1.5 = 4 − 2 + 4 − 12 + 1.5 = −4.5 (by hand)
    assert p.objective_value(np.array([1.0, 2.0])) == pytest.approx(-4.5)


def test_defaults_infinite_bounds_and_shorthands():
    doc = small(variables={"x": {}, "y": {"lower": None, "upper": "inf"},
                           "z": {"lower": "-inf", "upper": None}, "b": {"binary": True},
                           "n": {"lower": -3, "upper": "+inf", "integer": True}},
                objective={}, constraints={
                    "e": {"terms": {"x": 1, "b": 2}, "equals": 4},
                    "free": {"terms": {"z": 1}},
                    "none": {"terms": {}, "lower": "-inf", "upper": 0}})
    p = parse_json_model(json.dumps(doc))
    assert p.col_lower.tolist() == [0, -math.inf, -math.inf, 0, -3]
    assert p.col_upper.tolist() == [math.inf, math.inf, math.inf, 1, math.inf]
    assert p.integrality.tolist() == [False, False, False, True, True]
    assert p.row_lower.tolist() == [4, -math.inf, -math.inf]
    assert p.row_upper.tolist() == [4, math.inf, 0]
    assert p.Q is None and p.c.tolist() == [0] * 5


def test_minimal_file_gets_min_sense_and_default_name():
    p = parse_json_model('{"format": "undergrowth-model", "version": 1, "variables": {}}')
    assert (p.sense, p.name, p.num_cols, p.num_rows) == ("min", "model", 0, 0)


def test_variables_keep_written_order_not_sorted():
    doc = small(variables={"zeta": {}, "alpha": {}, "mid": {}}, objective={},
                constraints={"b": {"terms": {"mid": 1}}, "a": {"terms": {"zeta": 1}}})
    p = parse_json_model(json.dumps(doc))
    assert p.col_names == ("zeta", "alpha", "mid") and p.row_names == ("b", "a")


# ------------------------------------------------------------------ errors
def test_invalid_json_names_line_and_column(tmp_path):
    path = write(tmp_path, '{"format": "undergrowth-model",\n  "version": 1,\n  "x": ]\n}')
    with pytest.raises(ModelFormatError) as info:
        read_json_model(path)
    err = info.value
    assert err.line == 3 and err.path == str(path)
    assert "column 8" in err.reason and err.token == "]"
    assert str(err).startswith(f"{path}, line 3")


def test_missing_file_is_a_format_error(tmp_path):
    with pytest.raises(ModelFormatError, match="cannot read file"):
        read_json_model(tmp_path / "absent.json")


@pytest.mark.parametrize(
    ("change", "token", "fragment"),
    [
        # unknown variable in a constraint
        (lambda d: d["constraints"]["cap"]["terms"].update(z=1),
         "constraints.cap.terms.z", "unknown variable 'z'"),
        (lambda d: d["objective"].update(w=1), "objective.w", "unknown variable 'w'"),
        # wrong type
        (lambda d: d["variables"]["x"].update(upper="ten"), "variables.x.upper",
         "got 'ten'"),
        (lambda d: d["variables"]["x"].update(integer=1), "variables.x.integer",
         "expected true or false"),
        (lambda d: d["constraints"]["cap"]["terms"].update(x=True),
         "constraints.cap.terms.x", "expected a number, got a boolean"),
        (lambda d: d.update(variables=[]), "variables", "expected an object"),
        (lambda d: d.update(sense="maximize"), "sense", "sense must be"),
        # unknown keys
        (lambda d: d["variables"]["x"].update(uper=3), "variables.x.uper",
         "unknown key 'uper'"),
        (lambda d: d.update(bounds={}), "bounds", "unknown key 'bounds'"),
        (lambda d: d["constraints"]["cap"].update(rhs=3), "constraints.cap.rhs",
         "unknown key 'rhs'"),
        # infinities on the wrong side
        (lambda d: d["variables"]["x"].update(upper="-inf"), "variables.x.upper",
         "an upper bound cannot be -inf"),
        (lambda d: d["constraints"]["cap"].update(lower="inf"), "constraints.cap.lower",
         "a lower bound cannot be +inf"),
        # version and format
        (lambda d: d.update(version=2, new_key=1), "version", "version 2 is newer"),
        (lambda d: d.update(version="1"), "version", "positive integer"),
        (lambda d: d.pop("format"), "format", "missing \"format\""),
        (lambda d: d.update(format="lp"), "format", "format is 'lp'"),
        (lambda d: d.pop("variables"), "variables", "missing \"variables\""),
        # consistency the schema cannot express
        (lambda d: d["variables"]["x"].update(lower=11), "variables.x", "above upper"),
        (lambda d: d["variables"].update(b={"binary": True, "upper": 2}),
         "variables.b.upper", "already means integer"),
        (lambda d: d["variables"].update(k={"lower": 0.2, "upper": 0.8, "integer": True}),
         "variables.k", "no integer value"),
        (lambda d: d["constraints"]["cap"].update(equals=3), "constraints.cap.upper",
         "either \"equals\""),
        (lambda d: d["constraints"].update(bare={"upper": 1}), "constraints.bare",
         "needs \"terms\""),
        (lambda d: d["variables"].update({" ": {}}), 'variables[" "]', "must not be empty"),
        (lambda d: d.update(quadratic=[{"i": "x", "j": "q", "value": 1}]), "quadratic[0].j",
         "unknown variable 'q'"),
        (lambda d: d.update(quadratic=[{"i": "x", "j": "y", "value": 1},
                                       {"i": "y", "j": "x", "value": 1}]),
         "quadratic[1]", "already listed as quadratic[0]"),
        (lambda d: d.update(quadratic=[{"i": "x", "value": 1}]), "quadratic[0]",
         "needs \"j\""),
    ],
)
def test_semantic_errors_name_the_json_path(tmp_path, change, token, fragment):
    doc = small()
    change(doc)
    path = write(tmp_path, doc)
    with pytest.raises(ModelFormatError) as info:
        read_json_model(path)
    err = info.value
    assert err.token == token
    assert fragment in err.reason
    assert err.path == str(path)


def test_number_too_large_for_a_float():
    text = json.dumps(small(offset=12345)).replace("12345", "1e400")
    with pytest.raises(ModelFormatError, match="out of range") as info:
        parse_json_model(text)
    assert info.value.token == "offset"


def test_error_line_is_where_the_key_is_written():
    text = """{
  "format": "undergrowth-model",
  "version": 1,
  "variables": {"x": {}, "y": {"upper": 3}},
  "constraints": {
    "first": {"terms": {"x": 1}, "upper": 2},
    "cap": {
      "terms": {"x": 7,
                "z": 1}
    }
  }
}"""
    with pytest.raises(ModelFormatError) as info:
        parse_json_model(text, path="m.json")
    err = info.value
    assert (err.line, err.token) == (9, "constraints.cap.terms.z")
    assert str(err) == ("m.json, line 9, token 'constraints.cap.terms.z': unknown variable "
                        "'z' (declare it under \"variables\")")


def test_key_written_twice_points_at_the_second():
    text = ('{"format": "undergrowth-model", "version": 1,\n'
            ' "variables": {"x": {"upper": 1},\n'
            '               "x": {"upper": 2}}}')
    with pytest.raises(ModelFormatError) as info:
        parse_json_model(text)
    assert (info.value.line, info.value.token) == (3, "variables.x")
    assert "written twice" in info.value.reason


def test_nan_and_infinity_literals_are_refused():
    text = ('{"format": "undergrowth-model", "version": 1,\n'
            ' "variables": {"x": {"upper": Infinity}}}')
    with pytest.raises(ModelFormatError) as info:
        parse_json_model(text)
    assert (info.value.line, info.value.token) == (2, "variables.x.upper")
    assert "Infinity is not JSON" in info.value.reason


def test_top_level_must_be_an_object():
    with pytest.raises(ModelFormatError, match="expected a JSON object at the top") as info:
        parse_json_model("[1, 2]")
    assert info.value.token is None and info.value.line is None


def test_line_of_counts_list_elements_and_skips_strings():
    text = '{"q": [\n {"i": "a]", "j": "b"},\n {"i": "c,", "j": "d"},\n {"i": "e"}\n]}'
    assert line_of(text, ("q", 0)) == 2
    assert line_of(text, ("q", 1, "j")) == 3
    assert line_of(text, ("q", 2)) == 4
    assert line_of(text, ("q", 3)) == 1  # no such element: the deepest key found
    assert line_of(text, ("absent",)) is None


def test_format_path_quotes_awkward_names():
    assert format_path(("constraints", "cap", "terms", "z")) == "constraints.cap.terms.z"
    assert format_path(("variables", "flour (kg)")) == 'variables["flour (kg)"]'
    assert format_path(("quadratic", 2, "value")) == "quadratic[2].value"
    assert format_path(()) == ""


# ------------------------------------------------------------------ writing
def _same(a: Problem, b: Problem) -> None:
    for field in ("c", "row_lower", "row_upper", "col_lower", "col_upper", "integrality"):
        np.testing.assert_array_equal(getattr(a, field), getattr(b, field), err_msg=field)
    assert (a.A != b.A).nnz == 0
    assert (a.Q is None) == (b.Q is None)
    if a.Q is not None:
        assert (a.Q != b.Q).nnz == 0
    assert (a.sense, a.offset, a.name, a.col_names, a.row_names) == \
        (b.sense, b.offset, b.name, b.col_names, b.row_names)


def test_round_trip_through_a_file(tmp_path):
    q = sp.csr_matrix(np.array([[3.0, 0.25, 0], [0.25, 0, 0], [0, 0, 1e-7]]))
    original = Problem.from_arrays(
        [1.5, 0, -2.0 / 3.0], [[1, 2, 0], [0, 0, 0], [0.1, 0, -1]],
        row_lower=[-np.inf, 0, 2], row_upper=[4, 0, np.inf],
        col_lower=[-np.inf, 0, -5], col_upper=[np.inf, 1, 7.5], integrality=[0, 1, 1],
        sense="max", offset=-0.1, Q=q, col_names=["a", "b", "c d"],
        row_names=["r.1", "empty", "r3"], name="round trip ✓",
    )
    path = tmp_path / "out.json"
    write_json_model(original, path)
    text = path.read_text(encoding="utf-8")
    assert '"b": {"binary": true}' in text and '"empty": {"terms": {}, "equals": 0}' in text
    _same(original, read_json_model(path))


def test_round_trip_of_the_doc_example_is_stable():
    first = parse_json_model(doc_example())
    text = json_model_text(first)
    assert json_model_text(parse_json_model(text)) == text
    _same(first, parse_json_model(text))


def test_writer_refuses_repeated_names():
    p = Problem.from_arrays([1, 2], col_names=["x", "x"])
    with pytest.raises(ProblemError, match="column name 'x' is used twice"):
        json_model_text(p)


# ------------------------------------------------------------------- schema
def load_schema() -> dict:
    return json.loads((DOCS / "model.schema.json").read_text(encoding="utf-8"))


def test_schema_keys_match_the_reader():
    schema = load_schema()
    assert schema["$schema"] == "https://json-schema.org/draft/2020-12/schema"
    defs = schema["$defs"]
    assert set(schema["properties"]) == set(TOP_KEYS)
    assert set(schema["required"]) == {"format", "version", "variables"}
    assert set(defs["variable"]["properties"]) == set(VARIABLE_KEYS)
    assert set(defs["constraint"]["properties"]) == set(CONSTRAINT_KEYS)
    assert defs["constraint"]["required"] == ["terms"]
    item = schema["properties"]["quadratic"]["items"]
    assert set(item["properties"]) == set(QUADRATIC_KEYS) == set(item["required"])


def _check(value: object, schema: dict, root: dict, where: str = "$") -> list[str]:
    """Just enough of JSON Schema for our own schema's structure (not if/then/not,
    which the reader tests cover): type, const, enum, anyOf, $ref, properties,
    required, additionalProperties, propertyNames.minLength, items."""
    if "$ref" in schema:
        schema = root["$defs"][schema["$ref"].rsplit("/", 1)[1]]
    errors: list[str] = []
    kinds = {"object": dict, "array": list, "string": str, "boolean": bool,
             "null": type(None)}
    kind = schema.get("type")
    if kind == "number":
        if isinstance(value, bool) or not isinstance(value, int | float):
            return [f"{where}: not a number"]
    elif kind is not None and not isinstance(value, kinds[kind]):
        return [f"{where}: not {kind}"]
    if "const" in schema and value != schema["const"]:
        errors.append(f"{where}: not {schema['const']!r}")
    if "enum" in schema and value not in schema["enum"]:
        errors.append(f"{where}: not one of {schema['enum']}")
    if "anyOf" in schema and all(_check(value, s, root, where) for s in schema["anyOf"]):
        errors.append(f"{where}: matches no alternative")
    if isinstance(value, dict):
        props = schema.get("properties", {})
        errors += [f"{where}: missing {k}" for k in schema.get("required", ()) if k not in value]
        for key, item in value.items():
            if "propertyNames" in schema and len(key) < 1:
                errors.append(f"{where}: empty name")
            if key in props:
                errors += _check(item, props[key], root, f"{where}.{key}")
            elif schema.get("additionalProperties") is False:
                errors.append(f"{where}: unexpected {key}")
            elif isinstance(schema.get("additionalProperties"), dict):
                errors += _check(item, schema["additionalProperties"], root, f"{where}.{key}")
    if isinstance(value, list) and "items" in schema:
        for k, item in enumerate(value):
            errors += _check(item, schema["items"], root, f"{where}[{k}]")
    return errors


def test_doc_example_and_writer_output_fit_the_schema():
    schema = load_schema()
    example = json.loads(doc_example())
    assert _check(example, schema, schema) == []
    written = json.loads(json_model_text(parse_json_model(doc_example())))
    assert _check(written, schema, schema) == []
    # and the little checker does catch things
    example["variables"]["sourdough"]["uper"] = 3
    example["constraints"]["counter"]["upper"] = "-inf"
    assert len(_check(example, schema, schema)) == 2


def test_doc_example_against_the_full_schema_when_jsonschema_is_installed():
    jsonschema = pytest.importorskip("jsonschema")
    schema = load_schema()
    jsonschema.Draft202012Validator.check_schema(schema)
    validator = jsonschema.Draft202012Validator(schema)
    validator.validate(json.loads(doc_example()))
    bad = json.loads(doc_example())
    bad["variables"]["second_oven"]["upper"] = 3
    assert not validator.is_valid(bad)
