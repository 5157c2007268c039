"""Quick mode of the verifier's mutation run (issue 15; full mode: ``python bench/bench_mutation.py``).

A fixed sample of the mathematical modules' mutants (``mutation_run.quick_sample``: those with the smallest
SHA-256 of their identifiers, mutants already shown equivalent in the ``mutation_equivalent*.txt`` files left out)
is run against the tests of its module, each in a copy of the repository; every one must make some test
fail (or the tests time out: the mutant makes the verifier loop). The outside source here is the rest of
the suite: a surviving mutant means that a check of the verifier could be weakened without any test
noticing. The run is a process of its own (``python tests/mutation_run.py SIZE TIMEOUT``), which forks one
child per mutant after importing pytest, hypothesis and cypari2 once.
"""
import subprocess
import sys
from pathlib import Path

QUICK_SAMPLE = 10
"""About a minute on one core: a killed mutant costs a pytest start and the tests up to the first failure."""

TIMEOUT = 60
"""Seconds per mutant, about twice the unmutated run of the largest module's tests on a loaded machine."""


def test_the_quick_sample_of_verifier_mutants_is_killed():
    runner = Path(__file__).with_name("mutation_run.py")
    done = subprocess.run([sys.executable, str(runner), str(QUICK_SAMPLE), str(TIMEOUT)], capture_output=True,
                          text=True, timeout=QUICK_SAMPLE * (TIMEOUT + 10) + 120)
    outcomes = done.stdout.splitlines()
    assert len(outcomes) == QUICK_SAMPLE, done.stdout + done.stderr
    assert done.returncode == 0, "mutants of the verifier that no test kills:\n" + "\n".join(
        line for line in outcomes if line.startswith("survived"))


def test_every_equivalence_reason_names_a_mutant_the_run_makes():
    """A reason kept for a mutant the run no longer makes (its line was removed or rewritten) claims a
    review of code that is not there: it goes with the line."""
    sys.path.insert(0, str(Path(__file__).parent))
    from mutation_run import equivalent_reasons, mutants

    made = {mutant.identifier for mutant in mutants()}
    assert sorted(set(equivalent_reasons()) - made) == []
