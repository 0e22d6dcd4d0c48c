"""The workbench of ``feedcheck edit``: a job edited in the browser on this computer,
checked as it is typed by the same code path as ``feedcheck check``.

``server`` (WSGI application and serving loop), ``security`` (the guard every request
passes), ``actions`` (the session: check, save, report, new job, schedules),
``document`` (the job's text, edited section by section with tomlkit), ``payload``
(results as the page shows them), ``schema`` (the forms, from the readers' key lists);
``static/`` holds the page.
"""
