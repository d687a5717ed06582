"""A4 pages for printed packs: headings, wrapped paragraphs, tables and chart pages, laid out top to bottom.

Text is measured with matplotlib's own font metrics (word by word, cached) and wrapped to the text width, so
nothing runs off the page; a block that does not fit starts a continuation page.
"""

from __future__ import annotations

from collections.abc import Callable, Sequence
from dataclasses import dataclass, field
from functools import lru_cache

from matplotlib.figure import Figure, SubFigure
from matplotlib.font_manager import FontProperties
from matplotlib.layout_engine import ConstrainedLayoutEngine
from matplotlib.lines import Line2D
from matplotlib.patches import FancyBboxPatch
from matplotlib.text import Text
from matplotlib.textpath import TextToPath

from pdvoid.core.errors import InputError

__all__ = ["A4", "PageWriter", "text_width", "wrap", "figure_text"]

A4 = (8.27, 11.69)  #: A4 portrait [in]
_PT = 1.0 / 72.0  # in per pt
_MEASURE = TextToPath()


@lru_cache(maxsize=20000)
def _word_width(word: str, size: float, weight: str) -> float:
    w, _, _ = _MEASURE.get_text_width_height_descent(
        word, FontProperties(size=size, weight=weight), ismath=False
    )
    return w * _PT


def text_width(text: str, size: float, weight: str = "normal") -> float:
    """Width of ``text`` in the default sans-serif font (sum of word widths and spaces; kerning across words is
    ignored).

    Parameters
    ----------
    text : str
        One line of text [-].
    size : float
        Font size [pt].
    weight : str
        Font weight, e.g. "normal" or "bold" [-].

    Returns
    -------
    float
        The width [in].
    """
    words = text.split(" ")
    space = _word_width("a a", size, weight) - 2.0 * _word_width("a", size, weight)
    return sum(_word_width(w, size, weight) for w in words if w) + (len(words) - 1) * space


def wrap(text: str, width: float, size: float, weight: str = "normal") -> list[str]:
    """Greedy word wrap of ``text`` to ``width``; explicit newlines are kept; a word longer than the width is
    cut.

    Parameters
    ----------
    text : str
        The text [-].
    width : float
        Line width [in].
    size : float
        Font size [pt].
    weight : str
        Font weight, e.g. "normal" or "bold" [-].

    Returns
    -------
    list of str
        The lines.
    """
    lines: list[str] = []
    for para in text.split("\n"):
        words = para.split()
        if not words:
            lines.append("")
            continue
        line = ""
        for word in words:
            while text_width(word, size, weight) > width and len(word) > 1:  # cut a very long word
                cut = len(word)
                while cut > 1 and text_width(word[:cut], size, weight) > width:
                    cut -= 1
                if line:
                    lines.append(line)
                    line = ""
                lines.append(word[:cut])
                word = word[cut:]
            trial = f"{line} {word}" if line else word
            if text_width(trial, size, weight) <= width:
                line = trial
            else:
                lines.append(line)
                line = word
        lines.append(line)
    return lines


def figure_text(fig: Figure) -> str:
    """All text drawn on a figure (titles, labels, tick labels, tables), one item per line.

    Parameters
    ----------
    fig : matplotlib.figure.Figure
        The figure.

    Returns
    -------
    str
        Every non-empty text of the figure, joined by newlines.
    """
    return "\n".join(t.get_text() for t in fig.findobj(Text) if t.get_text())


@dataclass
class PageWriter:
    """Lay out text and charts on A4 portrait pages, top to bottom.

    Parameters
    ----------
    footer : callable
        Called as footer(page_number, page_count) for the line at the bottom of every page.
    margin : float
        Left/right margin; top and bottom margins are 0.75 in [in].

    Attributes
    ----------
    pages : list of matplotlib.figure.Figure
        The pages so far.
    titles : list of str
        The title of each page.
    y : float
        Cursor from the top of the current page [in].
    """

    footer: Callable[[int, int], str] = lambda i, n: f"page {i} of {n}"
    margin: float = 0.8
    pages: list[Figure] = field(default_factory=list)
    titles: list[str] = field(default_factory=list)
    y: float = 0.0  # cursor from the top [in]
    _title: str = ""

    @property
    def width(self) -> float:
        """Text width [in]."""
        return A4[0] - 2.0 * self.margin

    @property
    def bottom(self) -> float:
        """Lowest usable cursor position, measured from the top [in]."""
        return A4[1] - 0.9

    # ---------------------------------------------------------------------------------------- text pages
    def new_page(self, title: str) -> Figure:
        """Start a text page with ``title`` as its heading.

        Parameters
        ----------
        title : str
            The page's heading [-].

        Returns
        -------
        matplotlib.figure.Figure
            The new page.
        """
        fig = Figure(figsize=A4, facecolor="white")
        self.pages.append(fig)
        self.titles.append(title)
        self._title = title
        self.y = 0.75
        size = 12.0 if title.endswith("(continued)") else 15.0
        for line in wrap(title, self.width, size, "bold"):
            self._put(fig, line, 0.0, size, "bold")
        self.y += 0.12
        return fig

    def _put(
        self,
        fig: Figure,
        text: str,
        indent: float,
        size: float,
        weight: str = "normal",
        colour: str = "#111111",
        style: str = "normal",
    ) -> None:
        self.y += size * 1.25 * _PT
        fig.text(
            (self.margin + indent) / A4[0],
            1.0 - self.y / A4[1],
            text,
            fontsize=size,
            weight=weight,
            color=colour,
            style=style,
            va="baseline",
            ha="left",
        )
        self.y += size * 0.3 * _PT

    def _room(self, height: float) -> Figure:
        if not self.pages:
            raise InputError("start a page with new_page() before adding text")
        if self.y + height > self.bottom:
            title = self._title if self._title.endswith("(continued)") else f"{self._title} (continued)"
            self.new_page(title)
        return self.pages[-1]

    def heading(self, text: str, size: float = 11.5) -> None:
        """A section heading (kept together with at least three lines after it).

        Parameters
        ----------
        text : str
            The heading [-].
        size : float
            Font size [pt].

        Raises
        ------
        InputError
            When no page has been started.
        """
        fig = self._room(size * 1.55 * _PT + 4 * 9.0 * 1.55 * _PT)
        self.y += 0.1
        self._put(fig, text, 0.0, size, "bold", "#1b2a49")

    def paragraph(
        self,
        text: str,
        size: float = 9.0,
        *,
        indent: float = 0.0,
        weight: str = "normal",
        colour: str = "#111111",
        style: str = "normal",
        space_after: float = 0.06,
    ) -> None:
        """A wrapped paragraph (continues on the next page when needed).

        Parameters
        ----------
        text : str
            The paragraph [-].
        size : float
            Font size [pt].
        indent : float
            Left indent [in].
        weight, style : str
            Font weight and style [-].
        colour : str
            Text colour [-].
        space_after : float
            Space below the paragraph [in].

        Raises
        ------
        InputError
            When no page has been started.
        """
        for line in wrap(text, self.width - indent, size, weight):
            fig = self._room(size * 1.55 * _PT)
            self._put(fig, line, indent, size, weight, colour, style)
        self.y += space_after

    def bullets(self, items: Sequence[str], size: float = 9.0) -> None:
        """A bullet list; each item wrapped with a hanging indent.

        Parameters
        ----------
        items : sequence of str
            One text per bullet [-].
        size : float
            Font size [pt].

        Raises
        ------
        InputError
            When no page has been started.
        """
        for item in items:
            lines = wrap(item, self.width - 0.22, size)
            for i, line in enumerate(lines):
                fig = self._room(size * 1.55 * _PT)
                if i == 0:
                    fig.text(
                        (self.margin + 0.05) / A4[0],
                        1.0 - (self.y + size * 1.25 * _PT) / A4[1],
                        "•",
                        fontsize=size,
                        va="baseline",
                        ha="left",
                        color="#1b2a49",
                    )
                self._put(fig, line, 0.22, size)
            self.y += 0.03
        self.y += 0.04

    def box(self, text: str, size: float = 9.0, *, colour: str = "#7a1f1f", face: str = "#fbf3f3") -> None:
        """A framed paragraph (for the verdict and the safety note).

        Parameters
        ----------
        text : str
            The paragraph (set in bold) [-].
        size : float
            Font size [pt].
        colour : str
            Text and frame colour [-].
        face : str
            Background colour [-].

        Raises
        ------
        InputError
            When no page has been started.
        """
        pad = 0.1
        lines = wrap(text, self.width - 2 * pad, size, "bold")
        height = len(lines) * size * 1.55 * _PT + 2 * pad
        fig = self._room(height + 0.1)
        top = self.y + 0.04
        fig.add_artist(
            FancyBboxPatch(
                (self.margin / A4[0], 1.0 - (top + height) / A4[1]),
                self.width / A4[0],
                height / A4[1],
                boxstyle="round,pad=0,rounding_size=0.006",
                transform=fig.transFigure,
                fc=face,
                ec=colour,
                lw=0.9,
            )
        )
        self.y = top + pad - 0.02
        for line in lines:
            self._put(fig, line, pad, size, "bold", colour)
        self.y = top + height + 0.12

    def table(
        self, header: Sequence[str], rows: Sequence[Sequence[str]], widths: Sequence[float], size: float = 8.0
    ) -> None:
        """A table with wrapped cells. A row that does not fit starts a continuation page, where the header is
        repeated.

        Parameters
        ----------
        header : sequence of str
            Column headings [-].
        rows : sequence of sequence of str
            The cells, one sequence per row [-].
        widths : sequence of float
            Relative column widths, one per column (scaled to the text width) [-].
        size : float
            Font size [pt].

        Raises
        ------
        InputError
            When a row's length differs from the number of widths, or no page has been started.
        """
        if len(header) != len(widths) or any(len(r) != len(widths) for r in rows):
            raise InputError("every table row needs one cell per column width")
        total = sum(widths)
        cols = [w / total * self.width for w in widths]
        gap = 0.08
        line_h = size * 1.45 * _PT

        def layout(cells: Sequence[str], weight: str) -> tuple[list[list[str]], float]:
            wrapped = [wrap(str(c), w - gap, size, weight) for c, w in zip(cells, cols, strict=True)]
            return wrapped, max(len(w) for w in wrapped) * line_h + 0.04

        def draw(wrapped: list[list[str]], height: float, weight: str) -> None:
            fig = self.pages[-1]
            top, x = self.y, self.margin
            for lines, w in zip(wrapped, cols, strict=True):
                for k, line in enumerate(lines):
                    fig.text(
                        x / A4[0],
                        1.0 - (top + (k + 0.8) * line_h) / A4[1],
                        line,
                        fontsize=size,
                        weight=weight,
                        va="baseline",
                        ha="left",
                        color="#111111",
                    )
                x += w
            self.y = top + height
            colour = "#1b2a49" if weight == "bold" else "#d8d8d8"
            fig.add_artist(_rule(fig, self.margin, self.width, self.y - 0.02, colour))

        head, head_h = layout(header, "bold")
        first, first_h = layout(rows[0], "normal") if rows else ([], 0.0)
        self._room(head_h + first_h)
        draw(head, head_h, "bold")
        for row in rows:
            cells, h = layout(row, "normal")
            if self.y + h > self.bottom:
                self._room(self.bottom)  # forces a continuation page
                draw(head, head_h, "bold")
            draw(cells, h, "normal")
        self.y += 0.08

    def space(self, height: float) -> None:
        """Vertical space.

        Parameters
        ----------
        height : float
            The space [in].
        """
        self.y += height

    # ---------------------------------------------------------------------------------------- chart pages
    def chart_page(
        self, title: str, caption: str, *, chart_height: float = 6.2, caption_size: float = 9.0
    ) -> SubFigure:
        """A page with ``title``, a chart area of ``chart_height`` and a wrapped caption below it.

        Parameters
        ----------
        title : str
            The page's title [-].
        caption : str
            The caption below the chart [-].
        chart_height : float
            Height of the chart area [in].
        caption_size : float
            Font size of the caption [pt].

        Returns
        -------
        matplotlib.figure.SubFigure
            The chart area (with constrained layout) for the caller's axes.

        Raises
        ------
        InputError
            When the chart leaves no room for title and caption, or the caption is too long.
        """
        layout = ConstrainedLayoutEngine(w_pad=self.margin * 0.6, h_pad=0.1, hspace=0.0, wspace=0.0)
        fig = Figure(figsize=A4, facecolor="white", layout=layout)
        self.pages.append(fig)
        self.titles.append(title)
        self._title = title
        head = 1.15
        rest = A4[1] - head - chart_height
        if rest < 0.8:
            raise InputError(
                f"chart_height must leave room for the title and caption; got {chart_height!r} in"
            )
        top, chart, bottom = fig.subfigures(3, 1, squeeze=False, height_ratios=[head, chart_height, rest])[:, 0]
        top.text(
            self.margin / A4[0],
            0.35,
            title,
            fontsize=15,
            weight="bold",
            color="#111111",
            ha="left",
            va="baseline",
            transform=top.transSubfigure,
        )
        y = 0.25
        for line in wrap(caption, self.width, caption_size):
            y += caption_size * 1.55 * _PT
            bottom.text(
                self.margin / A4[0],
                1.0 - y / rest,
                line,
                fontsize=caption_size,
                ha="left",
                va="baseline",
                transform=bottom.transSubfigure,
                color="#111111",
            )
        if y > rest - 0.8:
            raise InputError("the caption is too long for the page; shorten it or lower chart_height")
        chart.set_facecolor("white")
        return chart

    # ---------------------------------------------------------------------------------------- finishing
    def finish(self) -> list[Figure]:
        """Add the footer to every page and return the pages.

        Returns
        -------
        list of matplotlib.figure.Figure
            The pages, in order.
        """
        n = len(self.pages)
        for i, fig in enumerate(self.pages, start=1):
            fig.text(
                0.5,
                0.42 / A4[1],
                self.footer(i, n),
                fontsize=7.5,
                color="#555555",
                ha="center",
                va="baseline",
            )
            fig.add_artist(_rule(fig, self.margin, self.width, A4[1] - 0.62, "#bbbbbb"))
        return self.pages


def _rule(fig: Figure, x: float, width: float, y_from_top: float, colour: str) -> Line2D:
    yy = 1.0 - y_from_top / A4[1]
    return Line2D([x / A4[0], (x + width) / A4[0]], [yy, yy], transform=fig.transFigure, color=colour, lw=0.6)
