"""Running the command as a user without root's privileges, for tests of permissions:
root is refused nothing, so as root the command runs as user and group 65534 ("nobody" on
Debian) through setpriv (util-linux), from a copy of the binary that user can reach."""
import os
import shutil
import stat
import subprocess

import mtest

OPEN = stat.S_IRWXU | stat.S_IRGRP | stat.S_IXGRP | stat.S_IROTH | stat.S_IXOTH  # 0755


def runner(folder):
    """A function running the command (or, with command=False, any program) as that user;
    `folder` (made 0755) receives the copy of the binary."""
    os.chmod(folder, OPEN)
    binary, prefix = mtest.BIN, []
    if os.geteuid() == 0:
        binary = os.path.join(folder, "manicule")
        shutil.copy(mtest.BIN, binary)
        os.chmod(binary, OPEN)
        prefix = ["setpriv", "--reuid=65534", "--regid=65534", "--clear-groups"]

    def run(*args, command=True):
        return subprocess.run(prefix + ([binary] if command else []) + list(args), capture_output=True, text=True,
                              timeout=300)
    return run
