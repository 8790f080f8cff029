"""``stavegen serve``: the builder's page, a local web server over the same engine as the command line.

app.py      the Starlette application: the page, its static files and the JSON/zip API
engine.py   what a request asks of the engine (check, view, section, build, size, edit), run in
            worker processes (workers.py) so that every request has a time cap
view.py     a Design worded for the page by the command line's own tables and wordings
svg.py      SVG drawings of the section, one stave and the boards, from the engine's geometry
tomledit.py edits of a spar file's text that keep its comments (tomlkit)
run.py      start the server (uvicorn) and open the browser
static/     the page itself: HTML, CSS and plain JavaScript, served from the package
"""
