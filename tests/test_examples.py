"""The example notebooks in examples/ run headless, cell by cell, in a fresh Jupyter kernel
(nbclient; the test extra installs nbclient, nbformat and ipykernel), and their results show
as HTML.  A kernel that cannot start is a failure with the reason, never a skip."""

import os
import pathlib
import sys

import nbclient
import nbformat
import pytest
from jupyter_client.kernelspec import NoSuchKernel

import qseries

EXAMPLES = pathlib.Path(__file__).resolve().parent.parent / "examples"
NOTEBOOKS = sorted(EXAMPLES.glob("*.ipynb"))


def test_there_are_examples():
    assert [p.name for p in NOTEBOOKS] == ["misremembered_identity.ipynb"]


def _run(path: pathlib.Path) -> nbformat.NotebookNode:
    nb = nbformat.read(path, as_version=4)
    # the kernel imports the same qseries as this test (an editable install, or the
    # checkout on PYTHONPATH)
    root = str(pathlib.Path(qseries.__file__).resolve().parent.parent)
    env_path = os.environ.get("PYTHONPATH", "")
    os.environ["PYTHONPATH"] = root + (os.pathsep + env_path if env_path else "")
    client = nbclient.NotebookClient(nb, kernel_name="python3", timeout=300,
                                     resources={"metadata": {"path": str(EXAMPLES)}})
    try:
        client.execute()
    except (NoSuchKernel, nbclient.exceptions.DeadKernelError, RuntimeError) as err:
        pytest.fail(f"the Jupyter kernel 'python3' could not start or died ({err!r}); "
                    f"install the test extra (pip install -e '.[test]', which brings "
                    f"ipykernel) with {sys.executable}")
    finally:
        if env_path:
            os.environ["PYTHONPATH"] = env_path
        else:
            os.environ.pop("PYTHONPATH", None)
    return nb


def _outputs(nb: nbformat.NotebookNode) -> list[dict]:
    """The rich output (mime type -> text) of each code cell, in order."""
    out = []
    for cell in nb.cells:
        if cell.cell_type == "code":
            data: dict = {}
            for o in cell.outputs:
                assert o.output_type != "error", o
                data.update(o.get("data", {}))
            out.append(data)
    return out


def test_the_misremembered_identity_notebook_runs_and_shows_html():
    outs = _outputs(_run(EXAMPLES / "misremembered_identity.ipynb"))
    series, failed, product, repaired, distribution, picture, lists, expression = outs
    # G(q) = sum q^(k^2+k)/(q;q)_k: 1 + q^2 + q^3 + q^4 + q^5 + 2q^6 (partitions into parts
    # = 2, 3 mod 5, by Rogers-Ramanujan; A003106)
    assert "1 + <i>q</i><sup>2</sup> + <i>q</i><sup>3</sup>" in series["text/html"]
    assert "more terms)" in series["text/html"] and "O(<i>q</i><sup>200</sup>)" in \
        series["text/html"]
    assert "DIFFERS" in failed["text/html"] and "<table>" in failed["text/html"]
    assert "product-factor" in failed["text/html"]
    assert "(q^2, q^3;q^5)_inf^-1" in product["text/html"]
    assert "AGREES" in repaired["text/html"]
    assert "<table>" in distribution["text/html"]
    import base64
    png = base64.b64decode(picture["image/png"])
    assert png.startswith(b"\x89PNG\r\n\x1a\n") and len(png) > 5_000
    assert lists["text/plain"].startswith("([1, 0, 1, 1, 1, 1, 2, 2, 3, 3, 4, 4],")
    # Euler's pentagonal number theorem to q^15 (Andrews, The Theory of Partitions, Cor. 1.7)
    assert expression["text/plain"] == "1 - q - q**2 + q**5 + q**7 - q**12 - q**15 + O(q**16)"
