"""Renderers: they show :class:`~feedcheck.results.Results` and compute nothing.

* :mod:`.display` — display units, number formatting, status words, figure labels
  (the one copy every renderer formats through);
* :mod:`.text` — the terminal summary of ``feedcheck check``;
* :mod:`.json_csv` — the results as JSON and the findings as CSV;
* :mod:`.cells` — the spreadsheet formula guard of CSV and XLSX cells;
* :mod:`.schedules` — checked panel schedules as CSV, XLSX or JSON;
* :mod:`.pdf` — the PDF calculation report (assembly, sections, drawings, the
  embedded inputs, the re-run comparison).

Nothing is imported here, so ``import feedcheck.render.display`` stays light.
"""
