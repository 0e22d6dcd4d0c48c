"""The PDF calculation report: :mod:`.report` (assembly, page numbers, writing),
:mod:`.sections` (tables and text), :mod:`.drawing` (one-line diagram, charts, fonts),
:mod:`.embed` (inputs embedded in the PDF and taken out again) and
:mod:`.rerun_compare` (a re-run held against the embedded results)."""
