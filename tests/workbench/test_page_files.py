"""The workbench page's files (feedcheck/workbench/static/): everything the page loads is
shipped beside it, nothing comes from the network, and nothing needs what the server's
Content-Security-Policy forbids (inline scripts, inline styles, handlers in the HTML)."""

from __future__ import annotations

import re
from pathlib import Path

STATIC = Path(__file__).resolve().parents[2] / "feedcheck" / "workbench" / "static"
SVG_NS = "http://www.w3.org/2000/svg"


def _files(suffix: str) -> list[Path]:
    return sorted(STATIC.glob(f"*{suffix}"))


def test_the_page_and_its_scripts_and_styles_are_shipped():
    names = {p.name for p in STATIC.iterdir()}
    assert {"index.html", "app.js", "style.css"} <= names
    html = (STATIC / "index.html").read_text(encoding="utf-8")
    for ref in re.findall(r'(?:src|href)="([^"]+)"', html):
        if ref.startswith("data:"):
            continue
        assert ref.startswith("static/"), ref  # relative: the token travels in the URL
        assert (STATIC / ref.removeprefix("static/")).is_file(), ref
    for script in _files(".js"):
        for module in re.findall(r'from "\./([^"]+)"', script.read_text(encoding="utf-8")):
            assert (STATIC / module).is_file(), (script.name, module)


def test_nothing_is_fetched_from_the_network():
    for path in _files(".html") + _files(".js") + _files(".css"):
        text = path.read_text(encoding="utf-8").replace(SVG_NS, "")
        assert not re.search(r"https?://|//[a-z0-9.-]+\.[a-z]{2,}/", text, re.I), path.name
        assert "@import" not in text and "@font-face" not in text, path.name


def test_no_inline_script_style_or_handler_in_the_html():
    html = (STATIC / "index.html").read_text(encoding="utf-8")
    for tag in re.findall(r"<script\b[^>]*>(.*?)</script>", html, re.S):
        assert tag.strip() == "", "inline script"
    assert "<style" not in html
    assert not re.search(r"\sstyle=", html)
    assert not re.search(r"\son[a-z]+=", html)


def test_scripts_never_build_markup_from_strings():
    """Text from the server (messages, names) reaches the page as text nodes only."""
    for script in _files(".js"):
        text = script.read_text(encoding="utf-8")
        for forbidden in (
            "innerHTML",
            "outerHTML",
            "insertAdjacentHTML",
            "document.write",
            "eval(",
        ):
            assert forbidden not in text, (script.name, forbidden)
