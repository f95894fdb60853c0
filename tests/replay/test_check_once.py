"""Each file is checked once per process: by `quasicert check` or by a `use`, whichever comes first."""
from __future__ import annotations

import shutil

import pytest

from checker.foundation.resources import resource_dir
from checker.replay import checking, library


@pytest.fixture
def replays(monkeypatch):
    """Names of the certificates replayed, in order."""
    monkeypatch.setattr(library, "_VERIFIED", {})
    seen = []
    original = checking._Replay.run

    def run(self):
        seen.append(self.report.name.replace("\\", "/").rsplit("/", 1)[-1])
        return original(self)
    monkeypatch.setattr(checking._Replay, "run", run)
    return seen


def _bundled(name):
    return resource_dir("checker.certificates", "certificates") / name


def test_lemma_library_then_its_user_replays_the_library_once(replays):
    lemmas = checking.check_file(_bundled("dedekind-lemmas.qcert"))
    user = checking.check_file(_bundled("ossendrack-generator.qcert"))
    assert lemmas.ok and user.ok and lemmas.checked > 0
    assert replays.count("dedekind-lemmas.qcert") == 1
    assert replays.count("ossendrack-generator.qcert") == 1


def test_user_then_library_gives_the_same_report_without_a_second_replay(replays):
    # one seed, so that the second opinion's notes (its instances) are the same in both reports
    user = checking.check_file(_bundled("ossendrack-generator.qcert"), seed=3)
    lemmas = checking.check_file(_bundled("dedekind-lemmas.qcert"), seed=3)
    assert user.ok and lemmas.ok
    assert replays.count("dedekind-lemmas.qcert") == 1
    library._VERIFIED.clear()
    fresh = checking.check_file(_bundled("dedekind-lemmas.qcert"), seed=3)
    assert (fresh.checked, fresh.title, fresh.notes, fresh.name) == \
           (lemmas.checked, lemmas.title, lemmas.notes, lemmas.name)


# the first lemma of the bundled library (Rademacher & Grosswald's s(1, k)); {} spoils it
_LEMMA = """lemma one(k) for k >= 1:
  dedekind(1, k) = (k - 1)*(k - 2)/(12*k){0}
  chain dedekind(1, k)
    = (1/k + k + 1/k)/12 - 1/4 - dedekind(k, 1)   by reciprocity
    = (1/k + k + 1/k)/12 - 1/4 - dedekind(0, 1)   by reduce
    = (k - 1)*(k - 2)/(12*k){0}                   by value
end
"""


def test_an_edited_file_is_checked_again(tmp_path, replays):
    lemmas = tmp_path / "lemmas.qcert"
    user = tmp_path / "user.qcert"
    lemmas.write_text(_LEMMA.format(""))
    user.write_text('use "lemmas.qcert"\nclaim dedekind(1, 7) = 5/14\n')   # Rademacher & Grosswald s(1, k)
    assert checking.check_file(lemmas).ok
    assert checking.check_file(user).ok
    assert replays.count("lemmas.qcert") == 1
    # a false statement now: neither the file itself nor its user may keep the old verdict
    lemmas.write_text(_LEMMA.format(" + 1"))
    assert not checking.check_file(user).ok
    assert not checking.check_file(lemmas).ok


def test_keep_going_and_paranoid_checks_are_never_skipped(tmp_path, replays):
    path = tmp_path / "copy.qcert"
    shutil.copy(_bundled("closed-forms.qcert"), path)
    assert checking.check_file(path).ok
    assert checking.check_file(path, keep_going=True).ok
    assert checking.check_file(path, paranoid=True).ok
    assert replays.count("copy.qcert") == 3
