"""Mutation testing: one changed number or sign in a bundled certificate is caught at that step.

A mutant "survives" when the changed certificate still verifies.  A survivor
is acceptable only when it is provably equivalent or still true, and each is
justified by a check independent of the fast kernel:

- an inequality or congruence claim that still holds after the change;
- an equality claim that still holds, re-checked with the slow reference
  implementations of tests/reference.py (definitions, recursions, scans);
- a step or chain start whose changed line has the same normal form as the
  original (the same polynomial in the function calls: a zero term, say) or,
  for a chain start, the same value by the reference implementations;
- an intermediate line of a chain changed into another line that its rules
  also justify (the chain still proves start = last line, both unchanged);
- a cited rule replaced by another that also gives the line.

Everything else must be rejected at the mutated claim or step, or earlier.
"""
from checker import check_text
from checker.interfaces.cli import bundled_certificates
from checker.kernel.evaluation import Evaluator
from checker.kernel.normal import Normaliser
from checker.language.parsing import parse_expression
from mutation import mutants
from reference import reference_functions


def _statement_text(text, line):
    return text.split("\n")[line - 1]


def _claim_sides(line_text):
    body = line_text.split("#")[0].strip()
    if body.startswith("claim "):
        body = body[len("claim "):]
    if ":" in body.split("(")[0]:
        body = body.split(":", 1)[1]
    return body


def _reference_true(claim_text: str, whole_text: str) -> bool:
    """The claim alone, with the certificate's named values, checked by the slow references."""
    lets = [ln for ln in whole_text.split("\n") if ln.startswith("let ")]
    with reference_functions():
        return check_text("\n".join(lets) + "\nclaim " + claim_text + "\n", limits=_LIMITS).ok


def _same_line(original: str, mutated: str) -> bool:
    def nf(s):
        expr = s.split("#")[0].strip()
        if expr.startswith("="):
            expr = expr[1:].rsplit(" by ", 1)[0]
        elif expr.startswith("chain "):
            expr = expr[len("chain "):]
            if ":" in expr.split("(")[0]:
                expr = expr.split(":", 1)[1]
        return Normaliser(Evaluator()).normal(parse_expression(expr))
    try:
        return nf(original) == nf(mutated)
    except Exception:
        return False


from checker.foundation.limits import Limits  # noqa: E402
_LIMITS = Limits(terms=10**7)


def justify(m, original_text):
    line = _statement_text(m.text, m.line)
    if m.what.startswith("rule "):
        # only the cited rule changed and the step still verifies: the same lines are proved
        return "the other rule also gives this line, so the certificate proves the same statements"
    if m.unit.kind == "claim" and m.unit.relation != "=":
        return "an inequality that still holds after the change"
    if m.unit.kind == "congruence":
        return "a congruence that still holds after the change"
    if m.unit.kind in ("identity", "witness"):
        statement = "\n".join(m.text.split("\n")[m.unit.first_line - 1: m.unit.last_line])
        lets = [ln for ln in m.text.split("\n") if ln.startswith("let ")]
        with reference_functions():
            if check_text("\n".join(lets) + "\n" + statement + "\n", limits=_LIMITS).ok:
                return "the changed statement is still true (re-checked with the reference implementations)"
        return None
    if m.unit.kind == "claim" and _reference_true(_claim_sides(line), m.text):
        return "an equality that still holds (re-checked with the reference implementations)"
    if m.unit.kind in ("step", "start") and _same_line(_statement_text(original_text, m.line), line):
        return "the changed line is the same polynomial in the function calls"
    if m.unit.kind == "step" and not m.unit.last_in_chain:
        # the chain still verifies and still proves (start) = (last line), both unchanged
        return "a different but valid intermediate line: the chain proves the same equality"
    if m.unit.kind == "start":
        start = _statement_text(original_text, m.line)
        with reference_functions():
            a = Evaluator().number(parse_expression(start.split(":", 1)[-1].replace("chain ", "", 1)))
            b = Evaluator().number(parse_expression(line.split(":", 1)[-1].replace("chain ", "", 1)))
        if a == b:
            return "the changed chain start has the same value (reference implementations)"
    return None


def _run(texts, **kinds):
    made = killed = 0
    survivors, late = [], []
    for name, text in texts:
        for m in mutants(text, **kinds):
            made += 1
            report = check_text(m.text, name)
            if report.ok:
                survivors.append((name, m.line, m.column, m.what, justify(m, text)))
                continue
            killed += 1
            f = report.failure
            if f.line is None or f.line > m.unit.last_line:
                late.append((name, m.line, m.column, m.what, f.line, f.message))
    return made, killed, survivors, late


def _assert_all_caught(what, texts, min_rate=0.97, **kinds):
    """Every mutant rejected at its statement or earlier, or a justified survivor."""
    made, killed, survivors, late = _run(texts, **kinds)
    unexplained = [s for s in survivors if s[4] is None]
    print(f"\n{what}: mutants made {made}, rejected {killed} ({100 * killed / made:.1f}%), "
          f"survivors {len(survivors)}, unexplained {len(unexplained)}")
    for s in survivors:
        print("  survivor:", *s)
    assert not late, late
    assert not unexplained, unexplained
    assert killed / made >= min_rate
    return made


def _bundled():
    # lemmas have their own corruption tests (tests/test_lemmas.py): their units are not claims and steps
    return [(p.name, p.read_text()) for p in bundled_certificates() if "\nlemma " not in p.read_text()]


def _derived():
    from checker.interfaces.derive import derive_dedekind
    pairs = [(5, 17), (-44, 102), (123456789, 987654321), (10**30 + 3, 10**31 + 7), (89, 144)]
    out = [(f"derived s({h}, {k})", derive_dedekind(h, k)) for h, k in pairs]
    from checker.interfaces.derive import derive_fourier_dedekind
    # moduli the slow references can sum over (a survivor is re-checked with them)
    for n, parts, b in ((0, [5, 7], 101), (5, [3, 7, 11], 10**30 + 57), (0, [1001, 3], 1000)):
        out.append((f"derived s_{n}({parts}; {b})", derive_fourier_dedekind(n, parts, b)))
    return out


def test_mutants_of_bundled_certificates_are_rejected_at_their_step():
    assert _assert_all_caught("numbers and signs, bundled", _bundled()) > 500


def test_operator_and_rule_mutants_of_bundled_and_derived_certificates():
    made = _assert_all_caught("operators and rule names, bundled and derived", _bundled() + _derived(),
                              min_rate=0.95, deltas=(), operators=True, rules=True)
    assert made > 500


def test_number_and_sign_mutants_of_derived_certificates():
    _assert_all_caught("numbers and signs, derived", _derived())
