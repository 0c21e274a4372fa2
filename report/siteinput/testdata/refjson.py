"""Shared helpers of the ref_*.py scripts in this folder."""

import json
import re
import subprocess


def tool_version(cmd):
    """First line a tool prints about itself (on stdout or stderr)."""
    res = subprocess.run(cmd, capture_output=True, text=True)
    return (res.stdout + res.stderr).strip().splitlines()[0]


def write(data, path):
    """Write data as JSON with each innermost array of numbers on one line."""
    text = json.dumps(data, indent=1)
    text = re.sub(r"\[\s*([-0-9.eE+,\s]+?)\s*\]",
                  lambda m: "[" + ", ".join(v.strip() for v in m.group(1).split(",")) + "]", text)
    with open(path, "w") as f:
        f.write(text + "\n")
