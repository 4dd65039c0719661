"""The HTML run report in a real browser (issue 10: people open it and print it for design
reviews): headless Chromium renders it with every figure loaded and no console error, and prints
it to A4 with no table or figure cut across pages.

Chromium comes from Debian's packages (``apt-get install chromium``; poppler-utils adds the
PDF checks). Without it the test is skipped, and says so; with ``CI=true`` or
``BRINEBOLT_INSTALL_BROWSER=1`` the session first tries to install both, quietly.
"""

from __future__ import annotations

import html
import json
import os
import re
import shutil
import subprocess
from html.parser import HTMLParser
from pathlib import Path

import pytest
from engine_helpers import write_scenario

from sim import api
from sim.analysis.report import write_report

LEGS = """
[[leg]]
name = "dash"
voltage = "24 V"
until = { duration = "3 min" }

[[leg]]
name = "slow"
speed = "0.8 kn"
until = { duration = "3 min" }

[[leg]]
name = "glide"
voltage = "0 V"
until = { speed_below = "0.2 m/s" }
"""

BROWSERS = ("chromium", "chromium-browser")
INSTALL = (
    "apt-get update -qq && DEBIAN_FRONTEND=noninteractive "
    "apt-get install -y -qq --no-install-recommends chromium poppler-utils"
)
FLAGS = [
    "--headless",
    "--no-sandbox",
    "--disable-gpu",
    "--disable-background-networking",
    "--disable-component-update",
    "--disable-sync",
    "--no-first-run",
    "--enable-logging=stderr",
    "--v=0",
]
A4_PT = (595.28, 841.89)
"""ISO 216 A4, 210 mm × 297 mm, in PostScript points (1/72 in)."""


def _browser() -> str | None:
    return next((p for p in map(shutil.which, BROWSERS) if p), None)


@pytest.fixture(scope="session")
def chromium() -> str:
    exe = _browser()
    wanted = os.environ.get("CI") == "true" or os.environ.get("BRINEBOLT_INSTALL_BROWSER") == "1"
    if exe is None and wanted:
        cmd = ["sh", "-c", f"({INSTALL}) >/dev/null 2>&1"]
        if hasattr(os, "geteuid") and os.geteuid() != 0 and shutil.which("sudo"):
            cmd = ["sudo", "-n", *cmd]
        try:
            subprocess.run(cmd, timeout=900, check=False)
        except (OSError, subprocess.TimeoutExpired):
            pass
        exe = _browser()
    if exe is None:
        pytest.skip(
            "SKIPPED: the HTML report was NOT checked in a browser: chromium is not installed "
            "(apt-get install chromium poppler-utils, or set BRINEBOLT_INSTALL_BROWSER=1)"
        )
    return exe


@pytest.fixture(scope="module")
def report(tmp_path_factory) -> Path:
    tmp = tmp_path_factory.mktemp("browser")
    out = api.run_scenario(write_scenario(tmp, LEGS, output='sample = "5 s"'), out=tmp / "r.h5")
    return write_report(out.log_path, tmp / "report.html")


def _chromium(exe: str, *args: str, cwd: Path) -> subprocess.CompletedProcess:
    home = cwd / "chromium-home"  # a throw-away profile: nothing of the user's is touched
    return subprocess.run(
        [exe, *FLAGS, f"--user-data-dir={home}", *args],
        cwd=cwd,
        capture_output=True,
        text=True,
        timeout=60,
        check=False,
        env={**os.environ, "HOME": str(home)},
    )


VERDICT = """<script>
window.__errs = [];
window.addEventListener("error", (e) => {
  const t = e.target;
  window.__errs.push(t && t.tagName ? t.tagName + " failed to load" : "error: " + e.message);
}, true);
const __ce = console.error;
console.error = (...a) => { window.__errs.push("console.error: " + a.join(" ")); __ce(...a); };
window.addEventListener("load", () => {
  const imgs = [...document.images];
  const d = document.createElement("pre");
  d.id = "verdict";
  d.textContent = JSON.stringify({
    images: imgs.length,
    loaded: imgs.filter((i) => i.complete && i.naturalWidth > 0).length,
    errors: window.__errs,
  });
  document.body.appendChild(d);
});
</script>"""


def test_report_renders_with_every_figure_and_no_console_error(chromium, report):
    # A copy with a small script that writes its verdict into the page; --dump-dom returns it.
    probe = report.with_name("probe.html")
    text = report.read_text(encoding="utf-8")
    probe.write_text(text.replace("<head>", "<head>" + VERDICT, 1), encoding="utf-8")
    proc = _chromium(
        chromium, "--virtual-time-budget=10000", "--dump-dom", probe.as_uri(), cwd=report.parent
    )
    found = re.search(r'<pre id="verdict">(.*?)</pre>', proc.stdout, re.S)
    assert found, f"no verdict from the page; chromium said:\n{proc.stderr[-2000:]}"
    verdict = json.loads(html.unescape(found.group(1)))
    n_img = text.count("<img")
    assert n_img >= 2
    assert verdict == {"images": n_img, "loaded": n_img, "errors": []}
    console = [line for line in proc.stderr.splitlines() if "CONSOLE" in line]
    assert not console, console


class _Tables(HTMLParser):
    """First header cell and first two cells of the last row of every table, in order."""

    def __init__(self) -> None:
        super().__init__()
        self.tables: list[dict] = []
        self._cell: list[str] | None = None
        self._row: list[str] = []

    def handle_starttag(self, tag, attrs):
        if tag == "table":
            self.tables.append({"head": [], "last": []})
        elif tag == "tr":
            self._row = []
        elif tag in ("td", "th"):
            self._cell = []

    def handle_data(self, data):
        if self._cell is not None:
            self._cell.append(data)

    def handle_endtag(self, tag):
        if tag in ("td", "th") and self._cell is not None:
            self._row.append(" ".join("".join(self._cell).split()))
            self._cell = None
        elif tag == "tr" and self.tables:
            t = self.tables[-1]
            if not t["head"]:
                t["head"] = self._row
            else:
                t["last"] = self._row


def test_report_prints_to_a4_with_no_table_or_figure_cut(chromium, report):
    pdf = report.with_name("report.pdf")
    proc = _chromium(
        chromium,
        "--no-pdf-header-footer",
        f"--print-to-pdf={pdf}",
        report.as_uri(),
        cwd=report.parent,
    )
    assert pdf.exists() and pdf.stat().st_size > 10_000, proc.stderr[-2000:]
    data = pdf.read_bytes()
    assert data[:5] == b"%PDF-"
    boxes = re.findall(rb"/MediaBox\s*\[\s*0\s+0\s+([\d.]+)\s+([\d.]+)\s*\]", data)
    assert boxes, "no page sizes found in the PDF"
    for w, h in boxes:  # every page A4 portrait, to a point
        assert abs(float(w) - A4_PT[0]) < 1.0 and abs(float(h) - A4_PT[1]) < 1.0
    pages = len(boxes)
    assert 2 <= pages <= 8  # a one-page report with its figures and appendices, not a scroll

    if not (shutil.which("pdftotext") and shutil.which("pdfimages")):
        pytest.skip("poppler-utils not installed: page size checked, cut tables/figures not")
    # each figure is drawn on one page only (an image cut across a page break is drawn twice)
    listing = subprocess.run(
        ["pdfimages", "-list", str(pdf)], capture_output=True, text=True, check=True
    ).stdout.splitlines()[2:]
    rows = [line.split() for line in listing if line.strip()]
    images = [r for r in rows if r[2] == "image"]
    n_img = report.read_text(encoding="utf-8").count("<img")
    objects = [r[10] for r in images]  # "object ID" column: one per embedded figure
    assert len(set(objects)) == n_img and len(objects) == n_img, listing

    # each table's header and its last row on the same page
    text = subprocess.run(
        ["pdftotext", "-layout", str(pdf), "-"], capture_output=True, text=True, check=True
    ).stdout
    page_texts = [" ".join(p.split()) for p in text.split("\f")]
    flat, starts = "", []
    for p in page_texts:
        starts.append(len(flat))
        flat += p + " "

    def page_of(pos: int) -> int:
        return max(i for i, s in enumerate(starts) if s <= pos)

    parser = _Tables()
    parser.feed(report.read_text(encoding="utf-8"))
    assert len(parser.tables) >= 4
    cursor = 0
    for t in parser.tables:
        head = t["head"][0]
        last = " ".join(t["last"][:2]) if t["last"] else ""
        h = flat.find(head, cursor)
        assert h >= 0, f"table header {head!r} not found in the PDF text"
        if not last:
            cursor = h + len(head)
            continue
        e = flat.find(last, h)
        if e < 0:  # a long cell wrapped: its first cell alone
            last = t["last"][0]
            e = flat.find(last, h)
        assert e >= 0, f"last row {last!r} of table {head!r} not found"
        assert page_of(h) == page_of(e), f"table {head!r} is cut across pages"
        cursor = e + len(last)
