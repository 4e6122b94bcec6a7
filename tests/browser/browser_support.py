"""What the browser tests do often: open a run, wait for the tree, read pixels."""

from __future__ import annotations

import sys
from pathlib import Path
from typing import Any

from undergrowth.model import write_model

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))  # the test model families
from families import parity_knapsack  # noqa: E402

DEPOT = "depot-siting-loose.most-fractional.best-bound"  # 149 tree nodes, two incumbents
KNAPSACK = "project-selection.most-fractional.best-bound"  # a maximisation, 3651 nodes


def open_run(page: Any, base: str, run_id: str, extra: str = "") -> None:
    page.goto(f"{base}/#run={run_id}{extra}")
    wait_for_tree(page)


def start_endless_solve(page: Any, server: Any, model_id: str, order: str) -> None:
    """Start, from the library page, a live solve that cannot finish on its own (a
    parity knapsack), so a test can cancel it or watch it without racing its end."""
    models = server.settings.models_dir
    models.mkdir(parents=True, exist_ok=True)
    write_model(parity_knapsack(41), str(models / f"{model_id}.mps"))
    page.goto(server.url + "/")
    page.wait_for_selector(f'#solve-model option[value="{model_id}"]', state="attached")
    page.select_option("#solve-model", model_id)
    page.select_option("#solve-rule", "most-fractional")
    page.select_option("#solve-order", order)
    page.click("text=Start and watch live")


def wait_for_tree(page: Any) -> None:
    page.wait_for_function(
        "() => { const i = window.undergrowth && window.undergrowth.inspector;"
        " return i && i.timings.firstDraw > 0 && i.tree.list.markCount > 0; }")


def inked_pixels(page: Any) -> int:
    """Pixels of the tree canvas that differ from its background colour."""
    return page.evaluate("""() => {
        const c = document.querySelector('#tree-canvas');
        const d = c.getContext('2d').getImageData(0, 0, c.width, c.height).data;
        let n = 0;
        for (let i = 0; i < d.length; i += 4) {
          if (Math.abs(d[i] - 251) + Math.abs(d[i + 1] - 251) + Math.abs(d[i + 2] - 248) > 40) n++;
        }
        return n;
    }""")


def colour_pixels(page: Any, rgb: tuple[int, int, int], tolerance: int = 30) -> int:
    """Pixels of the tree canvas close to one colour."""
    return page.evaluate("""([r, g, b, tol]) => {
        const c = document.querySelector('#tree-canvas');
        const d = c.getContext('2d').getImageData(0, 0, c.width, c.height).data;
        let n = 0;
        for (let i = 0; i < d.length; i += 4) {
          if (Math.abs(d[i] - r) + Math.abs(d[i + 1] - g) + Math.abs(d[i + 2] - b) <= tol) n++;
        }
        return n;
    }""", [*rgb, tolerance])


def mark_of(page: Any, node_id: int | None = None, *, kind: int = 0) -> dict[str, Any]:
    """Page coordinates of a drawn node mark (a given node, or some non-root node)."""
    return page.evaluate("""([want, kind]) => {
        const t = window.undergrowth.inspector.tree;
        const l = t.list;
        const box = t.canvas.getBoundingClientRect();
        for (let i = 0; i < l.markCount; i++) {
          const row = l.markRow[i];
          const id = t.store.id[row];
          if (l.markKind[i] !== kind) continue;
          if (want === null ? t.store.parent[row] < 0 : id !== want) continue;
          const x = l.markX[i], y = l.markY[i];
          if (x < 12 || y < 30 || x > box.width - 12 || y > box.height - 12) continue;
          return {x: box.left + x, y: box.top + y, id, row, bound: t.store.bound[row]};
        }
        return null;
    }""", [node_id, kind])
