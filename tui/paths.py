"""Where halftrip keeps the user's files. Looking a path up never creates it.

* user data (own cables ``cables.toml``, the job log ``jobs.sqlite3``):
  ``$HALFTRIP_DATA_DIR`` or the platform's user data directory
  (``~/.local/share/halftrip`` on Linux);
* preferences (``preferences.toml``): ``$HALFTRIP_CONFIG_DIR`` or the
  platform's user config directory (``~/.config/halftrip`` on Linux).
"""

from __future__ import annotations

import os
from pathlib import Path

APP = "halftrip"


def data_dir() -> Path:
    env = os.environ.get("HALFTRIP_DATA_DIR")
    if env:
        return Path(env).expanduser()
    import platformdirs

    return Path(platformdirs.user_data_dir(APP, appauthor=False))


def config_dir() -> Path:
    env = os.environ.get("HALFTRIP_CONFIG_DIR")
    if env:
        return Path(env).expanduser()
    import platformdirs

    return Path(platformdirs.user_config_dir(APP, appauthor=False))


def user_catalog_path() -> Path:
    return data_dir() / "cables.toml"


def preferences_path() -> Path:
    return config_dir() / "preferences.toml"


def job_db_path() -> Path:
    env = os.environ.get("HALFTRIP_DB")
    if env:
        return Path(env).expanduser()
    return data_dir() / "jobs.sqlite3"
