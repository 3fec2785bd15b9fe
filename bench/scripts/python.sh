# Sourced by the bench scripts (not run on its own), after they cd to the repository root: the one
# choice of Python for their helpers.
#   PY            Debian's interpreter, /usr/bin/python3: Debian's python3-numpy installs numpy
#                 for it and for no other Python (a python3 earlier on PATH, such as a version
#                 manager's, may carry another numpy or none). PYTHON=/path/to/python3 chooses
#                 another; without /usr/bin/python3 (not Debian) it is python3 from PATH.
#   need_numpy    exits 2 with a message when PY cannot import numpy.

PY="${PYTHON:-/usr/bin/python3}"
if [ -z "${PYTHON:-}" ] && [ ! -x "$PY" ]; then
  PY=python3
fi

need_numpy() {
  "$PY" -c 'import numpy' 2>/dev/null || {
    echo "numpy is missing for $PY: install Debian's python3-numpy (or set PYTHON= to a python3 that has numpy)" >&2
    exit 2
  }
}
