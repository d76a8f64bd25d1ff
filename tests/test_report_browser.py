"""The HTML report in a real browser (headless Chromium, Debian's ``chromium`` package).

Checks: the report loads with no console message at all (it has no script, and its
Content-Security-Policy makes any attempt to fetch a resource a console error), every
section is present, every image decodes (natural width > 0), a model whose title, names
and description contain markup shows them as text, and a screenshot PNG is produced.
Skipped, with the reason, where no Chromium is installed.
"""

from __future__ import annotations

import json
import re
import shutil
import subprocess
from pathlib import Path

import pytest

from seatool.report import SECTIONS, write_report

ROOT = Path(__file__).resolve().parent.parent
CHROMIUM = shutil.which("chromium") or shutil.which("chromium-browser")
pytestmark = pytest.mark.skipif(
    CHROMIUM is None, reason="no chromium on PATH (Debian: apt-get install -y chromium)"
)
FLAGS = (
    "--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run",
    "--disable-background-networking", "--disable-component-update", "--disable-sync",
    "--hide-scrollbars", "--enable-logging=stderr", "--v=0",
)  # fmt: skip
TITLE = "<script>alert(1)</script> & two rooms"
NAME = "<script>alert(2)</script>"
DESCRIPTION = "<img src=x onerror=alert(3)>"

#: Added to a copy of the report only (the report itself has no script): after load,
#: write each image's natural width and the page's script count into the DOM.
PROBE = """<script>
window.addEventListener("load", () => {
  const out = {widths: [...document.images].map(i => i.naturalWidth),
               complete: [...document.images].map(i => i.complete),
               scripts: document.scripts.length};
  document.body.setAttribute("data-probe", JSON.stringify(out));
});
</script>"""


def _chromium(tmp: Path, *args: str) -> subprocess.CompletedProcess[str]:
    profile = tmp / f"profile-{len(list(tmp.glob('profile-*')))}"
    profile.mkdir()
    assert CHROMIUM is not None
    return subprocess.run(
        [CHROMIUM, *FLAGS, f"--user-data-dir={profile}", *args],
        capture_output=True, text=True, timeout=120, check=False,
    )  # fmt: skip


def _console(stderr: str) -> list[str]:
    return [line for line in stderr.splitlines() if ":CONSOLE" in line]


@pytest.fixture(scope="module")
def hostile_report(tmp_path_factory: pytest.TempPathFactory) -> Path:
    """The two-rooms demo with markup in its title, a subsystem name and its description."""
    d = tmp_path_factory.mktemp("report")
    text = (ROOT / "models" / "two_rooms.toml").read_text(encoding="utf-8")
    text = text.replace("Two rooms separated by a glass pane (invented demo)", TITLE)
    text = text.replace("[subsystems.receiving_room]", f'[subsystems."{NAME}"]')
    text = text.replace('"receiving_room"]', f'"{NAME}"]')
    text = text.replace("A 6 mm glass pane", f"{DESCRIPTION} A 6 mm glass pane")
    model = d / "hostile.toml"
    model.write_text(text, encoding="utf-8")
    files = write_report(model, d / "hostile.html", samples=40, seed=1, progress=False)
    return files.html


def test_loads_without_console_messages_and_screenshots(hostile_report: Path) -> None:
    tmp = hostile_report.parent
    shot = tmp / "shot.png"
    run = _chromium(tmp, "--window-size=1100,5000", f"--screenshot={shot}",
                    hostile_report.as_uri())  # fmt: skip
    assert _console(run.stderr) == []
    data = shot.read_bytes()
    assert data[:8] == b"\x89PNG\r\n\x1a\n"
    assert len(data) > 50_000  # a blank 1100 x 5000 page compresses to a few kB


def test_console_check_can_fail(hostile_report: Path) -> None:
    """A resource from the network breaks the report's policy and is logged: the check sees it."""
    tmp = hostile_report.parent
    bad = tmp / "with_remote_image.html"
    html = hostile_report.read_text(encoding="utf-8")
    bad.write_text(html.replace("</main>", '<img src="http://192.0.2.1/x.png"></main>'),
                   encoding="utf-8")  # fmt: skip
    run = _chromium(tmp, "--virtual-time-budget=3000", "--dump-dom", bad.as_uri())
    assert _console(run.stderr), "a blocked remote image should be reported on the console"


def test_sections_images_and_markup_as_text(hostile_report: Path) -> None:
    tmp = hostile_report.parent
    probe = tmp / "probe.html"
    html = hostile_report.read_text(encoding="utf-8")
    html = html.replace("default-src 'none';", "default-src 'none'; script-src 'unsafe-inline';")
    probe.write_text(html.replace("</body>", PROBE + "</body>"), encoding="utf-8")
    run = _chromium(tmp, "--virtual-time-budget=5000", "--dump-dom", probe.as_uri())
    dom = run.stdout
    m = re.search(r'data-probe="([^"]*)"', dom)
    assert m is not None, run.stderr[-2000:]
    found = json.loads(m.group(1).replace("&quot;", '"'))
    assert len(found["widths"]) >= 5  # levels, flow, contributions, sensitivity, spread
    assert all(found["complete"])
    assert all(w > 0 for w in found["widths"]), found
    assert found["scripts"] == 1  # the probe only: no markup from the model became a script
    for sid, _ in SECTIONS:
        assert f'id="{sid}"' in dom, sid
    # the markup shows as text (escaped in the serialised DOM) ...
    assert "&lt;script&gt;alert(1)&lt;/script&gt; &amp; two rooms" in dom
    assert "&lt;script&gt;alert(2)&lt;/script&gt;" in dom
    assert "&lt;img src=x onerror=alert(3)&gt;" in dom
    # ... and never as an element
    assert "<script>alert" not in dom
    assert "<img src=x" not in dom
    assert _console(run.stderr) == []


def test_prints_on_a4(hostile_report: Path) -> None:
    """The print style sets A4 pages (595 x 842 pt, ISO 216) in the browser's PDF output."""
    tmp = hostile_report.parent
    pdf = tmp / "report.pdf"
    _chromium(tmp, "--no-pdf-header-footer", f"--print-to-pdf={pdf}", hostile_report.as_uri())
    data = pdf.read_bytes()
    assert data[:5] == b"%PDF-"
    boxes = re.findall(rb"/MediaBox\s*\[\s*0\s+0\s+([\d.]+)\s+([\d.]+)\s*\]", data)
    assert boxes, "no page in the PDF"
    for w, h in boxes:
        assert abs(float(w) - 595.3) < 1.5 and abs(float(h) - 841.9) < 1.5


#: Right edge of every table and figure against the right edge of the page column.
WIDTH_PROBE = """<script>
window.addEventListener("load", () => {
  const main = document.querySelector("main").getBoundingClientRect();
  const over = [...document.querySelectorAll("table, figure, img")]
    .map(e => e.getBoundingClientRect().right - main.right)
    .filter(d => d > 1);
  document.body.setAttribute("data-over", JSON.stringify(over));
});
</script>"""


def test_flagship_tables_stay_inside_the_page_column(tmp_path: Path) -> None:
    """The 54-subsystem flagship's widest tables (long kind and source names) wrap inside
    the page column at a 1100 px window instead of running past its edge."""
    files = write_report(ROOT / "models" / "wheelhouse.toml", tmp_path / "wh.html",
                         samples=20, seed=1, progress=False)  # fmt: skip
    html = files.html.read_text(encoding="utf-8")
    html = html.replace("default-src 'none';", "default-src 'none'; script-src 'unsafe-inline';")
    probe = tmp_path / "probe.html"
    probe.write_text(html.replace("</body>", WIDTH_PROBE + "</body>"), encoding="utf-8")
    run = _chromium(tmp_path, "--window-size=1100,3000", "--virtual-time-budget=5000",
                    "--dump-dom", probe.as_uri())  # fmt: skip
    m = re.search(r'data-over="([^"]*)"', run.stdout)
    assert m is not None, run.stderr[-2000:]
    assert json.loads(m.group(1).replace("&quot;", '"')) == []
