"""The inputs wing: read and validate what a user hands in, into :mod:`feedcheck.model`.

* :mod:`.job_file` — a job file (TOML) → a :class:`~feedcheck.model.Job` with every
  default filled and its feed tree built once (``job.tree``);
* :mod:`.schedule_file` — a panel schedule (CSV/XLSX) → a
  :class:`~feedcheck.model.Schedule`;
* :mod:`.feed_rules` — ids, radial feed, voltages; :mod:`.tree` builds the tree;
* :mod:`.paths` — relative paths that stay inside the job's folder;
* :mod:`.files` — the one guard on a user's file (regular file, size, UTF-8).

Every problem is collected and raised as one :class:`~feedcheck.errors.InputError`.
"""
